import type { RequestListener } from "node:http";
import { and, desc, eq, like } from "drizzle-orm";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

/**
 * Sign-in throttling through the built server. The client address is the socket's peer unless TRUSTED_PROXIES
 * names the proxy in front; here the proxy is loopback (the test's own connection), so X-Forwarded-For tells the
 * client apart as a real proxy would (RFC 7239 § 5.2 describes the same "for" chain). Failed attempts count per
 * account and address, and per address: a guesser is stopped, nobody else is locked out with them, and a header
 * from an untrusted peer changes nothing.
 */
let app: RequestListener;
let host: string;
let closeDb: () => Promise<void>;
let stopQueue: () => Promise<void>;
let users: typeof import("../support/users");

beforeAll(async () => {
  // Before any app module reads its settings (env() is read once, lazily).
  process.env.TRUSTED_PROXIES = "loopback";
  // Small budgets keep the test short (every attempt hashes a password); the rules are the same at any size.
  process.env.AUTH_RATE_LIMIT = "4";
  process.env.AUTH_ADDRESS_FAILURE_LIMIT = "12";
  ({ closeDb } = await import("~/db/client.server"));
  ({ stopQueue } = await import("~/jobs/queue.server"));
  users = await import("../support/users");
  const { builtListener, appOrigin } = await import("../security/listener");
  app = await builtListener();
  host = new URL(appOrigin()).host;
}, 120_000);

afterAll(async () => {
  await stopQueue?.();
  await closeDb?.();
});

function signIn(email: string, password: string, from?: string) {
  const r = request(app).post("/sign-in").set("Host", host).set("Origin", `http://${host}`).type("form");
  if (from) r.set("X-Forwarded-For", from);
  return r.send({ email, password });
}

const limited = (res: request.Response) => res.status === 429;
const signedIn = (res: request.Response) => res.status === 302 && ([] as string[]).concat(res.headers["set-cookie"] ?? []).some((c) => /session_token=/.test(c));

describe("sign-in throttling", () => {
  it("stops one address guessing one account's password, and lets the owner in from another address", async () => {
    const victim = await users.makeUser();
    const outcomes: boolean[] = [];
    for (let i = 0; i < 6; i++) outcomes.push(limited(await signIn(victim.email, `wrong-password-${i}`, "203.0.113.5")));
    expect(outcomes.slice(0, 4).some(Boolean)).toBe(false);
    expect(outcomes.slice(4).every(Boolean)).toBe(true);
    // Even the right password is refused from the guessing address for now…
    expect(limited(await signIn(victim.email, victim.password, "203.0.113.5"))).toBe(true);
    // …but the owner, elsewhere, signs in.
    expect(signedIn(await signIn(victim.email, victim.password, "198.51.100.7"))).toBe(true);
  });

  it("does not lock other accounts out together with the guessed one (no shared bucket)", async () => {
    const guessed = await users.makeUser();
    const neighbour = await users.makeUser();
    for (let i = 0; i < 5; i++) await signIn(guessed.email, `wrong-password-${i}`, "192.0.2.44");
    expect(signedIn(await signIn(neighbour.email, neighbour.password, "192.0.2.44"))).toBe(true);
  });

  it("stops an address that sprays many accounts", async () => {
    let refused = 0;
    for (let i = 0; i < 14; i++) if (limited(await signIn(`nobody-${i}-${Date.now()}@example.test`, "wrong-password", "192.0.2.99"))) refused++;
    expect(refused).toBeGreaterThan(0);
  });
});

describe("password reset", () => {
  it("ends the account's other sessions", async () => {
    const { db } = await import("~/db/client.server");
    const { outbox } = await import("~/db/schema");
    const u = await users.makeUser();
    const oldCookie = await users.sessionCookie(u);
    expect((await request(app).get("/api/me").set("Host", host).set("Cookie", oldCookie)).status).toBe(200);
    const asked = await request(app).post("/forgot-password").set("Host", host).set("Origin", `http://${host}`).type("form").send({ email: u.email });
    expect(asked.status).toBeLessThan(400);
    const [mail] = await db().select().from(outbox).where(and(eq(outbox.toAddress, u.email), like(outbox.subject, "%password%"))).orderBy(desc(outbox.createdAt)).limit(1);
    const token = /reset-password\/([^?\s"]+)/.exec(mail.textBody)?.[1];
    expect(token, mail.textBody).toBeTruthy();
    const reset = await request(app).post("/reset-password").set("Host", host).set("Origin", `http://${host}`).type("form").send({ token, password: "a-brand-new-password" });
    expect(reset.status).toBe(200);
    expect((await request(app).get("/api/me").set("Host", host).set("Cookie", oldCookie)).status).toBe(401);
  });
});

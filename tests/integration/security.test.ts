import { spawnSync } from "node:child_process";
import { eq } from "drizzle-orm";
import type { RequestListener } from "node:http";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "~/db/client.server";
import { competitions, crews, entries } from "~/db/schema";
import { stopQueue } from "~/jobs/queue.server";
import { appOrigin, builtListener } from "../security/listener";
import { makeCompo } from "./showcase.fixtures";
import { makeUser, sessionCookie } from "../support/users";

/**
 * Security headers, the same-origin rule for mutations, session cookie flags and escaping of user text, all
 * checked over HTTP against the built app (the same request listener `react-router-serve` runs).
 */
let app: RequestListener;
/** supertest with the Host header a browser on APP_URL sends (request.url is built from it). */
const http = () => {
  const host = new URL(appOrigin()).host;
  const agent = request(app);
  return {
    get: (p: string) => agent.get(p).set("Host", host),
    post: (p: string) => agent.post(p).set("Host", host),
  };
};
beforeAll(async () => {
  app = await builtListener();
});
afterAll(async () => {
  await stopQueue();
  await closeDb();
});

const EVIL = "http://evil.example";

function cspOf(res: request.Response): Record<string, string[]> {
  const header = res.headers["content-security-policy"];
  expect(header, "Content-Security-Policy header").toBeTruthy();
  const out: Record<string, string[]> = {};
  for (const part of String(header).split(";")) {
    const [name, ...values] = part.trim().split(/\s+/);
    if (name) out[name] = values;
  }
  return out;
}

function expectCommonHeaders(res: request.Response) {
  const csp = cspOf(res);
  expect(csp["default-src"]).toEqual(["'self'"]);
  expect(csp["object-src"]).toEqual(["'none'"]);
  expect(csp["frame-ancestors"]).toEqual(["'none'"]);
  expect(csp["base-uri"]).toEqual(["'self'"]);
  expect(csp["form-action"]).toContain("'self'");
  expect(csp["media-src"]).toEqual(expect.arrayContaining(["'self'", "blob:"]));
  expect(csp["img-src"]).toEqual(expect.arrayContaining(["'self'", "blob:"]));
  expect(csp["script-src"]?.some((v) => v === "'unsafe-inline'" || v === "*")).toBe(false);
  expect(res.headers["x-content-type-options"]).toBe("nosniff");
  expect(res.headers["referrer-policy"]).toBe("strict-origin-when-cross-origin");
  expect(res.headers["permissions-policy"]).toMatch(/camera=\(\)/);
  return csp;
}

describe("security headers", () => {
  it("a page carries the CSP with a fresh nonce that every inline and module script bears", async () => {
    const a = await http().get("/").expect(200);
    const csp = expectCommonHeaders(a);
    const nonceSource = csp["script-src"].find((v) => v.startsWith("'nonce-"));
    expect(nonceSource).toBeTruthy();
    const nonce = nonceSource!.slice("'nonce-".length, -1);
    expect(nonce.length).toBeGreaterThanOrEqual(16);
    const scripts = [...a.text.matchAll(/<script\b[^>]*>/g)].map((m) => m[0]);
    expect(scripts.length).toBeGreaterThan(0);
    for (const tag of scripts) expect(tag, tag).toContain(`nonce="${nonce}"`);
    // The payments service is where checkout forms end up.
    expect(csp["form-action"].length).toBeGreaterThanOrEqual(2);

    const b = await http().get("/").expect(200);
    expect(cspOf(b)["script-src"]).not.toContain(nonceSource);
  });

  it("a JSON route and a 404 page carry them too", async () => {
    const api = await http().get("/api/me").expect(401);
    expectCommonHeaders(api);
    expect(api.body.error.status).toBe(401);
    const missing = await http().get("/no/such/page").expect(404);
    expectCommonHeaders(missing);
  });
});

describe("mutations only from our own origin", () => {
  it("refuses a cross-origin form post to a page action with 403 before the action runs", async () => {
    const res = await http().post("/sign-in").set("Origin", EVIL).type("form").send({ email: "x@example.test", password: "whatever-password" });
    expect(res.status).toBe(403);
    expect(res.text).toContain("did not come from a Gatecrash page");
    expectCommonHeaders(res);
  });

  it("refuses a cross-origin JSON post with the API error shape", async () => {
    const u = await makeUser();
    const cookie = await sessionCookie(u);
    const res = await request(app)
      .post("/api/judging/00000000-0000-0000-0000-000000000000/scores")
      .set("Origin", EVIL)
      .set("Cookie", cookie)
      .send({ anything: 1 });
    expect(res.status).toBe(403);
    expect(res.body).toEqual({ error: { status: 403, code: "cross_origin", message: expect.any(String) } });
  });

  it("refuses a post with a foreign Referer and one that names no origin at all", async () => {
    const referer = await http().post("/sign-in").set("Referer", `${EVIL}/page`).type("form").send({ email: "a@b.test" });
    expect(referer.status).toBe(403);
    const none = await http().post("/sign-in").type("form").send({ email: "a@b.test" });
    expect(none.status).toBe(403);
    const nullOrigin = await http().post("/sign-in").set("Origin", "null").type("form").send({ email: "a@b.test" });
    expect(nullOrigin.status).toBe(403);
  });

  it("accepts the same post from our own origin (the action answers with its form errors)", async () => {
    const res = await http().post("/sign-in").set("Origin", appOrigin()).type("form").send({ email: "not-an-address", password: "x" });
    expect(res.status).toBe(200);
    expect(res.text).not.toContain("did not come from a Gatecrash page");
    const viaReferer = await http().post("/sign-in").set("Referer", `${appOrigin()}/sign-in`).type("form").send({ email: "not-an-address", password: "x" });
    expect(viaReferer.status).toBe(200);
  });

  it("lets a same-origin JSON call reach the route (which then judges it on its own terms)", async () => {
    const res = await http().post("/api/judging/00000000-0000-0000-0000-000000000000/scores").set("Origin", appOrigin()).send({ anything: 1 });
    expect(res.status).not.toBe(403);
    expect(res.body.error?.code).not.toBe("cross_origin");
  });

  it("leaves the payments webhook to its signature check and refuses a cross-site sign-in (login CSRF)", async () => {
    const hook = await http().post("/api/payments/webhook").set("Origin", EVIL).set("Stripe-Signature", "t=1,v1=bad").set("Content-Type", "application/json").send("{}");
    expect(hook.status).toBe(400);
    // A real account's right password from a foreign page, without cookies: better-auth alone would accept it.
    const u = await makeUser();
    const authCall = await http().post("/api/auth/sign-in/email").set("Origin", EVIL).send({ email: u.email, password: u.password });
    expect(authCall.status).toBe(403);
    expect(authCall.body.error.code).toBe("cross_origin");
    expect(([] as string[]).concat(authCall.headers["set-cookie"] ?? []).some((c) => /session_token=/.test(c))).toBe(false);
  });
});

describe("session cookies", () => {
  it("are HttpOnly and SameSite=Lax, without Secure on plain http", async () => {
    const u = await makeUser();
    const res = await http().post("/sign-in").set("Origin", appOrigin()).type("form").send({ email: u.email, password: u.password });
    expect(res.status).toBe(302);
    const cookies = ([] as string[]).concat(res.headers["set-cookie"] ?? []);
    const session = cookies.find((c) => /session_token=/.test(c));
    expect(session, cookies.join("\n")).toBeTruthy();
    expect(session).toMatch(/;\s*HttpOnly/i);
    expect(session).toMatch(/;\s*SameSite=Lax/i);
    expect(session).not.toMatch(/;\s*Secure/i);
  });

  it("get the Secure flag when the app is served over https", async () => {
    const u = await makeUser();
    // A separate process: the auth instance reads APP_URL once.
    const out = spawnSync(process.execPath, ["node_modules/tsx/dist/cli.mjs", "tests/security/print-auth-cookies.ts"], {
      env: { ...process.env, APP_URL: "https://gatecrash.example", PROBE_EMAIL: u.email, PROBE_PASSWORD: u.password },
      encoding: "utf8",
      timeout: 60_000,
    });
    expect(out.status, out.stderr).toBe(0);
    const { status, cookies } = JSON.parse(out.stdout.trim().split("\n").pop()!) as { status: number; cookies: string[] };
    expect(status).toBe(200);
    const session = cookies.find((c) => /session_token=/.test(c));
    expect(session, cookies.join("\n")).toBeTruthy();
    expect(session).toMatch(/;\s*Secure/i);
    expect(session).toMatch(/;\s*HttpOnly/i);
    expect(session).toMatch(/;\s*SameSite=Lax/i);
  });
});

describe("user text is escaped", () => {
  const EVIL_TEXT = "<script>alert(1)</script>";

  it("renders a hostile competition, entry and crew name as text on the public pages", async () => {
    const f = await makeCompo({ state: "judging" });
    await db().update(competitions).set({ title: EVIL_TEXT }).where(eq(competitions.id, f.competitionId));
    await db().update(entries).set({ title: EVIL_TEXT }).where(eq(entries.id, f.entries[0].id));
    const [e] = await db().select({ crewId: entries.crewId }).from(entries).where(eq(entries.id, f.entries[0].id));
    await db().update(crews).set({ name: EVIL_TEXT }).where(eq(crews.id, e.crewId));

    for (const path of [`/e/${f.event.slug}/${f.slug}`, `/e/${f.event.slug}/${f.slug}/showcase`, `/e/${f.event.slug}/${f.slug}/entries/${f.entries[0].id}`]) {
      const res = await http().get(path);
      expect(res.status, path).toBe(200);
      expect(res.text, path).not.toContain(EVIL_TEXT);
      expect(res.text, path).toContain("&lt;script&gt;alert(1)&lt;/script&gt;");
    }
  });
});

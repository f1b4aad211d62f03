import type { RequestListener } from "node:http";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { privateCluster, type PrivateCluster } from "../security/cluster";

/**
 * PostgreSQL goes away under a running app and comes back: pages answer 503 with the "catching its breath" page,
 * JSON routes the API error shape with 503, and the first request after the restart works again.
 * The test stops a cluster of its own (the shared test cluster keeps serving the other test files), and starts it
 * again at the end whatever happened.
 */
let pg: PrivateCluster;
let app: RequestListener;
let cookie: string;
let host: string;
let closeDb: () => Promise<void>;

beforeAll(async () => {
  pg = await privateCluster("db-away");
  // Before any app module reads its settings (env() is read once, lazily).
  process.env.DATABASE_URL = await pg.newDatabase("gatecrash_away");
  const users = await import("../support/users");
  const u = await users.makeUser({ name: "Steady Hand" });
  cookie = await users.sessionCookie(u);
  closeDb = (await import("~/db/client.server")).closeDb;
  const { builtListener, appOrigin } = await import("../security/listener");
  app = await builtListener();
  host = new URL(appOrigin()).host;
}, 120_000);

afterAll(async () => {
  pg?.start();
  await closeDb?.();
  pg?.destroy();
});

const get = (path: string) => request(app).get(path).set("Host", host).set("Cookie", cookie);

describe("the database goes away and comes back", () => {
  it("answers 503 while it is down and works again by itself once it is up", async () => {
    expect((await get("/")).status).toBe(200);
    expect((await get("/api/me")).status).toBe(200);

    pg.stop();
    try {
      const page = await get("/");
      expect(page.status).toBe(503);
      expect(page.text).toContain("catching its breath");
      expect(page.headers["retry-after"]).toBe("5");
      expect(page.headers["content-security-policy"]).toBeTruthy();

      const api = await get("/api/me");
      expect(api.status).toBe(503);
      expect(api.body).toEqual({ error: { status: 503, code: "database_unavailable", message: expect.any(String) } });

      const post = await request(app).post("/sign-in").set("Host", host).set("Origin", `http://${host}`).type("form").send({ email: "a@b.test", password: "long-enough-pass" });
      expect(post.status).toBe(503);
      expect(post.text).toContain("catching its breath");
    } finally {
      pg.start();
    }

    const again = await get("/");
    expect(again.status).toBe(200);
    expect(again.text).toContain("Steady Hand");
    const me = await get("/api/me");
    expect(me.status).toBe(200);
    expect(me.body.name ?? me.body.email).toBeTruthy();
  });
});

import type { RequestListener } from "node:http";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "~/db/client.server";
import { stopQueue } from "~/jobs/queue.server";
import { appOrigin, builtListener } from "../security/listener";
import { makeUser, sessionCookie, TEST_PASSWORD } from "../support/users";

/**
 * No `next` parameter sends a browser to another site (OWASP Unvalidated Redirects and Forwards Cheat Sheet):
 * the sign-in page (GET when signed in, and the POST's hidden field) and the new-crew page, through the built
 * server. The bypass list itself is tested in app/auth/redirect.test.ts.
 */
let app: RequestListener;
let host: string;
let cookie: string;
let email: string;

beforeAll(async () => {
  app = await builtListener();
  host = new URL(appOrigin()).host;
  const u = await makeUser();
  email = u.email;
  cookie = await sessionCookie(u);
}, 120_000);
afterAll(async () => {
  await stopQueue();
  await closeDb();
});

const EVIL = ["/%5Cevil.test/phish", "/\\evil.test/phish", "//evil.test", "/%09/evil.test", "javascript:alert(1)"];

/** Where a browser would go: the Location resolved against the page's own URL. */
function landsOn(location: string | undefined): string {
  return new URL(location ?? "", `http://${host}/sign-in`).host;
}

describe("redirects after sign-in and crew creation stay on this site", () => {
  it.each(EVIL)("GET /sign-in?next=%s when signed in", async (next) => {
    const res = await request(app).get(`/sign-in?next=${encodeURIComponent(next).replace(/%25/g, "%")}`).set("Host", host).set("Cookie", cookie);
    expect(res.status).toBe(302);
    expect(landsOn(res.headers.location)).toBe(host);
    expect(res.headers.location).not.toMatch(/evil/);
  });

  it.each(EVIL)("POST /sign-in with next=%s", async (next) => {
    const res = await request(app).post("/sign-in").set("Host", host).set("Origin", `http://${host}`).type("form").send({ email, password: TEST_PASSWORD, next });
    expect(res.status).toBe(302);
    expect(landsOn(res.headers.location)).toBe(host);
    expect(res.headers.location).not.toMatch(/evil/);
  });

  it.each(EVIL)("POST /crews/new?next=%s", async (next) => {
    const handle = `crew-${Math.random().toString(36).slice(2, 10)}`;
    const res = await request(app)
      .post(`/crews/new?next=${encodeURIComponent(next)}`)
      .set("Host", host)
      .set("Origin", `http://${host}`)
      .set("Cookie", cookie)
      .type("form")
      .send({ name: "Redirect Testers", handle });
    expect(res.status).toBe(302);
    expect(landsOn(res.headers.location)).toBe(host);
    expect(res.headers.location).not.toMatch(/evil/);
  });

  it("still follows a path on this site", async () => {
    const res = await request(app).get(`/sign-in?next=${encodeURIComponent("/my/entries")}`).set("Host", host).set("Cookie", cookie);
    expect(res.headers.location).toBe("/my/entries");
  });
});

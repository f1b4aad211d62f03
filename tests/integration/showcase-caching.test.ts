import { eq } from "drizzle-orm";
import supertest from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { RequestListener } from "node:http";
import { closeDb, db } from "~/db/client.server";
import { artifacts, entries, uploadFiles } from "~/db/schema";
import { stopQueue } from "~/jobs/queue.server";
import { builtListener } from "../security/listener";
import { makeUser, sessionCookie, unique } from "../support/users";
import { addCheckRun, makeCompo, setCompetition } from "./showcase.fixtures";

/**
 * HTTP caching of the published showcase over the production server (server/app.ts and the build): ETag and
 * If-None-Match → 304 (RFC 9110, sections 8.8.3, 13.1.2 and 15.4.5), a new ETag whenever what the showcase
 * shows changes, nothing private in the page, and a fresh CSP nonce in every page served from the kept render.
 */
let app: RequestListener;

beforeAll(async () => {
  app = await builtListener();
});
afterAll(async () => {
  await stopQueue();
  await closeDb();
});

/** The nonce of the policy's script-src and every nonce attribute in the page. */
function nonces(res: supertest.Response): { header: string | undefined; body: string[] } {
  const header = /'nonce-([^']+)'/.exec(res.headers["content-security-policy"] ?? "")?.[1];
  const body = [...res.text.matchAll(/nonce="([^"]+)"/g)].map((m) => m[1]);
  return { header, body };
}

const PRIVATE = ["s3Key", "private/", "secret-design.zip", "f".repeat(64), "@example.test", "secret reason", "orderSeed", "objkey/", "Banned Beam"];

describe("the published showcase over HTTP", () => {
  it("has an ETag, answers If-None-Match with 304, and changes its ETag when the publication changes", async () => {
    const f = await makeCompo({ state: "judging", blind: true });
    await addCheckRun(f.entries[0].uploadId, "pass");
    const path = `/e/${f.event.slug}/${f.slug}/showcase`;

    const first = await supertest(app).get(path);
    expect(first.status).toBe(200);
    const etag = first.headers.etag as string;
    expect(etag).toMatch(/^"[A-Za-z0-9_-]+"$/);
    expect(first.headers["cache-control"]).toBe("public, no-cache");
    expect(first.headers.vary).toMatch(/Cookie/i);
    for (const e of f.entries) expect(first.text).toContain(e.title);
    for (const secret of PRIVATE) expect(first.text, secret).not.toContain(secret);
    // Blind judging: no crew names in the page.
    for (const e of f.entries) expect(first.text).not.toContain(e.crew);

    // The same page again: the same ETag, from the kept render, but with its own fresh nonce throughout.
    const second = await supertest(app).get(path);
    expect(second.headers.etag).toBe(etag);
    const a = nonces(first);
    const b = nonces(second);
    expect(a.header).toBeTruthy();
    expect(b.header).toBeTruthy();
    expect(b.header).not.toBe(a.header);
    expect(a.body.length).toBeGreaterThan(0);
    expect(a.body.every((n) => n === a.header)).toBe(true);
    expect(b.body.every((n) => n === b.header)).toBe(true);
    expect(second.text.replaceAll(b.header!, a.header!)).toBe(first.text);

    // RFC 9110 13.1.2: a matching If-None-Match on a GET gets 304, no body, the ETag, and no page policy.
    for (const header of [etag, `W/${etag}`, `"other", ${etag}`, "*"]) {
      const cached = await supertest(app).get(path).set("If-None-Match", header);
      expect(cached.status, header).toBe(304);
      expect(cached.text ?? "", header).toBe("");
      expect(cached.headers.etag).toBe(etag);
      expect(cached.headers["content-security-policy"]).toBeUndefined();
    }
    expect((await supertest(app).get(path).set("If-None-Match", '"something-else"')).status).toBe(200);

    // A check run finishing changes what the showcase shows: a new ETag, and the old one gets the page again.
    await addCheckRun(f.entries[1].uploadId, "warn", ["first-frame"]);
    const afterRun = await supertest(app).get(path).set("If-None-Match", etag);
    expect(afterRun.status).toBe(200);
    expect(afterRun.headers.etag).not.toBe(etag);

    // Results published: crews are shown, and the ETag changes again.
    await setCompetition(f.competitionId, { state: "results" });
    const results = await supertest(app).get(path).set("If-None-Match", afterRun.headers.etag);
    expect(results.status).toBe(200);
    expect(results.headers.etag).not.toBe(afterRun.headers.etag);
    for (const e of f.entries) expect(results.text).toContain(e.crew);
    for (const secret of PRIVATE) expect(results.text, secret).not.toContain(secret);

    // An entry disqualified after publication leaves the showcase at once.
    await db().update(entries).set({ state: "disqualified", disqualifiedReason: "secret reason" }).where(eq(entries.id, f.entries[2].id));
    const dq = await supertest(app).get(path).set("If-None-Match", results.headers.etag);
    expect(dq.status).toBe(200);
    expect(dq.text).not.toContain(f.entries[2].title);
    expect(dq.text).not.toContain("secret reason");
  });

  it("is never cached for a signed-in visitor, whose page carries their own name", async () => {
    const f = await makeCompo({ state: "judging" });
    const path = `/e/${f.event.slug}/${f.slug}/showcase`;
    const anonymous = await supertest(app).get(path);
    const user = await makeUser({ name: "Signed In Sam" });
    const res = await supertest(app).get(path).set("Cookie", await sessionCookie(user)).set("If-None-Match", anonymous.headers.etag);
    expect(res.status).toBe(200);
    expect(res.headers.etag).toBeUndefined();
    expect(res.headers["cache-control"] ?? "").not.toMatch(/public/);
    expect(res.text).toContain("Signed In Sam");
    expect(anonymous.text).not.toContain("Signed In Sam");
  });

  it("the entry page has an ETag too and answers 304", async () => {
    const f = await makeCompo({ state: "judging" });
    const path = `/e/${f.event.slug}/${f.slug}/entries/${f.entries[0].id}`;
    const page = await supertest(app).get(path);
    expect(page.status).toBe(200);
    expect(page.headers.etag).toBeTruthy();
    expect((await supertest(app).get(path).set("If-None-Match", page.headers.etag)).status).toBe(304);
    // Another entry's page is another resource with its own tag.
    const other = await supertest(app).get(`/e/${f.event.slug}/${f.slug}/entries/${f.entries[1].id}`);
    expect(other.headers.etag).not.toBe(page.headers.etag);
  });

  it("media and artifacts answer If-None-Match with their content hash: 304 without a trip to the store", async () => {
    const f = await makeCompo({ state: "judging" });
    const stillHash = "c".repeat(64);
    await db().insert(uploadFiles).values({
      uploadId: f.entries[0].uploadId,
      kind: "still",
      s3Key: `private/${unique("still")}.png`,
      filename: "still.png",
      claimedBytes: 10,
      sizeBytes: 10,
      sha256: stillHash,
      mediaType: "image/png",
      state: "confirmed",
    });
    // No object exists in the store for these rows: only a 304 can come back without reaching it.
    const still = await supertest(app).get(`/e/${f.event.slug}/${f.slug}/entries/${f.entries[0].id}/media/still`).set("If-None-Match", `"${stillHash}"`);
    expect(still.status).toBe(304);
    expect(still.headers.etag).toBe(`"${stillHash}"`);
    expect(still.headers["cache-control"]).toBe("public, max-age=300");
    const runId = await addCheckRun(f.entries[0].uploadId, "pass", ["first-frame"]);
    const [art] = await db().select().from(artifacts).where(eq(artifacts.checkRunId, runId));
    const artifact = await supertest(app).get(`/artifacts/${art.id}`).set("If-None-Match", `"${art.sha256}"`);
    expect(artifact.status).toBe(304);
    expect(artifact.headers.etag).toBe(`"${art.sha256}"`);
    // The check comes before the 304: an entry that has left the showcase is 404, whatever tag is sent.
    await db().update(entries).set({ state: "disqualified" }).where(eq(entries.id, f.entries[0].id));
    const gone = await supertest(app).get(`/e/${f.event.slug}/${f.slug}/entries/${f.entries[0].id}/media/still`).set("If-None-Match", `"${stillHash}"`);
    expect(gone.status).toBe(404);
  });
});

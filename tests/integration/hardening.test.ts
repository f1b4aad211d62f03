import { request as httpRequest } from "node:http";
import Stripe from "stripe";
import supertest from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "~/db/client.server";
import { eq } from "drizzle-orm";
import { artifacts, juryAssignments } from "~/db/schema";
import { env } from "~/env.server";
import { stopQueue } from "~/jobs/queue.server";
import { listenBuilt } from "../security/listener";
import { grantEventRole, makeUser, sessionCookie } from "../support/users";
import { addCheckRun, makeCompo, setCompetition } from "./showcase.fixtures";

/**
 * The built server answers hostile or broken requests with a 4xx, never a 500 and never by reading a huge body
 * whole: ids that are not UUIDs (RFC 9562 § 4 layout, checked by zod's uuid), page actions without a form body,
 * bodies over the route's limit (RFC 9110 § 15.5.14: 413 Content Too Large), a validly signed webhook that is
 * not JSON, the SVG artifact's own policy, and score saves while entries are still open.
 */
let server: Awaited<ReturnType<typeof listenBuilt>>;
let base: string;
let cookie: string;

beforeAll(async () => {
  server = await listenBuilt();
  base = server.base;
  cookie = await sessionCookie(await makeUser({ name: "Prober" }));
}, 120_000);

afterAll(async () => {
  await server.close();
  await stopQueue();
  await closeDb();
});

const app = () => supertest(base);
const DASHES = "-".repeat(36);
const ZERO_ISH = "zzzzzzzz-zzzz-zzzz-zzzz-zzzzzzzzzzzz";

describe("ids that are not UUIDs are a 404, never a 500", () => {
  const paths = [
    "/api/checks/x",
    `/api/checks/${DASHES}`,
    `/artifacts/${DASHES}`,
    `/entries/${DASHES}`,
    `/crews/${DASHES}`,
    `/api/uploads/${DASHES}`,
    `/api/uploads/${DASHES}/files/${DASHES}`,
    `/organize/${DASHES}`,
    `/organize/${ZERO_ISH}/audience`,
    `/organize/${DASHES}/results`,
    `/organize/events/${DASHES}`,
    `/stage/x`,
    `/judging/${DASHES}`,
    `/api/ballots/${DASHES}`,
    `/api/judging/${DASHES}/scores`,
  ];
  it.each(paths)("GET %s", async (path) => {
    const res = await app().get(path).set("Cookie", cookie);
    expect(res.status).toBe(404);
  });
});

describe("page actions read forms only, and a broken one is a 4xx", () => {
  it("answers a POST with no Content-Type 415 or 400", async () => {
    const res = await app().post("/sign-in").set("Origin", base).send(Buffer.from("email=a@b.test&password=x"));
    expect([400, 415]).toContain(res.status);
  });
  it("answers broken multipart with 400", async () => {
    const res = await app()
      .post("/sign-in")
      .set("Origin", base)
      .set("Content-Type", "multipart/form-data; boundary=gatecrash-boundary")
      .send("--gatecrash-boundary\r\nContent-Disposition: form-data; name=\"email\"\r\n\r\nno closing boundary");
    expect(res.status).toBe(400);
  });
  it("answers multipart without a boundary with 400", async () => {
    const res = await app().post("/crews/new").set("Origin", base).set("Cookie", cookie).set("Content-Type", "multipart/form-data").send("x");
    expect(res.status).toBe(400);
  });
});

/**
 * Sends `total` bytes in chunks with node's own client, honouring back-pressure, and stops writing as soon as the
 * server answers. What it reports is how much the server let in before answering: a server that reads the body
 * whole answers only after all of it.
 */
function streamBody(path: string, headers: Record<string, string>, total: number): Promise<{ status: number; sentBeforeAnswer: number }> {
  return new Promise((resolve, reject) => {
    const chunk = Buffer.alloc(64 * 1024, 0x61);
    let sent = 0;
    let answered = false;
    const req = httpRequest(`${base}${path}`, { method: headers["x-method"] ?? "PUT", headers: { origin: base, ...headers } });
    req.on("response", (res) => {
      answered = true;
      const status = res.statusCode ?? 0;
      res.resume();
      resolve({ status, sentBeforeAnswer: sent });
      req.destroy();
    });
    req.on("error", (e) => (answered ? undefined : reject(e)));
    const pump = () => {
      while (!answered && sent < total) {
        sent += chunk.length;
        if (!req.write(chunk)) return void req.once("drain", pump);
      }
      if (!answered) req.end();
    };
    pump();
  });
}

const FIFTY_MB = 50 * 1024 * 1024;

describe("bodies over the limit are refused while they stream", () => {
  it("refuses a declared 50 MB JSON body at once with 413", async () => {
    const f = await makeCompo({ method: "borda" });
    const out = await streamBody(`/api/ballots/${f.competitionId}`, { "content-type": "application/json", "content-length": String(FIFTY_MB) }, FIFTY_MB);
    expect(out.status).toBe(413);
    expect(out.sentBeforeAnswer).toBeLessThan(8 * 1024 * 1024);
  }, 120_000);

  it("refuses a 50 MB chunked JSON body after reading only about the limit", async () => {
    const f = await makeCompo({ method: "borda" });
    const out = await streamBody(`/api/ballots/${f.competitionId}`, { "content-type": "application/json", "transfer-encoding": "chunked" }, FIFTY_MB);
    expect(out.status).toBe(413);
    expect(out.sentBeforeAnswer).toBeLessThan(8 * 1024 * 1024);
  }, 120_000);

  it("refuses a 50 MB chunked form to /sign-in without parsing it", async () => {
    const out = await streamBody("/sign-in", { "content-type": "application/x-www-form-urlencoded", "transfer-encoding": "chunked", "x-method": "POST" }, FIFTY_MB);
    expect(out.status).toBe(413);
    expect(out.sentBeforeAnswer).toBeLessThan(8 * 1024 * 1024);
  }, 120_000);
});

describe("the payments webhook", () => {
  it("answers a validly signed body that is not JSON with 400", async () => {
    const payload = "{this is not json";
    const header = new Stripe("sk_unused_offline").webhooks.generateTestHeaderString({ payload, secret: env().STRIPE_WEBHOOK_SECRET });
    const res = await app().post("/api/payments/webhook").set("Content-Type", "application/json").set("Stripe-Signature", header).send(payload);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("invalid_json");
  });
});

describe("the SVG layout picture", () => {
  it("keeps its own default-src 'none' policy", async () => {
    const f = await makeCompo({ state: "judging" });
    const runId = await addCheckRun(f.entries[0].uploadId, "pass", ["layout-svg"]);
    const [artifact] = await db().query.artifacts.findMany({ where: (x, { eq }) => eq(x.checkRunId, runId) });
    const { putObject } = await import("~/storage/s3.server");
    const svg = '<svg xmlns="http://www.w3.org/2000/svg"/>';
    await putObject(artifact.s3Key, svg, "image/svg+xml");
    await db().update(artifacts).set({ sizeBytes: Buffer.byteLength(svg) }).where(eq(artifacts.id, artifact.id));
    const res = await app().get(`/artifacts/${artifact.id}`).set("Cookie", f.organizerCookie);
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toMatch(/image\/svg\+xml/);
    expect(res.headers["content-security-policy"]).toMatch(/^default-src 'none'/);
    expect(res.headers["content-security-policy"]).not.toMatch(/script-src/);
  });
});

describe("scores wait for entries to close", () => {
  it("refuses a judge's save while the compo is open, and takes it once judging starts", async () => {
    const f = await makeCompo({ state: "open" });
    const judge = await makeUser({ name: "Eager Judge" });
    await grantEventRole(f.event.id, judge.id, "judge");
    await db().insert(juryAssignments).values({ competitionId: f.competitionId, judgeUserId: judge.id });
    const jc = await sessionCookie(judge);
    const body = { entryId: f.entries[0].id, criterionId: f.criteria[0].id, value: 5, version: 0 };
    const early = await app().post(`/api/judging/${f.competitionId}/scores`).set("Origin", base).set("Cookie", jc).send(body);
    expect(early.status).toBe(409);
    expect(early.body.error.code).toBe("entries_still_open");
    await setCompetition(f.competitionId, { state: "judging" });
    const later = await app().post(`/api/judging/${f.competitionId}/scores`).set("Origin", base).set("Cookie", jc).send(body);
    expect(later.status).toBe(200);
  });
});


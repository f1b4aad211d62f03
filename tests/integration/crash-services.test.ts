import { createHash } from "node:crypto";
import { chmodSync, readFileSync, mkdtempSync } from "node:fs";
import { join } from "node:path";
import { tmpdir } from "node:os";
import type { RequestListener } from "node:http";
import request from "supertest";
import yazl from "yazl";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq, sql } from "drizzle-orm";
import { freePort } from "../../scripts/lib/ports";
import { startS3Fake } from "../../fakes/s3/server";
import { designPath } from "../../demo/designs/index";
import { ownDatabase, startMaildev, startWorker, until, type Child } from "../security/services";

/**
 * Crash safety with real processes: a worker killed (SIGKILL) in the middle of a check run, the SMTP catcher
 * down while mail waits, the object store down in the middle of an upload. This file runs on a database of its own
 * (its own pg-boss queues) and an S3 fake of its own, so stopping things here never disturbs other test files.
 */
const root = mkdtempSync(join(process.env.TEST_ROOT ?? tmpdir(), "crash-"));
// The sandbox user must reach the work folders inside.
chmodSync(root, 0o755);
let s3: { close(): Promise<void> } | undefined;
let s3Port = 0;
let smtpPort = 0;
let workerEnv: NodeJS.ProcessEnv;
const children: Child[] = [];

// Loaded after the settings are in place (env() is read once, lazily).
let mod: {
  db: typeof import("~/db/client.server");
  schema: typeof import("~/db/schema");
  queue: typeof import("~/conformance/queue.server");
  jobs: typeof import("~/jobs/queue.server");
  outbox: typeof import("~/mail/outbox.server");
  run: typeof import("~/conformance/run.server");
};

const startS3 = async () => {
  s3 = await startS3Fake({ port: s3Port, directory: join(root, "s3"), bucket: process.env.S3_BUCKET ?? "gatecrash", keys: { accessKeyId: process.env.S3_ACCESS_KEY_ID ?? "S3RVER", secretAccessKey: process.env.S3_SECRET_ACCESS_KEY ?? "S3RVER" } });
};
const stopS3 = async () => {
  await s3?.close();
  s3 = undefined;
};

beforeAll(async () => {
  s3Port = await freePort();
  smtpPort = await freePort();
  process.env.DATABASE_URL = await ownDatabase("gatecrash_crash");
  process.env.S3_ENDPOINT = `http://127.0.0.1:${s3Port}`;
  process.env.SMTP_PORT = String(smtpPort);
  process.env.CHECK_RUN_EXPIRE_SECONDS = "25";
  process.env.QUEUE_MAINTENANCE_SECONDS = "1";
  process.env.WORKDIR = join(root, "work");
  workerEnv = { ...process.env, NODE_ENV: "test" };
  await startS3();
  mod = {
    db: await import("~/db/client.server"),
    schema: await import("~/db/schema"),
    queue: await import("~/conformance/queue.server"),
    jobs: await import("~/jobs/queue.server"),
    outbox: await import("~/mail/outbox.server"),
    run: await import("~/conformance/run.server"),
  };
}, 120_000);

afterAll(async () => {
  for (const c of children) await c.stop();
  await mod?.jobs.stopQueue();
  await mod?.db.closeDb();
  await stopS3();
});

function zipOf(name: string, text: Buffer): Promise<Buffer> {
  const z = new yazl.ZipFile();
  z.addBuffer(text, name);
  z.end();
  const chunks: Buffer[] = [];
  return new Promise((resolve) => {
    z.outputStream.on("data", (c: Buffer) => chunks.push(c));
    z.outputStream.on("end", () => resolve(Buffer.concat(chunks)));
  });
}

describe("a worker killed in the middle of a check run", () => {
  it("the job is handed out again and the run finishes exactly once", async () => {
    const { makeEvent, makeUser } = await import("../support/users");
    const { makeCompetitionWithEntry, makeCompleteUpload } = await import("../support/entries");
    const { generateDemoLayout } = await import("../support/demo-layout");
    const { DEMO_RULESET } = await import("~/rules/ruleset");
    const { checkRuns, findings, artifacts } = mod.schema;
    const db = mod.db.db;

    const event = await makeEvent();
    const captain = await makeUser();
    const made = await makeCompetitionWithEntry({ eventId: event.id, captainId: captain.id, state: "open" });
    const upload = await makeCompleteUpload(made.entry.id, 1, [
      { kind: "bundle", bytes: await zipOf("xor.v", readFileSync(designPath("xor-tide"))), filename: "xor.zip", mediaType: "application/zip" },
      { kind: "layout", bytes: generateDemoLayout({ ruleset: DEMO_RULESET, shape: "single", flipFlops: 30, logicCells: 200, seed: 3 }).bytes, filename: "xor.gds", mediaType: "application/vnd.gdsii" },
    ]);
    const runId = await mod.queue.queueCheckRun(upload.id);
    const runRow = async () => (await db().select().from(checkRuns).where(eq(checkRuns.id, runId)))[0];

    const first = startWorker(workerEnv);
    children.push(first);
    // Past intake: the pipeline is at work on the design when the power goes.
    const mid = await until("the run to be under way", runRow, (r) => r.state === "running" && r.step !== null && r.step !== "intake", 90_000, 50);
    await first.kill();
    expect(mid.state).toBe("running");
    expect((await runRow()).state).toBe("running");

    const second = startWorker(workerEnv);
    children.push(second);
    const done = await until("the run to finish after the retry", runRow, (r) => r.state === "done" || r.state === "error", 180_000, 500);
    expect(done.state, done.error ?? "").toBe("done");
    expect(done.attempts).toBeGreaterThanOrEqual(2);

    // Once: one set of findings (no position twice), one artifact per kind, and a further delivery changes nothing.
    const rows = await db().select().from(findings).where(eq(findings.checkRunId, runId));
    expect(rows.length).toBeGreaterThan(0);
    expect(new Set(rows.map((r) => r.position)).size).toBe(rows.length);
    const kinds = (await db().select().from(artifacts).where(eq(artifacts.checkRunId, runId))).map((a) => a.kind);
    expect(new Set(kinds).size).toBe(kinds.length);
    expect(await mod.run.executeCheckRun(runId)).toBe("skipped");
    expect((await db().select().from(findings).where(eq(findings.checkRunId, runId))).length).toBe(rows.length);
    const after = await runRow();
    expect(after.finishedAt?.getTime()).toBe(done.finishedAt?.getTime());
    // The job itself ends settled in pg-boss, not stuck active.
    const jobStates = async () => (await db().execute<{ state: string }>(sql`select state from pgboss.job where name = 'check-run' and data->>'checkRunId' = ${runId}`)).map((j) => j.state);
    const settled = await until("the job to settle", jobStates, (states) => states.length > 0 && !states.includes("active") && !states.includes("retry"), 60_000, 500);
    expect(settled).toContain("completed");
  }, 300_000);
});

describe("the SMTP catcher is down", () => {
  it("mail waits in the outbox and goes out when the catcher is back", async () => {
    const { outbox } = mod.schema;
    const db = mod.db.db;
    if (!children.some((c) => c.child.exitCode === null && c.child.signalCode === null)) children.push(startWorker(workerEnv));
    const to = `waiting-${process.pid}@example.test`;
    const id = await mod.outbox.enqueueMail({ to, subject: "Held back by a dead catcher", text: "It waited.", html: "<p>It waited.</p>", dedupeKey: `crash-mail-${process.pid}-${Date.now()}` });
    expect(id).toBeTruthy();
    const row = async () => (await db().select().from(outbox).where(eq(outbox.id, id!)))[0];
    const failed = await until("a failed delivery attempt", row, (r) => r.attempts >= 1, 60_000);
    expect(failed.state).toBe("pending");
    expect(failed.lastError).toMatch(/ECONNREFUSED|connect/i);

    const catcher = await startMaildev(smtpPort);
    children.push(catcher.proc);
    const sent = await until("the mail to be sent", row, (r) => r.state === "sent", 90_000, 500);
    expect(sent.sentAt).toBeTruthy();
    const caught = await until(
      "the mail in the catcher",
      async () => (await (await fetch(`${catcher.apiUrl}/api/email`)).json()) as { subject: string; to: { address: string }[] }[],
      (all) => all.some((m) => m.to.some((t) => t.address === to)),
      20_000,
    );
    expect(caught.filter((m) => m.to.some((t) => t.address === to))).toHaveLength(1);
  }, 180_000);
});

describe("the object store is down during an upload", () => {
  it("answers with a clear 503 and the same upload resumes once the store is back", async () => {
    const { makeEntrySetup } = await import("./entries-support");
    const { builtListener, appOrigin } = await import("../security/listener");
    const app: RequestListener = await builtListener();
    const host = new URL(appOrigin()).host;
    const s = await makeEntrySetup();
    const post = (path: string, body: unknown) => request(app).post(path).set("Host", host).set("Origin", `http://${host}`).set("Cookie", s.cookie).send(body as object);

    const bytes = await zipOf("xor.v", readFileSync(designPath("xor-tide")));
    const { generateDemoLayout } = await import("../support/demo-layout");
    const { DEMO_RULESET } = await import("~/rules/ruleset");
    const gds = Buffer.from(generateDemoLayout({ ruleset: DEMO_RULESET, shape: "single", flipFlops: 30, logicCells: 200, seed: 5 }).bytes);
    const started = await post(`/api/entries/${s.entry.id}/uploads`, {
      files: [
        { kind: "bundle", filename: "xor.zip", size: bytes.length },
        { kind: "layout", filename: "xor.gds", size: gds.length },
      ],
    });
    expect(started.status, JSON.stringify(started.body)).toBe(201);
    const uploadId: string = started.body.uploadId;
    const planned = started.body.files as { id: string; kind: string; partCount: number }[];
    const file = planned.find((f) => f.kind === "bundle")!;
    const layout = planned.find((f) => f.kind === "layout")!;
    expect(file.partCount).toBe(1);
    // The layout goes through before the outage.
    const signedLayout = await post(`/api/uploads/${uploadId}/files/${layout.id}`, { action: "sign", partNumbers: [1] });
    const putLayout = await fetch(signedLayout.body.urls[1], { method: "PUT", body: new Uint8Array(gds) });
    expect(putLayout.status).toBe(200);
    expect((await post(`/api/uploads/${uploadId}/files/${layout.id}`, { action: "part", partNumber: 1, etag: putLayout.headers.get("etag"), size: gds.length })).status).toBe(200);
    expect((await post(`/api/uploads/${uploadId}/files/${layout.id}`, { action: "confirm" })).status).toBe(200);

    const signed = await post(`/api/uploads/${uploadId}/files/${file.id}`, { action: "sign", partNumbers: [1] });
    expect(signed.status).toBe(200);
    const url: string = signed.body.urls[1];

    await stopS3();
    try {
      // The browser's PUT fails outright; the server's next step answers 503 with the API error shape.
      await expect(fetch(url, { method: "PUT", body: new Uint8Array(bytes) })).rejects.toThrow();
      const confirmDown = await post(`/api/uploads/${uploadId}/files/${file.id}`, { action: "confirm" });
      expect(confirmDown.status).toBe(503);
      expect(confirmDown.body.error.code).toBe("storage_unavailable");
      expect(confirmDown.body.error.message).toMatch(/resume/);
      // Starting a new upload of the same entry fails clearly too, and leaves the unfinished one as it was.
      const another = await post(`/api/entries/${s.entry.id}/uploads`, {
        files: [
          { kind: "bundle", filename: "xor.zip", size: bytes.length },
          { kind: "layout", filename: "xor.gds", size: gds.length },
        ],
      });
      expect(another.status).toBe(503);
      expect(another.body.error.code).toBe("storage_unavailable");
      const { db } = await import("~/db/client.server");
      const { uploads } = await import("~/db/schema");
      const { eq } = await import("drizzle-orm");
      const ofEntry = await db().select({ id: uploads.id, state: uploads.state }).from(uploads).where(eq(uploads.entryId, s.entry.id));
      expect(ofEntry).toEqual([{ id: uploadId, state: "pending" }]);
    } finally {
      await startS3();
    }

    const put = await fetch(url, { method: "PUT", body: new Uint8Array(bytes) });
    expect(put.status).toBe(200);
    expect((await post(`/api/uploads/${uploadId}/files/${file.id}`, { action: "part", partNumber: 1, etag: put.headers.get("etag"), size: bytes.length })).status).toBe(200);
    const confirmed = await post(`/api/uploads/${uploadId}/files/${file.id}`, { action: "confirm" });
    expect(confirmed.status, JSON.stringify(confirmed.body)).toBe(200);
    // FIPS 180-4 SHA-256 by node:crypto as the reference for the stored object's hash.
    expect(confirmed.body.file.sha256).toBe(createHash("sha256").update(bytes).digest("hex"));
    const completed = await post(`/api/uploads/${uploadId}`, { action: "complete" });
    expect(completed.status, JSON.stringify(completed.body)).toBe(200);
  }, 120_000);
});

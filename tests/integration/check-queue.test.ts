import { mkdtempSync, chmodSync, readFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { and, eq, inArray, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { designPath } from "../../demo/designs/index";
import { ownDatabase, startWorker, until, type Child } from "../security/services";

/**
 * The check queue on pg-boss: one waiting job per entry, the newest upload checked, a retry behind every first
 * attempt, the place in line on the report, and check runs spread over worker processes and over the slots of
 * one process. A database of this file's own, so no other test file's jobs are in the line.
 */
const root = mkdtempSync(join(process.env.TEST_ROOT ?? tmpdir(), "queue-"));
chmodSync(root, 0o755); // the sandbox user must reach the work folders inside
const children: Child[] = [];
let workerEnv: NodeJS.ProcessEnv;

let mod: {
  db: typeof import("~/db/client.server");
  schema: typeof import("~/db/schema");
  queue: typeof import("~/conformance/queue.server");
  jobs: typeof import("~/jobs/queue.server");
  run: typeof import("~/conformance/run.server");
  report: typeof import("~/conformance/report.server");
  storage: typeof import("~/entries/storage.server");
  users: typeof import("../support/users");
  entries: typeof import("../support/entries");
  archives: typeof import("../support/archives");
  layout: typeof import("../support/demo-layout");
  rules: typeof import("~/rules/ruleset");
};

beforeAll(async () => {
  process.env.DATABASE_URL = await ownDatabase("gatecrash_queue");
  process.env.WORKDIR = join(root, "work");
  workerEnv = { ...process.env, NODE_ENV: "test" };
  mod = {
    db: await import("~/db/client.server"),
    schema: await import("~/db/schema"),
    queue: await import("~/conformance/queue.server"),
    jobs: await import("~/jobs/queue.server"),
    run: await import("~/conformance/run.server"),
    report: await import("~/conformance/report.server"),
    storage: await import("~/entries/storage.server"),
    users: await import("../support/users"),
    entries: await import("../support/entries"),
    archives: await import("../support/archives"),
    layout: await import("../support/demo-layout"),
    rules: await import("~/rules/ruleset"),
  };
}, 120_000);

afterAll(async () => {
  for (const c of children) await c.stop();
  await mod?.jobs.stopQueue();
  await mod?.db.closeDb();
});

async function files() {
  return [
    { kind: "bundle" as const, bytes: await mod.archives.zipOf({ "m.v": readFileSync(designPath("munch-squares")) }), filename: "m.zip", mediaType: "application/zip" },
    { kind: "layout" as const, bytes: mod.layout.generateDemoLayout({ ruleset: mod.rules.DEMO_RULESET, shape: "single", flipFlops: 30, logicCells: 200, seed: 3 }).bytes, filename: "m.gds", mediaType: "application/vnd.gdsii" },
  ];
}

/** An entry of its own crew, in a compo whose reference capture is four frames (short runs are enough here). */
async function entry(eventId: string) {
  const captain = await mod.users.makeUser();
  const ruleset = mod.rules.rulesetSchema.parse({ ...mod.rules.DEMO_RULESET, simulation: { ...mod.rules.DEMO_RULESET.simulation, frames: 4 } });
  return (await mod.entries.makeCompetitionWithEntry({ eventId, captainId: captain.id, state: "open", ruleset })).entry;
}

async function upload(entryId: string, number: number): Promise<{ uploadId: string; runId: string }> {
  const u = await mod.entries.makeCompleteUpload(entryId, number, await files());
  return { uploadId: u.id, runId: await mod.queue.queueCheckRun(u.id) };
}

const waitingJobs = async () =>
  (await mod.db.db().execute<{ key: string; priority: number }>(sql`select singleton_key as key, priority from pgboss.job where name = 'check-run' and state < 'active'`)) as unknown as { key: string; priority: number }[];

const runState = async (id: string) => (await mod.db.db().select().from(mod.schema.checkRuns).where(eq(mod.schema.checkRuns.id, id)))[0];

async function emptyQueue() {
  const boss = await mod.jobs.queue();
  await boss.purgeQueue(mod.jobs.QUEUES.checkRun);
}

describe("the check queue", () => {
  it("holds one job per entry however often its crew uploads, and that job checks the newest upload", async () => {
    await emptyQueue();
    const event = await mod.users.makeEvent();
    const busy = await entry(event.id);
    const calm = await entry(event.id);
    const busyRuns = [];
    for (let n = 1; n <= 5; n++) busyRuns.push(await upload(busy.id, n));
    const calmRun = await upload(calm.id, 1);
    expect((await waitingJobs()).map((j) => j.key).sort()).toEqual([busy.id, calm.id].sort());
    // the busy crew's five uploads keep one place; the other crew is next after it, not sixth
    expect((await mod.report.latestCheckFor(calm.id))?.run?.queue).toEqual({ place: 2, running: 0 });
    expect((await mod.report.latestCheckFor(busy.id))?.run?.queue).toEqual({ place: 1, running: 0 });

    const boss = await mod.jobs.queue();
    const [job] = await boss.fetch<{ checkRunId: string }>(mod.jobs.QUEUES.checkRun);
    // the job was sent for the first upload; it checks the fifth
    expect(job.data.checkRunId).toBe(busyRuns[0].runId);
    expect((await mod.report.latestCheckFor(calm.id))?.run?.queue).toEqual({ place: 1, running: 1 });
    expect(await mod.run.executeCheckRun(job.data.checkRunId, { simulate: false })).toBe("done");
    await boss.complete(mod.jobs.QUEUES.checkRun, job.id);
    const states = await mod.db.db()
      .select({ id: mod.schema.checkRuns.id, state: mod.schema.checkRuns.state })
      .from(mod.schema.checkRuns)
      .where(inArray(mod.schema.checkRuns.id, busyRuns.map((r) => r.runId)));
    const byId = new Map(states.map((s) => [s.id, s.state]));
    expect(busyRuns.map((r) => byId.get(r.runId))).toEqual(["superseded", "superseded", "superseded", "superseded", "done"]);
    const report = await mod.report.latestCheckFor(busy.id);
    expect(report?.uploadNumber).toBe(5);
    expect(report?.run?.state).toBe("done");
    expect(report?.findings.some((f) => f.rule === "layout.die.size")).toBe(true);
    expect((await runState(calmRun.runId)).state).toBe("queued");
  }, 120_000);

  it("checks an upload the crew picks as final after its queued check was dropped for a newer one", async () => {
    await emptyQueue();
    const event = await mod.users.makeEvent();
    const e = await entry(event.id);
    const first = await upload(e.id, 1);
    const second = await upload(e.id, 2);
    const boss = await mod.jobs.queue();
    const [job] = await boss.fetch<{ checkRunId: string }>(mod.jobs.QUEUES.checkRun);
    expect(await mod.run.executeCheckRun(job.data.checkRunId, { simulate: false })).toBe("done");
    await boss.complete(mod.jobs.QUEUES.checkRun, job.id);
    expect((await runState(first.runId)).state).toBe("superseded");
    expect((await runState(second.runId)).state).toBe("done");

    // the crew makes #1 the judged upload: it gets a check of its own, which the queue's one job runs
    const crew = await mod.db.db().select({ userId: mod.schema.crewMembers.userId }).from(mod.schema.crewMembers).innerJoin(mod.schema.entries, eq(mod.schema.entries.crewId, mod.schema.crewMembers.crewId)).where(eq(mod.schema.entries.id, e.id));
    const { chooseFinalUpload } = await import("~/entries/final-choice.server");
    await expect(chooseFinalUpload(e.id, crew[0].userId, 1)).resolves.toMatchObject({ message: expect.stringContaining("Upload #1") });
    const [again] = await boss.fetch<{ checkRunId: string }>(mod.jobs.QUEUES.checkRun);
    expect(again).toBeDefined();
    expect(await mod.run.executeCheckRun(again.data.checkRunId, { simulate: false })).toBe("done");
    await boss.complete(mod.jobs.QUEUES.checkRun, again.id);
    const report = await mod.report.latestCheckFor(e.id);
    expect(report?.uploadNumber).toBe(1);
    expect(report?.run?.state).toBe("done");
    // the newer upload's finished check is kept, not superseded by the pick
    expect((await runState(second.runId)).state).toBe("done");
  }, 120_000);

  it("puts a run Gatecrash failed behind every first attempt, and gives up after three attempts", async () => {
    await emptyQueue();
    const event = await mod.users.makeEvent();
    const unlucky = await entry(event.id);
    const { uploadId, runId } = await upload(unlucky.id, 1);
    // the stored bundle disappears: the store's fault, not the crew's
    const [bundle] = await mod.db.db().select().from(mod.schema.uploadFiles).where(and(eq(mod.schema.uploadFiles.uploadId, uploadId), eq(mod.schema.uploadFiles.kind, "bundle")));
    await mod.storage.deleteObjectIfAny(bundle.s3Key);
    await emptyQueue();
    expect(await mod.run.executeCheckRun(runId, { simulate: false })).toBe("retry");
    const after1 = await runState(runId);
    expect(after1.state).toBe("queued");
    expect(after1.error).toMatch(/attempt 1 of 3/);
    expect(await waitingJobs()).toEqual([{ key: unlucky.id, priority: -1 }]);
    // a crew that uploads after the failure still goes first
    const later = await entry(event.id);
    await upload(later.id, 1);
    expect((await mod.report.latestCheckFor(later.id))?.run?.queue?.place).toBe(1);
    expect((await mod.report.latestCheckFor(unlucky.id))?.run?.queue?.place).toBe(2);

    expect(await mod.run.executeCheckRun(runId, { simulate: false })).toBe("retry");
    expect(await mod.run.executeCheckRun(runId, { simulate: false })).toBe("error");
    const last = await runState(runId);
    expect(last.state).toBe("error");
    expect(last.attempts).toBe(3);
    expect(last.error).toMatch(/NoSuchKey|does not exist|not found/i);
    expect(await mod.run.executeCheckRun(runId, { simulate: false })).toBe("skipped");
  }, 120_000);
});

describe("check runs spread over workers", () => {
  const overlap = async (runIds: string[]) => {
    const states = async () => Promise.all(runIds.map(async (id) => (await runState(id)).state));
    // both under way at one moment: two workers (or two slots) each took one
    await until("two check runs to be under way at once", states, (s) => s.filter((x) => x === "running").length === runIds.length, 150_000, 100);
    const done = await until("both runs to finish", states, (s) => s.every((x) => x === "done" || x === "error"), 180_000, 500);
    expect(done).toEqual(runIds.map(() => "done"));
  };

  it("two worker processes on one queue run two checks at the same time", async () => {
    await emptyQueue();
    const event = await mod.users.makeEvent();
    const runs = [(await upload((await entry(event.id)).id, 1)).runId, (await upload((await entry(event.id)).id, 1)).runId];
    const a = startWorker({ ...workerEnv, WORKER_CONCURRENCY: "1" });
    const b = startWorker({ ...workerEnv, WORKER_CONCURRENCY: "1" });
    children.push(a, b);
    await overlap(runs);
    await a.stop();
    await b.stop();
  }, 360_000);

  it("one worker process with WORKER_CONCURRENCY=2 runs two checks at the same time", async () => {
    await emptyQueue();
    const event = await mod.users.makeEvent();
    const runs = [(await upload((await entry(event.id)).id, 1)).runId, (await upload((await entry(event.id)).id, 1)).runId];
    const w = startWorker({ ...workerEnv, WORKER_CONCURRENCY: "2" });
    children.push(w);
    await overlap(runs);
    expect(w.output.join("")).toMatch(/2 check run\(s\) at a time/);
    await w.stop();
  }, 360_000);
});

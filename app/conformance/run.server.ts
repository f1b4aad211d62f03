import { and, desc, eq, inArray, ne, notInArray, sql } from "drizzle-orm";
import { mkdirSync, readFileSync, rmSync } from "node:fs";
import { join } from "node:path";
import { db, type Db } from "~/db/client.server";
import { artifacts, checkRuns, competitions, entries, findings, uploads } from "~/db/schema";
import { worstVerdict, type CheckStep, type Finding } from "~/rules/findings";
import { env } from "~/env.server";
import { parseRuleset } from "~/rules/ruleset";
import { putObject } from "~/storage/s3.server";
import { fetchUploadInputs } from "./inputs.server";
import { requeueCheckRun, resendCheckRun } from "./queue.server";
import { runPipeline, type StepReport } from "./pipeline.server";
import { runWorkDir } from "./workdir.server";

/**
 * The worker's side of a check run. A job names a run; the worker checks the entry's newest upload, or the one
 * its crew picked as final (other queued runs are marked superseded and never cost a build). Each attempt is numbered, and
 * every write of an attempt is fenced on that number, so a stalled attempt that pg-boss handed to another worker
 * cannot mix its results into the new one. Findings, figures and artifacts are written step by step as the
 * pipeline reports them; the run is done, or tried again when Gatecrash (not the upload) failed a step.
 */
export const MAX_CHECK_ATTEMPTS = 3;

export type CheckRunOutcome =
  /** finished (its findings may well fail the entry) */
  | "done"
  /** nothing to do: already finished, or another attempt owns it now */
  | "skipped"
  /** a newer upload of the entry came in; this one is never checked */
  | "superseded"
  /** Gatecrash failed a step; the run is back in the queue, behind every first attempt */
  | "retry"
  /** Gatecrash failed a step on the last attempt; the findings of the other steps stay */
  | "error";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

class Superseded extends Error {}
class StaleAttempt extends Error {}

interface Claimed {
  runId: string;
  attempt: number;
  uploadId: string;
  entryId: string;
  ruleset: unknown;
  repository: { url: string; commit: string } | null;
}

/** The uploads of an entry worth a check: the newest complete one, and the one the crew picked as final. */
async function uploadsWorthChecking(tx: Db | Tx, entryId: string): Promise<{ newest: string | null; keep: string[] }> {
  const [u] = await tx
    .select({ id: uploads.id })
    .from(uploads)
    .where(and(eq(uploads.entryId, entryId), eq(uploads.state, "complete")))
    .orderBy(desc(uploads.number))
    .limit(1);
  const [e] = await tx.select({ pick: entries.finalUploadId }).from(entries).where(eq(entries.id, entryId));
  const newest = u?.id ?? null;
  return { newest, keep: [...new Set([newest, e?.pick ?? null].filter((id): id is string => id !== null))] };
}

/**
 * Picks the run this job should execute and starts a new attempt of it. The job's own run when its upload is
 * still worth checking (the newest, or the crew's pick); else the newest upload's run, if that one still waits.
 * Other waiting runs become superseded.
 */
async function claim(checkRunId: string): Promise<Claimed | "skipped" | "superseded"> {
  return db().transaction(async (tx) => {
    const [row] = await tx
      .select({ entryId: uploads.entryId, uploadId: checkRuns.uploadId })
      .from(checkRuns)
      .innerJoin(uploads, eq(uploads.id, checkRuns.uploadId))
      .where(eq(checkRuns.id, checkRunId));
    if (!row) return "skipped";
    // One entry's runs are claimed one at a time (two workers may hold jobs of the same entry).
    await tx.select({ id: entries.id }).from(entries).where(eq(entries.id, row.entryId)).for("update");
    const { newest, keep } = await uploadsWorthChecking(tx, row.entryId);
    const older = tx.select({ id: uploads.id }).from(uploads).where(and(eq(uploads.entryId, row.entryId), keep.length ? notInArray(uploads.id, keep) : sql`true`));
    await tx
      .update(checkRuns)
      .set({ state: "superseded", step: null, finishedAt: new Date() })
      .where(and(eq(checkRuns.state, "queued"), inArray(checkRuns.uploadId, older)));
    const checked = keep.includes(row.uploadId) ? row.uploadId : newest;
    if (!checked) return "superseded";
    const [target] = await tx
      .select({ run: checkRuns, ruleset: competitions.ruleset, repositoryUrl: uploads.repositoryUrl, repositoryCommit: uploads.repositoryCommit })
      .from(checkRuns)
      .innerJoin(uploads, eq(uploads.id, checkRuns.uploadId))
      .innerJoin(entries, eq(entries.id, uploads.entryId))
      .innerJoin(competitions, eq(competitions.id, entries.competitionId))
      .where(eq(checkRuns.uploadId, checked))
      .orderBy(desc(checkRuns.queuedAt))
      .limit(1)
      .for("update", { of: checkRuns });
    if (!target) return "superseded";
    const mine = target.run.id === checkRunId;
    // Another job's run: take it only while it waits (a running one has its own worker).
    const takeable = mine ? target.run.state === "queued" || target.run.state === "running" : target.run.state === "queued";
    if (!takeable) return mine ? "skipped" : "superseded";
    const [started] = await tx
      .update(checkRuns)
      .set({ state: "running", step: null, attempts: sql`${checkRuns.attempts} + 1`, startedAt: new Date(), error: null, verdict: null, figures: {} })
      .where(eq(checkRuns.id, target.run.id))
      .returning({ attempts: checkRuns.attempts });
    // What an earlier attempt wrote goes; this attempt writes everything again.
    await tx.delete(findings).where(eq(findings.checkRunId, target.run.id));
    await tx.delete(artifacts).where(eq(artifacts.checkRunId, target.run.id));
    const repository = target.repositoryUrl && target.repositoryCommit ? { url: target.repositoryUrl, commit: target.repositoryCommit } : null;
    return { runId: target.run.id, attempt: started.attempts, uploadId: checked, entryId: row.entryId, ruleset: target.ruleset, repository };
  });
}

/** Runs `write` only while this attempt still owns the run. */
function fenced<T>(c: Claimed, write: (tx: Tx) => Promise<T>): Promise<T> {
  return db().transaction(async (tx) => {
    const [now] = await tx.select({ attempts: checkRuns.attempts, state: checkRuns.state }).from(checkRuns).where(eq(checkRuns.id, c.runId)).for("update");
    if (!now || now.attempts !== c.attempt || now.state !== "running") throw new StaleAttempt();
    return write(tx);
  });
}

function findingRows(c: Claimed, list: Finding[], from: number) {
  return list.map((f, i) => ({
    checkRunId: c.runId,
    position: from + i,
    step: f.step,
    rule: f.rule,
    verdict: f.verdict,
    title: f.title,
    measured: f.measured == null ? null : String(f.measured),
    limitValue: f.limit == null ? null : String(f.limit),
    evidence: f.evidence ?? null,
    advice: f.advice ?? null,
  }));
}

/** Writes one step's results as they arrive, so the entry page shows them while later steps still run. */
function stepWriter(c: Claimed) {
  let position = 0;
  const skipped: StepReport["skipped"] = [];
  return async (report: StepReport): Promise<void> => {
    const stored: (typeof artifacts.$inferInsert)[] = [];
    for (const a of report.artifacts) {
      const key = `artifacts/${c.runId}/${a.kind}`;
      const put = await putObject(key, readFileSync(a.path), a.mediaType);
      stored.push({ checkRunId: c.runId, kind: a.kind, s3Key: key, mediaType: a.mediaType, sizeBytes: put.size, sha256: put.sha256 });
    }
    skipped.push(...report.skipped);
    const rows = findingRows(c, report.findings, position);
    position += rows.length;
    await fenced(c, async (tx) => {
      if (rows.length) await tx.insert(findings).values(rows);
      if (stored.length) await tx.insert(artifacts).values(stored);
      const figures = { ...report.figures, skipped };
      await tx.update(checkRuns).set({ figures: sql`${checkRuns.figures} || ${JSON.stringify(figures)}::jsonb` }).where(eq(checkRuns.id, c.runId));
    });
  };
}

async function enterStep(c: Claimed, step: CheckStep): Promise<void> {
  if (!(await uploadsWorthChecking(db(), c.entryId)).keep.includes(c.uploadId)) throw new Superseded();
  await fenced(c, (tx) => tx.update(checkRuns).set({ step }).where(eq(checkRuns.id, c.runId)));
}

/** Gatecrash failed this attempt: back in the queue while attempts are left, else an error (findings kept). */
async function failAttempt(c: Claimed, message: string): Promise<"retry" | "error"> {
  const last = c.attempt >= MAX_CHECK_ATTEMPTS;
  await fenced(c, (tx) =>
    tx
      .update(checkRuns)
      .set(
        last
          ? { state: "error", step: null, error: message.slice(0, 2000), finishedAt: new Date() }
          : { state: "queued", step: null, error: `attempt ${c.attempt} of ${MAX_CHECK_ATTEMPTS} failed (${message.slice(0, 1800)}); it is tried again` },
      )
      .where(eq(checkRuns.id, c.runId)),
  );
  if (last) return "error";
  await requeueCheckRun(c.runId);
  return "retry";
}

/**
 * The entry's other runs that still wait for uploads worth checking (a crew's pick whose job was folded into this
 * one by the queue's one-job-per-entry rule) get a job again once this attempt has ended.
 */
async function wakeWaitingRuns(entryId: string, exceptRunId: string): Promise<void> {
  const { keep } = await uploadsWorthChecking(db(), entryId);
  if (keep.length === 0) return;
  const waiting = await db()
    .select({ id: checkRuns.id })
    .from(checkRuns)
    .where(and(eq(checkRuns.state, "queued"), inArray(checkRuns.uploadId, keep), ne(checkRuns.id, exceptRunId)));
  for (const w of waiting) await resendCheckRun(w.id, entryId);
}

export async function executeCheckRun(checkRunId: string, opts: { simulate?: boolean } = {}): Promise<CheckRunOutcome> {
  const c = await claim(checkRunId);
  if (typeof c === "string") return c;
  try {
    return await executeClaimed(c, opts);
  } finally {
    await wakeWaitingRuns(c.entryId, c.runId);
  }
}

async function executeClaimed(c: Claimed, opts: { simulate?: boolean }): Promise<CheckRunOutcome> {
  const workDir = runWorkDir(c.runId, c.attempt);
  rmSync(workDir, { recursive: true, force: true });
  mkdirSync(join(workDir, "in"), { recursive: true });
  try {
    const inputs = await fetchUploadInputs(c.uploadId, join(workDir, "in"));
    const result = await runPipeline({
      ruleset: parseRuleset(c.ruleset),
      workDir: join(workDir, "work"),
      bundlePath: inputs.paths.bundle,
      repository: c.repository ? { ...c.repository, allowLoopback: env().REPOSITORY_FETCH_LOOPBACK === "allow" } : undefined,
      layoutPath: inputs.paths.layout,
      videoPath: inputs.paths.video,
      refused: inputs.refused,
      simulate: opts.simulate ?? true,
      onStep: (step) => enterStep(c, step),
      onReport: stepWriter(c),
    });
    if (result.internalErrors.length) {
      return await failAttempt(c, result.internalErrors.map((e) => `${e.step}: ${e.message}`).join("; "));
    }
    await fenced(c, (tx) =>
      tx.update(checkRuns).set({ state: "done", step: null, verdict: worstVerdict(result.findings), finishedAt: new Date() }).where(eq(checkRuns.id, c.runId)),
    );
    return "done";
  } catch (e) {
    if (e instanceof StaleAttempt) return "skipped";
    if (e instanceof Superseded) {
      await fenced(c, (tx) => tx.update(checkRuns).set({ state: "superseded", step: null, finishedAt: new Date() }).where(eq(checkRuns.id, c.runId))).catch((stale: unknown) => {
        if (!(stale instanceof StaleAttempt)) throw stale;
      });
      return "superseded";
    }
    // The store, the database or Gatecrash's own code failed outside any step: recorded, then tried again.
    // If even the record cannot be written, the error goes to pg-boss, which retries the job.
    return await failAttempt(c, e instanceof Error ? e.message : String(e));
  } finally {
    rmSync(workDir, { recursive: true, force: true });
  }
}

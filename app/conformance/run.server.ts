import { and, eq, sql } from "drizzle-orm";
import { mkdirSync, readFileSync, rmSync, createWriteStream } from "node:fs";
import { join, resolve } from "node:path";
import { pipeline } from "node:stream/promises";
import { db } from "~/db/client.server";
import { artifacts, checkRuns, competitions, entries, findings, uploadFiles, uploads } from "~/db/schema";
import { env } from "~/env.server";
import { getObjectStream, putObject } from "~/storage/s3.server";
import { parseRuleset } from "~/rules/ruleset";
import { runPipeline } from "./pipeline.server";

const EXT: Record<string, string> = { bundle: "archive", layout: "gds", video: "video", still: "img" };

/**
 * The worker's side of a check run: fetch the upload's files from S3 into a fresh folder, run the pipeline,
 * store findings, figures and artifacts. Safe to run again (a retry after a killed worker replaces what a
 * half-finished attempt wrote); a run that is already done is left alone, so it finishes exactly once.
 */
export async function executeCheckRun(checkRunId: string, opts: { simulate?: boolean } = {}): Promise<"done" | "skipped"> {
  const [row] = await db()
    .select({ run: checkRuns, uploadId: uploads.id, repositoryUrl: uploads.repositoryUrl, repositoryCommit: uploads.repositoryCommit, ruleset: competitions.ruleset })
    .from(checkRuns)
    .innerJoin(uploads, eq(uploads.id, checkRuns.uploadId))
    .innerJoin(entries, eq(entries.id, uploads.entryId))
    .innerJoin(competitions, eq(competitions.id, entries.competitionId))
    .where(eq(checkRuns.id, checkRunId));
  if (!row || row.run.state === "done") return "skipped";

  await db()
    .update(checkRuns)
    .set({ state: "running", step: "intake", attempts: sql`${checkRuns.attempts} + 1`, startedAt: new Date(), error: null })
    .where(eq(checkRuns.id, checkRunId));

  const workDir = resolve(env().WORKDIR, `run-${checkRunId}`);
  rmSync(workDir, { recursive: true, force: true });
  mkdirSync(join(workDir, "in"), { recursive: true });
  try {
    const files = await db().select().from(uploadFiles).where(and(eq(uploadFiles.uploadId, row.uploadId), eq(uploadFiles.state, "confirmed")));
    const local: Record<string, string> = {};
    for (const f of files) {
      const path = join(workDir, "in", `${f.kind}.${EXT[f.kind]}`);
      await pipeline(await getObjectStream(f.s3Key), createWriteStream(path));
      local[f.kind] = path;
    }
    const result = await runPipeline({
      ruleset: parseRuleset(row.ruleset),
      workDir: join(workDir, "work"),
      bundlePath: local.bundle,
      repository: row.repositoryUrl && row.repositoryCommit ? { url: row.repositoryUrl, commit: row.repositoryCommit, allowLoopback: env().REPOSITORY_FETCH_LOOPBACK === "allow" } : undefined,
      layoutPath: local.layout,
      videoPath: local.video,
      simulate: opts.simulate ?? true,
      onStep: async (step) => {
        await db().update(checkRuns).set({ step }).where(eq(checkRuns.id, checkRunId));
      },
    });
    const stored: (typeof artifacts.$inferInsert)[] = [];
    for (const a of result.artifacts) {
      const key = `artifacts/${checkRunId}/${a.kind}`;
      const put = await putObject(key, readFileSync(a.path), a.mediaType);
      stored.push({ checkRunId, kind: a.kind, s3Key: key, mediaType: a.mediaType, sizeBytes: put.size, sha256: put.sha256 });
    }
    const outcome = await db().transaction(async (tx) => {
      // A second attempt (a re-delivered job while a stalled one still ran) waits here and then finds the run done.
      const [locked] = await tx.select({ state: checkRuns.state }).from(checkRuns).where(eq(checkRuns.id, checkRunId)).for("update");
      if (!locked || locked.state === "done") return "skipped" as const;
      await tx.delete(findings).where(eq(findings.checkRunId, checkRunId));
      await tx.delete(artifacts).where(eq(artifacts.checkRunId, checkRunId));
      if (result.findings.length)
        await tx.insert(findings).values(
          result.findings.map((f, i) => ({
            checkRunId,
            position: i,
            step: f.step,
            rule: f.rule,
            verdict: f.verdict,
            title: f.title,
            measured: f.measured == null ? null : String(f.measured),
            limitValue: f.limit == null ? null : String(f.limit),
            evidence: f.evidence ?? null,
            advice: f.advice ?? null,
          })),
        );
      if (stored.length) await tx.insert(artifacts).values(stored);
      await tx
        .update(checkRuns)
        .set({ state: "done", step: null, verdict: result.verdict, figures: { ...result.figures, skipped: result.skipped }, finishedAt: new Date() })
        .where(eq(checkRuns.id, checkRunId));
      return "done" as const;
    });
    rmSync(workDir, { recursive: true, force: true });
    return outcome;
  } catch (e) {
    const message = e instanceof Error ? e.message : String(e);
    await db().update(checkRuns).set({ state: "error", error: message.slice(0, 2000), finishedAt: new Date() }).where(eq(checkRuns.id, checkRunId));
    throw e;
  }
}

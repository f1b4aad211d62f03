import { asc, desc, eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { artifacts, checkRuns, findings, uploads } from "~/db/schema";
import { countingUploadOf } from "~/entries/counting.server";
import { queuePlaceOf } from "./queue.server";
import type { EntryCheck } from "./report-types";

export type { EntryCheck } from "./report-types";

/**
 * The latest check run of an entry's counting upload (the crew's pick, else the newest on-time one), with its findings and
 * artifacts. Artifacts are served through /artifacts/:id, which checks who may see them.
 */
export async function countingUpload(entryId: string): Promise<{ id: string; number: number } | null> {
  // the crew's final pick, else the newest counting upload (app/entries/counting.server.ts)
  return countingUploadOf(entryId);
}

export async function checkOfUpload(uploadId: string, uploadNumber: number): Promise<EntryCheck> {
  const [run] = await db()
    .select({ run: checkRuns, entryId: uploads.entryId })
    .from(checkRuns)
    .innerJoin(uploads, eq(uploads.id, checkRuns.uploadId))
    .where(eq(checkRuns.uploadId, uploadId))
    .orderBy(desc(checkRuns.queuedAt))
    .limit(1)
    .then((rows) => rows.map((r) => ({ ...r.run, entryId: r.entryId })));
  if (!run) return { uploadId, uploadNumber, run: null, findings: [], artifacts: {} };
  const place = run.state === "queued" ? await queuePlaceOf(run.entryId) : null;
  const fs = await db().select().from(findings).where(eq(findings.checkRunId, run.id)).orderBy(asc(findings.position));
  const as = await db().select().from(artifacts).where(eq(artifacts.checkRunId, run.id));
  return {
    uploadId,
    uploadNumber,
    run: {
      id: run.id,
      state: run.state,
      step: run.step,
      verdict: run.verdict,
      figures: run.figures as Record<string, unknown>,
      error: run.error,
      queuedAt: run.queuedAt.toISOString(),
      finishedAt: run.finishedAt?.toISOString() ?? null,
      queue: place && { place: place.place, running: place.active },
    },
    findings: fs.map((f) => ({ step: f.step, rule: f.rule, verdict: f.verdict, title: f.title, measured: f.measured, limit: f.limitValue, evidence: f.evidence, advice: f.advice })),
    artifacts: Object.fromEntries(as.map((a) => [a.kind, { id: a.id, url: `/artifacts/${a.id}`, mediaType: a.mediaType, sizeBytes: a.sizeBytes }])),
  };
}

export async function latestCheckFor(entryId: string): Promise<EntryCheck | null> {
  const u = await countingUpload(entryId);
  return u ? checkOfUpload(u.id, u.number) : null;
}

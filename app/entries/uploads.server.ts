import { and, eq, gt, inArray, lt, sql } from "drizzle-orm";
import { db } from "~/db/client.server";
import { checkRuns, competitions, entries, uploadFiles, uploads } from "~/db/schema";
import { queueCheckRun } from "~/conformance/queue.server";
import { env } from "~/env.server";
import { AppError } from "~/errors/app-error";
import { checkCommit, checkRepositoryLink } from "~/sources/repository-link";
import { cutoffOf, EXCEPTION_STATES, timelinessOf, uploadWindowOpen } from "./deadline";
import { checkLicence } from "./licence";
import { abortFile, abortFilesOf, newFileRow, planOf, plannedFileValues, type ClaimedFile } from "./multipart.server";
import { sizeProblem } from "./parts";
import { sendUploadReceipt } from "./receipt.server";
import { rulesetOf } from "./service.server";
import type { PlannedFile } from "./shapes";
import { FILE_KINDS, KIND_LABELS, REQUIRED_KINDS, type FileKind } from "./sniff";
import { abortMultipart } from "./storage.server";
import { entryForUploader, uploadForUploader } from "./upload-access.server";

/**
 * Uploads straight from the browser to S3 with presigned multipart parts. The server plans the parts, signs them,
 * lists what is stored (to resume), confirms each object from S3 itself (stored size, sniffed type, streamed
 * SHA-256), and then records the upload with the next number under a lock on the entry row.
 *
 * Pending and abandoned rows are not uploads: they carry a negative placeholder number (the column is required and
 * unique per entry); real uploads are numbered 1, 2, 3 … when they are completed, complete or late.
 *
 * This module is the upload's state machine (pending → complete | late, or abandoned); who may upload is
 * ./upload-access.server.ts, the files in the store ./multipart.server.ts, the receipt ./receipt.server.ts.
 * Refusals are AppErrors.
 */
const refuse = (status: number, code: string, message: string, fieldErrors?: Record<string, string[]>) => new AppError(status, code, message, fieldErrors ? { fieldErrors } : {});

function uploadsOpen(c: typeof competitions.$inferSelect, e: typeof entries.$inferSelect, now: Date): AppError | null {
  if (e.state !== "active") return refuse(409, "entry_not_active", `This entry is ${e.state}; it takes no uploads.`);
  const when = timelinessOf(now, c.deadlineAt, c.graceMinutes, e.lateUntil);
  const stateOpen = c.state === "open" || (when === "exception" && EXCEPTION_STATES.includes(c.state));
  if (!stateOpen) return refuse(409, "competition_not_open", "This competition does not take uploads now.");
  const cutoff = cutoffOf(c.deadlineAt, c.graceMinutes);
  if (cutoff && !uploadWindowOpen(c.state, e.state, when)) return refuse(409, "deadline_passed", `The deadline passed at ${cutoff.toISOString()} (server time, UTC). Uploads are closed.`);
  return null;
}

/** What an upload brings besides files: a repository link and commit instead of a bundle, and a licence. */
export interface UploadSource {
  repository?: { url: string; commit: string } | null;
  licence?: string | null;
}

/** Checks the repository link, commit and licence against the ruleset; the values to store, or field errors. */
export function sourceProblems(source: UploadSource, ruleset: ReturnType<typeof rulesetOf>, files: ClaimedFile[]) {
  const problems: Record<string, string[]> = {};
  const values: { repositoryUrl: string | null; repositoryCommit: string | null; licence: string | null } = { repositoryUrl: null, repositoryCommit: null, licence: null };
  if (source.repository) {
    if (!ruleset.repository.allowed) (problems.repository ??= []).push("This compo takes source bundles only, not repository links.");
    const link = checkRepositoryLink(source.repository.url, { allowLoopback: env().REPOSITORY_FETCH_LOOPBACK === "allow" });
    if (!link.ok) (problems.repository ??= []).push(link.message);
    else values.repositoryUrl = link.url;
    const commit = checkCommit(source.repository.commit);
    if (!commit.ok) (problems.commit ??= []).push(commit.message);
    else values.repositoryCommit = commit.commit;
    if (files.some((f) => f.kind === "bundle")) (problems.bundle ??= []).push("Send either a source bundle or a repository link, not both.");
  }
  const licence = checkLicence(source.licence, ruleset.licence);
  if (!licence.ok) (problems.licence ??= []).push(licence.message);
  else values.licence = licence.licence;
  return { problems, values };
}

/** Checks the claimed files against the ruleset before a byte is sent. */
export function claimProblems(files: ClaimedFile[], ruleset: ReturnType<typeof rulesetOf>, required: readonly FileKind[]): Record<string, string[]> {
  const problems: Record<string, string[]> = {};
  const kinds = files.map((f) => f.kind);
  for (const k of FILE_KINDS) if (kinds.filter((x) => x === k).length > 1) (problems[k] ??= []).push(`Only one file for "${KIND_LABELS[k]}".`);
  for (const k of required) if (!kinds.includes(k)) (problems[k] ??= []).push(`${KIND_LABELS[k]} is required.`);
  for (const f of files) {
    const p = sizeProblem(f.kind, f.filename, f.size, ruleset, "claimed");
    if (p) (problems[f.kind] ??= []).push(p);
  }
  return problems;
}

/**
 * Starts an upload. An unfinished upload of the same entry is discarded (its stored parts are aborted), but
 * only once the store has accepted every file of the new one: with the store down, the old upload stays
 * as it was and can still be resumed.
 */
export async function startUpload(entryId: string, userId: string, files: ClaimedFile[], now = new Date(), source: UploadSource = {}): Promise<{ uploadId: string; files: PlannedFile[] }> {
  const row = await entryForUploader(entryId, userId);
  if (!row) throw refuse(404, "not_found", "That entry was not found.");
  const closed = uploadsOpen(row.competition, row.entry, now);
  if (closed) throw closed;
  const ruleset = rulesetOf(row.competition.ruleset);
  const fromSource = sourceProblems(source, ruleset, files);
  const problems = { ...claimProblems(files, ruleset, requiredKinds(Boolean(source.repository))), ...fromSource.problems };
  if (Object.keys(problems).length) throw refuse(400, "files_refused", "Some files cannot be uploaded.", problems);

  const uploadId = crypto.randomUUID();
  const values: Awaited<ReturnType<typeof plannedFileValues>>[] = [];
  try {
    for (const f of files) values.push(await plannedFileValues(uploadId, entryId, f));
  } catch (err) {
    // the store failed part-way: give back what it did accept, then report the failure as it came
    await Promise.allSettled(values.map((v) => abortMultipart(v.s3Key, v.multipartUploadId)));
    throw err;
  }
  const { rows, stale } = await db().transaction(async (tx) => {
    await tx.select({ id: entries.id }).from(entries).where(eq(entries.id, entryId)).for("update");
    const stale = await tx.select({ id: uploads.id }).from(uploads).where(and(eq(uploads.entryId, entryId), eq(uploads.state, "pending")));
    if (stale.length) await tx.update(uploads).set({ state: "abandoned" }).where(inArray(uploads.id, stale.map((s) => s.id)));
    const [{ low }] = await tx.select({ low: sql<number>`coalesce(min(${uploads.number}), 0)::int` }).from(uploads).where(eq(uploads.entryId, entryId));
    await tx.insert(uploads).values({ id: uploadId, entryId, number: Math.min(0, low) - 1, state: "pending", submittedBy: userId, ...fromSource.values });
    const rows = await tx.insert(uploadFiles).values(values).returning();
    return { rows, stale };
  });
  await abortFilesOf(stale.map((s) => s.id));
  return { uploadId, files: rows.map(planOf) };
}

/** Adds a file to a pending upload, or replaces one that was refused or is still unfinished. */
export async function putFile(uploadId: string, userId: string, f: ClaimedFile, now = new Date()): Promise<{ file: PlannedFile }> {
  const up = await uploadForUploader(uploadId, userId);
  if (!up) throw refuse(404, "not_found", "That upload was not found.");
  if (up.upload.state !== "pending") throw refuse(409, "upload_closed", "This upload is finished; start a new one.");
  const closed = uploadsOpen(up.competition, up.entry, now);
  if (closed) throw closed;
  const problems = claimProblems([f], rulesetOf(up.competition.ruleset), []);
  if (f.kind === "bundle" && up.upload.repositoryUrl) problems.bundle = ["This upload takes its sources from the repository link; it has no bundle file."];
  if (Object.keys(problems).length) throw refuse(400, "files_refused", "This file cannot be uploaded.", problems);
  const [old] = await db().select().from(uploadFiles).where(and(eq(uploadFiles.uploadId, uploadId), eq(uploadFiles.kind, f.kind)));
  if (old) {
    await abortFile(old);
    await db().delete(uploadFiles).where(eq(uploadFiles.id, old.id));
  }
  return { file: planOf(await newFileRow(uploadId, up.entry.id, f)) };
}

export interface RecordedUpload {
  uploadId: string;
  number: number;
  state: "complete" | "late";
  completedAt: string;
  message: string;
}

/**
 * Records the upload: all files confirmed, bundle and layout present. Under a lock on the entry row it takes the
 * next number and decides — on the server clock, now — whether it is on time (complete, counts, gets a check run)
 * or late (kept, never judged). Completing twice answers the same result. Refusals throw AppError.
 */
export async function completeUpload(uploadId: string, userId: string, now = new Date()): Promise<{ upload: RecordedUpload; already: boolean }> {
  const up = await uploadForUploader(uploadId, userId);
  if (!up) throw refuse(404, "not_found", "That upload was not found.");
  const result = await db().transaction(async (tx) => {
    await tx.select({ id: entries.id }).from(entries).where(eq(entries.id, up.entry.id)).for("update");
    const [u] = await tx.select().from(uploads).where(eq(uploads.id, uploadId)).for("update");
    if (u.state === "complete" || u.state === "late") return { u, already: true };
    if (u.state === "abandoned") throw refuse(409, "upload_discarded", "This upload was discarded because a newer one was started.");
    const files = await tx.select().from(uploadFiles).where(eq(uploadFiles.uploadId, uploadId));
    const unfinished = files.filter((f) => f.state !== "confirmed");
    if (unfinished.length) throw refuse(409, "files_unfinished", `Not every file is confirmed yet: ${unfinished.map((f) => `"${f.filename}" (${f.state})`).join(", ")}.`);
    const missing = requiredKinds(Boolean(u.repositoryUrl)).filter((k) => !files.some((f) => f.kind === k));
    if (missing.length) throw refuse(409, "files_missing", `Missing: ${missing.map((k) => KIND_LABELS[k]).join(", ")}.`);
    const [c] = await tx.select().from(competitions).where(eq(competitions.id, up.competition.id));
    const [e] = await tx.select().from(entries).where(eq(entries.id, up.entry.id));
    const when = timelinessOf(now, c.deadlineAt, c.graceMinutes, e.lateUntil);
    const late = !uploadWindowOpen(c.state, e.state, when);
    const [{ high }] = await tx.select({ high: sql<number>`coalesce(max(${uploads.number}), 0)::int` }).from(uploads).where(and(eq(uploads.entryId, up.entry.id), gt(uploads.number, 0)));
    const [done] = await tx
      .update(uploads)
      .set({ state: late ? "late" : "complete", number: high + 1, completedAt: now, lateException: !late && when === "exception" })
      .where(eq(uploads.id, uploadId))
      .returning();
    // A new upload that counts replaces the crew's earlier pick: the newest counts again until they pick anew.
    if (!late) await tx.update(entries).set({ finalUploadId: null }).where(eq(entries.id, up.entry.id));
    return { u: done, already: false };
  });
  const { u } = result;
  const state = u.state as "complete" | "late";
  if (state === "complete") {
    const [run] = await db().select({ id: checkRuns.id }).from(checkRuns).where(eq(checkRuns.uploadId, u.id)).limit(1);
    if (!run) await queueCheckRun(u.id);
  }
  await sendUploadReceipt(u.id);
  const message =
    state === "complete"
      ? `Upload #${u.number} is recorded and counts${u.lateException ? " (under the organizer's late exception)" : ""}. Its check run is queued.`
      : `Upload #${u.number} arrived after the deadline. It is kept as late and does not count; the last on-time upload stays in the compo.`;
  return { already: result.already, upload: { uploadId: u.id, number: u.number, state, completedAt: (u.completedAt ?? now).toISOString(), message } };
}

/** Bundle and layout, or layout alone when the sources come from a repository link. */
function requiredKinds(fromRepository: boolean): readonly FileKind[] {
  return fromRepository ? REQUIRED_KINDS.filter((k) => k !== "bundle") : REQUIRED_KINDS;
}

/** The entrant discards an unfinished upload: its stored parts are aborted and it is marked abandoned. */
export async function abandonUpload(uploadId: string): Promise<boolean> {
  const res = await db().update(uploads).set({ state: "abandoned" }).where(and(eq(uploads.id, uploadId), eq(uploads.state, "pending"))).returning({ id: uploads.id });
  await abortFilesOf(res.map((r) => r.id));
  return res.length > 0;
}

/** Pending uploads nobody touched for `maxAgeMs` are abandoned (the worker runs this on a schedule). */
export async function sweepStaleUploads(maxAgeMs = 24 * 3600_000, now = new Date()): Promise<number> {
  const res = await db()
    .update(uploads)
    .set({ state: "abandoned" })
    .where(and(eq(uploads.state, "pending"), lt(uploads.createdAt, new Date(now.getTime() - maxAgeMs))))
    .returning({ id: uploads.id });
  await abortFilesOf(res.map((r) => r.id));
  return res.length;
}


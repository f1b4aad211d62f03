import { and, asc, eq, gt, inArray, lt, sql } from "drizzle-orm";
import { db } from "~/db/client.server";
import { checkRuns, competitions, crewMembers, crews, entries, events, uploadFiles, uploads, user } from "~/db/schema";
import { abortMultipart, completeMultipart, deleteObjectIfAny, hashObject, listStoredParts, presignPart, startMultipart } from "./storage.server";
import { queueCheckRun } from "~/conformance/queue.server";
import { enqueueMail } from "~/mail/outbox.server";
import { composeMail } from "~/mail/templates";
import { env } from "~/env.server";
import { cutoffOf, EXCEPTION_STATES, timelinessOf, uploadWindowOpen } from "./deadline";
import { checkLicence } from "./licence";
import { checkCommit, checkRepositoryLink } from "~/sources/repository-link";
import { formatBytes, partPlan, safeFilename, sizeProblem } from "./parts";
import type { PlannedFile } from "./shapes";
import { checkKind, FILE_KINDS, KIND_LABELS, REQUIRED_KINDS, type FileKind } from "./sniff";
import { rulesetOf } from "./service.server";
import { isId } from "~/security/ids";
import { gzipLayoutProblem } from "./layout-gzip.server";
import { AppError } from "~/errors/app-error";

/**
 * Uploads straight from the browser to S3 with presigned multipart parts. The server plans the parts, signs them,
 * lists what is stored (to resume), confirms each object from S3 itself (stored size, sniffed type, streamed
 * SHA-256), and then records the upload with the next number under a lock on the entry row.
 *
 * Pending and abandoned rows are not uploads: they carry a negative placeholder number (the column is required and
 * unique per entry); real uploads are numbered 1, 2, 3 … when they are completed, complete or late.
 */
const refuse = (status: number, code: string, message: string, fieldErrors?: Record<string, string[]>) => new AppError(status, code, message, fieldErrors ? { fieldErrors } : {});

export interface ClaimedFile {
  kind: FileKind;
  filename: string;
  size: number;
}


/** An entry the user may upload to (crew member), with its competition; null → 404. */
export async function entryForUploader(entryId: string, userId: string) {
  const [row] = await db()
    .select({ entry: entries, competition: competitions })
    .from(entries)
    .innerJoin(competitions, eq(competitions.id, entries.competitionId))
    .innerJoin(crewMembers, and(eq(crewMembers.crewId, entries.crewId), eq(crewMembers.userId, userId)))
    .where(eq(entries.id, entryId));
  return row ?? null;
}

/** A pending/recorded upload of an entry the user is a crew member of; null → 404. */
export async function uploadForUploader(uploadId: string, userId: string) {
  if (!isId(uploadId)) return null;
  const [row] = await db()
    .select({ upload: uploads, entry: entries, competition: competitions })
    .from(uploads)
    .innerJoin(entries, eq(entries.id, uploads.entryId))
    .innerJoin(competitions, eq(competitions.id, entries.competitionId))
    .innerJoin(crewMembers, and(eq(crewMembers.crewId, entries.crewId), eq(crewMembers.userId, userId)))
    .where(eq(uploads.id, uploadId));
  return row ?? null;
}

export async function fileForUploader(uploadId: string, fileId: string, userId: string) {
  const up = await uploadForUploader(uploadId, userId);
  if (!up || !isId(fileId)) return null;
  const [file] = await db().select().from(uploadFiles).where(and(eq(uploadFiles.id, fileId), eq(uploadFiles.uploadId, uploadId)));
  return file ? { ...up, file } : null;
}

function planOf(f: typeof uploadFiles.$inferSelect): PlannedFile {
  return { id: f.id, kind: f.kind, filename: f.filename, size: f.claimedBytes, ...partPlan(f.claimedBytes), state: f.state };
}

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

/** Starts the file's multipart upload in the store; the row is written by the caller. */
async function plannedFileValues(uploadId: string, entryId: string, f: ClaimedFile) {
  const name = safeFilename(f.filename);
  const key = `uploads/${entryId}/${uploadId}/${f.kind}/${crypto.randomUUID()}-${name}`;
  const multipartUploadId = await startMultipart(key, "application/octet-stream");
  return { uploadId, kind: f.kind, s3Key: key, filename: f.filename.slice(0, 200), claimedBytes: f.size, multipartUploadId, state: "uploading" as const };
}

async function newFileRow(uploadId: string, entryId: string, f: ClaimedFile) {
  const [row] = await db().insert(uploadFiles).values(await plannedFileValues(uploadId, entryId, f)).returning();
  return row;
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

export async function pendingUploadFiles(uploadId: string): Promise<PlannedFile[]> {
  const rows = await db().select().from(uploadFiles).where(eq(uploadFiles.uploadId, uploadId)).orderBy(asc(uploadFiles.createdAt));
  return rows.map(planOf);
}

type FileRow = typeof uploadFiles.$inferSelect;

/** Presigned PUT URLs for the given part numbers of a file still uploading. */
export async function signParts(file: FileRow, partNumbers: number[]): Promise<{ urls: Record<number, string> }> {
  if (file.state !== "uploading" || !file.multipartUploadId) throw refuse(409, "file_closed", "This file is no longer uploading.");
  const { partCount } = partPlan(file.claimedBytes);
  const bad = partNumbers.filter((n) => !Number.isInteger(n) || n < 1 || n > partCount);
  if (bad.length) throw refuse(400, "bad_part", `Parts must be numbered 1 to ${partCount}.`);
  const urls: Record<number, string> = {};
  for (const n of partNumbers) urls[n] = await presignPart(file.s3Key, file.multipartUploadId, n);
  return { urls };
}

/**
 * What S3 already holds of a file: the browser sends only the rest (resume after a broken connection or a reload).
 * From S3's ListParts where the store has it; otherwise the parts browsers reported after each stored PUT (the
 * confirmation then checks the assembled object's size and hash, so a wrong report cannot slip through).
 */
export async function storedParts(file: FileRow): Promise<{ partNumber: number; size: number; etag: string }[]> {
  if (file.state !== "uploading" || !file.multipartUploadId) return [];
  const listed = await listStoredParts(file.s3Key, file.multipartUploadId);
  return (listed ?? file.parts).map(({ partNumber, size, etag }) => ({ partNumber, size, etag })).sort((a, b) => a.partNumber - b.partNumber);
}

/** The browser reports a part S3 accepted (its ETag from the PUT response). Reporting a part again replaces it. */
export async function recordPart(file: FileRow, part: { partNumber: number; etag: string; size: number }): Promise<{ recorded: number }> {
  if (file.state !== "uploading" || !file.multipartUploadId) throw refuse(409, "file_closed", "This file is no longer uploading.");
  const { partCount } = partPlan(file.claimedBytes);
  if (part.partNumber < 1 || part.partNumber > partCount) throw refuse(400, "bad_part", `Parts must be numbered 1 to ${partCount}.`);
  // Sizes are not trusted here: the confirmation measures the assembled object in S3.
  const entry = JSON.stringify([part]);
  const [row] = await db()
    .update(uploadFiles)
    .set({
      // One atomic update: drop an older report of the same part, append this one.
      parts: sql`(select coalesce(jsonb_agg(p), '[]'::jsonb) from jsonb_array_elements(${uploadFiles.parts}) p where (p->>'partNumber')::int <> ${part.partNumber}) || ${entry}::jsonb`,
    })
    .where(and(eq(uploadFiles.id, file.id), eq(uploadFiles.state, "uploading")))
    .returning({ parts: uploadFiles.parts });
  if (!row) throw refuse(409, "file_closed", "This file is no longer uploading.");
  return { recorded: row.parts.length };
}

export interface ConfirmedFile {
  id: string;
  kind: FileKind;
  filename: string;
  sizeBytes: number;
  sha256: string;
  mediaType: string;
}

/**
 * Finishes one file: assembles its parts (all must be stored), then confirms the object from S3 itself — stored size
 * against the ruleset, media type sniffed from the bytes, SHA-256 by streaming. A refused file's object is deleted.
 */
export async function confirmFile(file: FileRow, ruleset: ReturnType<typeof rulesetOf>): Promise<{ file: ConfirmedFile }> {
  const done = (f: FileRow): ConfirmedFile => ({ id: f.id, kind: f.kind, filename: f.filename, sizeBytes: f.sizeBytes ?? 0, sha256: f.sha256 ?? "", mediaType: f.mediaType ?? "" });
  if (file.state === "confirmed") return { file: done(file) };
  if (file.state === "rejected") throw refuse(422, "file_refused", file.rejectReason ?? "This file was refused.");
  if (!file.multipartUploadId) throw refuse(409, "file_closed", "This file has no upload in progress.");
  const { partCount } = partPlan(file.claimedBytes);
  const parts = await storedParts(file);
  const missing = Array.from({ length: partCount }, (_, i) => i + 1).filter((n) => !parts.some((p) => p.partNumber === n));
  if (missing.length) throw refuse(409, "parts_missing", `Parts ${missing.join(", ")} of "${file.filename}" are not stored yet; send them and confirm again.`);
  await completeMultipart(file.s3Key, file.multipartUploadId, parts.filter((p) => p.partNumber <= partCount));
  const stored = await hashObject(file.s3Key);
  const problem = sizeProblem(file.kind, file.filename, stored.size, ruleset, "stored") ?? (() => {
    const k = checkKind(file.kind, file.filename, stored.head);
    if (!k.ok) return k.message;
    return file.kind === "layout" && k.mediaType === "application/gzip" ? gzipLayoutProblem(file.filename, stored.head) : null;
  })();
  if (problem) {
    await deleteObjectIfAny(file.s3Key);
    await db().update(uploadFiles).set({ state: "rejected", rejectReason: problem, sizeBytes: stored.size, multipartUploadId: null }).where(eq(uploadFiles.id, file.id));
    throw refuse(422, "file_refused", problem);
  }
  const mediaType = (checkKind(file.kind, file.filename, stored.head) as { mediaType: string }).mediaType;
  const [row] = await db()
    .update(uploadFiles)
    .set({ state: "confirmed", sizeBytes: stored.size, sha256: stored.sha256, mediaType, confirmedAt: new Date(), multipartUploadId: null })
    .where(and(eq(uploadFiles.id, file.id), eq(uploadFiles.state, "uploading")))
    .returning();
  if (!row) {
    // A second confirmation raced this one and won; report what it recorded.
    const [now] = await db().select().from(uploadFiles).where(eq(uploadFiles.id, file.id));
    if (now.state !== "confirmed") throw refuse(422, "file_refused", now.rejectReason ?? "This file was refused.");
    return { file: done(now) };
  }
  return { file: done(row) };
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

/** The receipt to every crew member: every file's name, size and SHA-256, and the server time. Once per upload and person. */
export async function sendUploadReceipt(uploadId: string): Promise<void> {
  const [row] = await db()
    .select({ upload: uploads, entry: entries, competition: competitions, event: events, crew: crews })
    .from(uploads)
    .innerJoin(entries, eq(entries.id, uploads.entryId))
    .innerJoin(competitions, eq(competitions.id, entries.competitionId))
    .innerJoin(events, eq(events.id, competitions.eventId))
    .innerJoin(crews, eq(crews.id, entries.crewId))
    .where(eq(uploads.id, uploadId));
  const files = await db().select().from(uploadFiles).where(eq(uploadFiles.uploadId, uploadId));
  const members = await db().select({ id: user.id, email: user.email }).from(crewMembers).innerJoin(user, eq(user.id, crewMembers.userId)).where(eq(crewMembers.crewId, row.entry.crewId));
  const at = row.upload.completedAt ?? new Date();
  const local = new Intl.DateTimeFormat("en-GB", { dateStyle: "full", timeStyle: "long", timeZone: row.event.timeZone }).format(at);
  const late = row.upload.state === "late";
  const lines = receiptLines(row.upload, files);
  for (const m of members) {
    await enqueueMail(
      composeMail(
        m.email,
        late ? `Late upload #${row.upload.number} for ${row.entry.title} (does not count)` : `Upload receipt: ${row.entry.title}, upload #${row.upload.number}`,
        [
          `Gatecrash recorded upload #${row.upload.number} of "${row.entry.title}" by ${row.crew.name} in ${row.competition.title} (${row.event.title}).`,
          `Server time: ${at.toISOString()} (UTC) — ${local} (${row.event.timeZone}).`,
          late
            ? "It arrived after the deadline, so it is kept as late and is not judged. Your last on-time upload stays in the compo."
            : row.upload.lateException
              ? `It arrived after the deadline, within the late exception the organizer granted this entry (${row.entry.lateReason ?? "no reason given"}), so it counts. The jury sees the exception. Its check run is queued.`
              : "It is the upload that counts now. Its check run is queued; the entry page shows the result.",
          lines.join("\n\n"),
          { text: "Open the entry", href: `${env().APP_URL}/entries/${row.entry.id}` },
          row.upload.repositoryCommit
            ? "Keep this mail: the commit hash and the SHA-256 sums prove what you submitted and when."
            : "Keep this mail: the SHA-256 sums prove which files you submitted and when.",
        ],
        `upload-receipt:${uploadId}:${m.id}`,
      ),
    );
  }
}

/** Bundle and layout, or layout alone when the sources come from a repository link. */
function requiredKinds(fromRepository: boolean): readonly FileKind[] {
  return fromRepository ? REQUIRED_KINDS.filter((k) => k !== "bundle") : REQUIRED_KINDS;
}

/** What the receipt lists: the repository and commit (when the sources come from one), the licence, every file. */
function receiptLines(u: typeof uploads.$inferSelect, files: FileRow[]): string[] {
  const lines: string[] = [];
  if (u.repositoryUrl && u.repositoryCommit) {
    lines.push(`Sources from a repository (fetched by the check run at exactly this commit)\n  ${u.repositoryUrl}\n  commit ${u.repositoryCommit}`);
  }
  if (u.licence) lines.push(`Licence\n  ${u.licence}`);
  for (const f of FILE_KINDS.flatMap((k) => files.filter((x) => x.kind === k))) {
    lines.push(`${KIND_LABELS[f.kind]}\n  ${f.filename}\n  ${f.sizeBytes} bytes (${formatBytes(f.sizeBytes ?? 0)})\n  SHA-256 ${f.sha256}`);
  }
  return lines;
}

async function abortFile(f: FileRow): Promise<void> {
  if (f.multipartUploadId) await abortMultipart(f.s3Key, f.multipartUploadId);
}

async function abortFilesOf(uploadIds: string[]): Promise<void> {
  if (uploadIds.length === 0) return;
  const files = await db().select().from(uploadFiles).where(inArray(uploadFiles.uploadId, uploadIds));
  for (const f of files) {
    await abortFile(f);
    if (f.state === "confirmed") await deleteObjectIfAny(f.s3Key);
  }
  await db().update(uploadFiles).set({ multipartUploadId: null }).where(inArray(uploadFiles.uploadId, uploadIds));
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

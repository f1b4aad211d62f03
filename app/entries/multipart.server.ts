import { and, asc, eq, inArray, sql } from "drizzle-orm";
import { db } from "~/db/client.server";
import { uploadFiles } from "~/db/schema";
import { AppError } from "~/errors/app-error";
import { gzipLayoutProblem } from "./layout-gzip.server";
import { partPlan, safeFilename, sizeProblem } from "./parts";
import type { rulesetOf } from "./service.server";
import type { PlannedFile } from "./shapes";
import { checkKind, type FileKind } from "./sniff";
import { abortMultipart, completeMultipart, deleteObjectIfAny, hashObject, listStoredParts, presignPart, startMultipart } from "./storage.server";

/**
 * One uploaded file in the object store: the multipart upload the browser PUTs its parts into (planned, signed,
 * listed to resume, recorded), then the confirmation of the assembled object from S3 itself (stored size, sniffed
 * type, streamed SHA-256), and aborting what is no longer wanted. Refusals are AppErrors.
 */
const refuse = (status: number, code: string, message: string, fieldErrors?: Record<string, string[]>) => new AppError(status, code, message, fieldErrors ? { fieldErrors } : {});

/** A file as the browser claims it before a byte is sent. */
export interface ClaimedFile {
  kind: FileKind;
  filename: string;
  size: number;
}

export type FileRow = typeof uploadFiles.$inferSelect;

export function planOf(f: typeof uploadFiles.$inferSelect): PlannedFile {
  return { id: f.id, kind: f.kind, filename: f.filename, size: f.claimedBytes, ...partPlan(f.claimedBytes), state: f.state };
}

/** Starts the file's multipart upload in the store; the row is written by the caller. */
export async function plannedFileValues(uploadId: string, entryId: string, f: ClaimedFile) {
  const name = safeFilename(f.filename);
  const key = `uploads/${entryId}/${uploadId}/${f.kind}/${crypto.randomUUID()}-${name}`;
  const multipartUploadId = await startMultipart(key, "application/octet-stream");
  return { uploadId, kind: f.kind, s3Key: key, filename: f.filename.slice(0, 200), claimedBytes: f.size, multipartUploadId, state: "uploading" as const };
}

export async function newFileRow(uploadId: string, entryId: string, f: ClaimedFile) {
  const [row] = await db().insert(uploadFiles).values(await plannedFileValues(uploadId, entryId, f)).returning();
  return row;
}

export async function pendingUploadFiles(uploadId: string): Promise<PlannedFile[]> {
  const rows = await db().select().from(uploadFiles).where(eq(uploadFiles.uploadId, uploadId)).orderBy(asc(uploadFiles.createdAt));
  return rows.map(planOf);
}

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

export async function abortFile(f: FileRow): Promise<void> {
  if (f.multipartUploadId) await abortMultipart(f.s3Key, f.multipartUploadId);
}

export async function abortFilesOf(uploadIds: string[]): Promise<void> {
  if (uploadIds.length === 0) return;
  const files = await db().select().from(uploadFiles).where(inArray(uploadFiles.uploadId, uploadIds));
  for (const f of files) {
    await abortFile(f);
    if (f.state === "confirmed") await deleteObjectIfAny(f.s3Key);
  }
  await db().update(uploadFiles).set({ multipartUploadId: null }).where(inArray(uploadFiles.uploadId, uploadIds));
}

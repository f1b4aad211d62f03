import { DeleteObjectCommand } from "@aws-sdk/client-s3";
import { env } from "~/env.server";
import * as base from "~/storage/s3.server";

/**
 * The S3 calls uploads need, over the shared wrapper (~/storage/s3.server). Aborting or deleting what is already
 * gone is not an error here: a repeated discard or a racing sweep must not fail.
 */
export const { completeMultipart, hashObject, presignPart, startMultipart } = base;

const gone = (e: unknown) => {
  const name = (e as { name?: string }).name;
  const status = (e as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode;
  return name === "NoSuchUpload" || name === "NoSuchKey" || name === "NotFound" || status === 404;
};

/** The store does not implement the operation (the local S3 fake has no ListParts or AbortMultipartUpload). */
const unsupported = (e: unknown) => {
  const name = (e as { name?: string }).name;
  return name === "MethodNotAllowed" || name === "NotImplemented";
};

/** Parts S3 holds for a multipart upload, or null when the store cannot list them (the caller uses what browsers reported). */
export async function listStoredParts(key: string, uploadId: string): Promise<{ partNumber: number; etag: string; size: number }[] | null> {
  try {
    return await base.listParts(key, uploadId);
  } catch (e) {
    if (unsupported(e)) return null;
    throw e;
  }
}

export async function abortMultipart(key: string, uploadId: string): Promise<void> {
  try {
    await base.abortMultipart(key, uploadId);
  } catch (e) {
    // A store that cannot abort keeps the parts until its own cleanup; the upload row is abandoned either way.
    if (!gone(e) && !unsupported(e)) throw e;
  }
}

export async function deleteObjectIfAny(key: string): Promise<void> {
  try {
    await base.s3().send(new DeleteObjectCommand({ Bucket: env().S3_BUCKET, Key: key }));
  } catch (e) {
    if (!gone(e)) throw e;
  }
}

import {
  AbortMultipartUploadCommand,
  CompleteMultipartUploadCommand,
  CreateMultipartUploadCommand,
  GetObjectCommand,
  HeadObjectCommand,
  ListPartsCommand,
  PutObjectCommand,
  S3Client,
  UploadPartCommand,
} from "@aws-sdk/client-s3";
import { getSignedUrl } from "@aws-sdk/s3-request-presigner";
import { createHash } from "node:crypto";
import type { Readable } from "node:stream";
import { env } from "~/env.server";

/**
 * The one door to object storage (S3 API; the local fake in development and tests).
 * Checksum settings keep streamed PUTs free of aws-chunked framing on the fake (STACK.md).
 */
let client: S3Client | undefined;
export function s3(): S3Client {
  const e = env();
  client ??= new S3Client({
    endpoint: e.S3_ENDPOINT,
    region: e.S3_REGION,
    forcePathStyle: true,
    credentials: { accessKeyId: e.S3_ACCESS_KEY_ID, secretAccessKey: e.S3_SECRET_ACCESS_KEY },
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
  });
  return client;
}

const bucket = () => env().S3_BUCKET;

export async function putObject(key: string, body: Buffer | Uint8Array | string, contentType: string): Promise<{ sha256: string; size: number }> {
  const bytes = typeof body === "string" ? Buffer.from(body) : Buffer.from(body);
  await s3().send(new PutObjectCommand({ Bucket: bucket(), Key: key, Body: bytes, ContentType: contentType }));
  return { sha256: createHash("sha256").update(bytes).digest("hex"), size: bytes.length };
}

export async function headObject(key: string): Promise<{ size: number; contentType?: string } | null> {
  try {
    const h = await s3().send(new HeadObjectCommand({ Bucket: bucket(), Key: key }));
    return { size: Number(h.ContentLength ?? 0), contentType: h.ContentType };
  } catch (e) {
    if ((e as { name?: string }).name === "NotFound" || (e as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode === 404) return null;
    throw e;
  }
}

export async function getObjectStream(key: string, range?: string): Promise<Readable> {
  const res = await s3().send(new GetObjectCommand({ Bucket: bucket(), Key: key, Range: range }));
  return res.Body as Readable;
}

/** SHA-256 and size computed by streaming the stored object (never trusting what the browser said). */
export async function hashObject(key: string): Promise<{ sha256: string; size: number; head: Buffer }> {
  const h = createHash("sha256");
  let size = 0;
  const head: Buffer[] = [];
  let headLen = 0;
  for await (const c of await getObjectStream(key)) {
    const b = Buffer.from(c as Uint8Array);
    h.update(b);
    size += b.length;
    if (headLen < 4096) {
      head.push(b.subarray(0, 4096 - headLen));
      headLen += Math.min(b.length, 4096 - headLen);
    }
  }
  return { sha256: h.digest("hex"), size, head: Buffer.concat(head) };
}

export function presignGet(key: string, filename?: string, expiresIn = 600): Promise<string> {
  return getSignedUrl(
    s3(),
    new GetObjectCommand({ Bucket: bucket(), Key: key, ResponseContentDisposition: filename ? `attachment; filename="${filename.replace(/"/g, "")}"` : undefined }),
    { expiresIn },
  );
}

export async function startMultipart(key: string, contentType: string): Promise<string> {
  const res = await s3().send(new CreateMultipartUploadCommand({ Bucket: bucket(), Key: key, ContentType: contentType }));
  if (!res.UploadId) throw new Error("the object store did not return an upload id");
  return res.UploadId;
}

export function presignPart(key: string, uploadId: string, partNumber: number, expiresIn = 3600): Promise<string> {
  return getSignedUrl(s3(), new UploadPartCommand({ Bucket: bucket(), Key: key, UploadId: uploadId, PartNumber: partNumber }), { expiresIn });
}

/** Parts already stored: lets a browser resume after a broken connection. */
export async function listParts(key: string, uploadId: string): Promise<{ partNumber: number; etag: string; size: number }[]> {
  const res = await s3().send(new ListPartsCommand({ Bucket: bucket(), Key: key, UploadId: uploadId }));
  return (res.Parts ?? []).map((p) => ({ partNumber: p.PartNumber ?? 0, etag: p.ETag ?? "", size: Number(p.Size ?? 0) }));
}

export async function completeMultipart(key: string, uploadId: string, parts: { partNumber: number; etag: string }[]): Promise<void> {
  await s3().send(
    new CompleteMultipartUploadCommand({
      Bucket: bucket(),
      Key: key,
      UploadId: uploadId,
      MultipartUpload: { Parts: [...parts].sort((a, b) => a.partNumber - b.partNumber).map((p) => ({ PartNumber: p.partNumber, ETag: p.etag })) },
    }),
  );
}

export async function abortMultipart(key: string, uploadId: string): Promise<void> {
  await s3().send(new AbortMultipartUploadCommand({ Bucket: bucket(), Key: key, UploadId: uploadId }));
}

import { expect } from "vitest";
import * as startApi from "~/routes/api.entries.$entryId.uploads";
import * as uploadApi from "~/routes/api.uploads.$uploadId";
import * as fileApi from "~/routes/api.uploads.$uploadId.files.$fileId";
import { request } from "../support/users";
import { callApi, type makeEntrySetup } from "./entries-support";

/** The upload API as the browser drives it: start, send parts through presigned URLs, confirm, complete. */
export interface Planned {
  id: string;
  kind: string;
  partSize: number;
  partCount: number;
}

export async function start(s: Awaited<ReturnType<typeof makeEntrySetup>>, files: { kind: string; filename: string; size: number }[], extra: Record<string, unknown> = {}) {
  return callApi<{ uploadId: string; files: Planned[]; error?: { code: string; message: string; fieldErrors?: Record<string, string[]> } }>(
    startApi.action,
    request(`/api/entries/${s.entry.id}/uploads`, { cookie: s.cookie, json: { files, ...extra } }),
    { entryId: s.entry.id },
  );
}

/** Sends parts through presigned URLs exactly as the browser does (plain PUTs to S3). */
export async function sendParts(cookie: string, uploadId: string, f: Planned, bytes: Buffer, only?: number[]) {
  const numbers = only ?? Array.from({ length: f.partCount }, (_, i) => i + 1);
  const signed = await callApi<{ urls: Record<string, string> }>(
    fileApi.action,
    request(`/api/uploads/${uploadId}/files/${f.id}`, { cookie, json: { action: "sign", partNumbers: numbers } }),
    { uploadId, fileId: f.id },
  );
  expect(signed.status).toBe(200);
  for (const n of numbers) {
    const body = bytes.subarray((n - 1) * f.partSize, n * f.partSize);
    const res = await fetch(signed.body.urls[n], { method: "PUT", body: new Uint8Array(body) });
    expect(res.status).toBe(200);
    const noted = await callApi(fileApi.action, request("/x", { cookie, json: { action: "part", partNumber: n, etag: res.headers.get("etag"), size: body.length } }), { uploadId, fileId: f.id });
    expect(noted.status).toBe(200);
  }
}

export async function confirm(cookie: string, uploadId: string, f: Planned) {
  return callApi<{ file: { sha256: string; sizeBytes: number; mediaType: string }; error: { code: string; message: string } }>(
    fileApi.action,
    request(`/api/uploads/${uploadId}/files/${f.id}`, { cookie, json: { action: "confirm" } }),
    { uploadId, fileId: f.id },
  );
}

export async function complete(cookie: string, uploadId: string) {
  return callApi<{ number: number; state: string; message: string; already?: boolean; error: { code: string; message: string } }>(
    uploadApi.action,
    request(`/api/uploads/${uploadId}`, { cookie, json: { action: "complete" } }),
    { uploadId },
  );
}


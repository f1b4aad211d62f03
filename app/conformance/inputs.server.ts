import { and, eq, inArray } from "drizzle-orm";
import { createHash } from "node:crypto";
import { createWriteStream } from "node:fs";
import { join } from "node:path";
import { Transform } from "node:stream";
import { pipeline } from "node:stream/promises";
import { db } from "~/db/client.server";
import { uploadFiles } from "~/db/schema";
import type { Finding } from "~/rules/findings";
import { getObjectStream } from "~/storage/s3.server";
import type { InputFile } from "./pipeline.server";

const LOCAL_NAME: Record<InputFile, string> = { bundle: "bundle.archive", layout: "layout.gds", video: "capture.video" };
const STEP_OF = { bundle: "intake", layout: "layout", video: "capture" } as const;
const USED: InputFile[] = ["bundle", "layout", "video"];

export interface UploadInputs {
  paths: Partial<Record<InputFile, string>>;
  /** Files whose stored bytes no longer match the receipt: never handed to a step. */
  refused: Partial<Record<InputFile, Finding>>;
}

/**
 * Copies an upload's files from the store into `dir`, hashing while they stream, and holds each SHA-256 against
 * the one the upload receipt gave the crew. A file that differs is not used: its step reports the mismatch.
 */
export async function fetchUploadInputs(uploadId: string, dir: string): Promise<UploadInputs> {
  const files = await db()
    .select()
    .from(uploadFiles)
    .where(and(eq(uploadFiles.uploadId, uploadId), eq(uploadFiles.state, "confirmed"), inArray(uploadFiles.kind, USED)));
  const out: UploadInputs = { paths: {}, refused: {} };
  for (const f of files) {
    const kind = f.kind as InputFile;
    const path = join(dir, LOCAL_NAME[kind]);
    const hash = createHash("sha256");
    let size = 0;
    const tap = new Transform({
      transform(chunk: Buffer, _enc, done) {
        hash.update(chunk);
        size += chunk.length;
        done(null, chunk);
      },
    });
    await pipeline(await getObjectStream(f.s3Key), tap, createWriteStream(path));
    const stored = hash.digest("hex");
    if (f.sha256 && stored === f.sha256) {
      out.paths[kind] = path;
      continue;
    }
    console.error(`[worker] upload ${uploadId}: ${kind} object ${f.s3Key} has SHA-256 ${stored}, the receipt says ${f.sha256 ?? "nothing"}`);
    out.refused[kind] = {
      step: STEP_OF[kind],
      rule: `${STEP_OF[kind]}.receipt`,
      verdict: "fail",
      title: `The stored ${f.filename} is not the file on the upload receipt`,
      measured: `SHA-256 ${stored} (${size} bytes)`,
      limit: `SHA-256 ${f.sha256 ?? "missing"} (${f.sizeBytes ?? "?"} bytes)`,
      evidence: `The receipt recorded SHA-256 ${f.sha256 ?? "(none)"}; the object read back from storage has ${stored}. Gatecrash did not check this file.`,
      advice: "Upload the file again. If it happens again, tell the organizers: the stored copy changed after it was confirmed.",
    };
  }
  return out;
}

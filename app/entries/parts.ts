import type { Ruleset } from "~/rules/ruleset";
import type { FileKind } from "./sniff";

/**
 * How a file is cut into multipart parts. S3 wants every part but the last to be at least 5 MiB and allows at most
 * 10,000 parts (AWS S3 multipart upload limits); we use 5 MiB parts and grow them only for very large files.
 */
export const MIN_PART_BYTES = 5 * 1024 * 1024;
export const MAX_PARTS = 10_000;

export function partPlan(size: number): { partSize: number; partCount: number } {
  if (!Number.isSafeInteger(size) || size < 0) throw new Error(`not a file size: ${size}`);
  let partSize = MIN_PART_BYTES;
  while (Math.ceil(size / partSize) > MAX_PARTS) partSize *= 2;
  return { partSize, partCount: Math.max(1, Math.ceil(size / partSize)) };
}

export function limitFor(kind: FileKind, ruleset: Ruleset): number {
  const l = ruleset.uploadLimits;
  return { bundle: l.bundleBytes, layout: l.layoutBytes, video: l.videoBytes, still: l.stillBytes }[kind];
}

export function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  if (n < 1024 * 1024) return `${(n / 1024).toFixed(1)} KiB`;
  if (n < 1024 * 1024 * 1024) return `${(n / 1024 / 1024).toFixed(1)} MiB`;
  return `${(n / 1024 / 1024 / 1024).toFixed(2)} GiB`;
}

/** A size check with the message the entrant sees; `what` says whether it was the claimed or the stored size. */
export function sizeProblem(kind: FileKind, filename: string, size: number, ruleset: Ruleset, what: "claimed" | "stored"): string | null {
  if (size <= 0) return `"${filename}" is empty.`;
  const limit = limitFor(kind, ruleset);
  if (size <= limit) return null;
  return `"${filename}" is ${formatBytes(size)}${what === "stored" ? " as stored" : ""}; this compo allows at most ${formatBytes(limit)} for this file.`;
}

/** A file name safe inside an object key and a mail: no folders, no control characters. */
export function safeFilename(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? "file";
  const cleaned = base.replace(/[^A-Za-z0-9._-]+/g, "_").replace(/^\.+/, "").slice(0, 120);
  return cleaned || "file";
}

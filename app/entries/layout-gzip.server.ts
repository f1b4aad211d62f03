import { constants, gunzipSync } from "node:zlib";
import { sniff } from "./sniff";

/**
 * A layout sent as .gds.gz must hold a GDSII stream: the first bytes of the stored object are inflated (only as
 * far as they go; the full inflated size is held to the layout limit when the check run reads it).
 */
export function gzipLayoutProblem(filename: string, head: Uint8Array): string | null {
  let inflated: Buffer;
  try {
    // Z_SYNC_FLUSH gives what the truncated head inflates to instead of failing at its cut-off end.
    inflated = gunzipSync(head, { finishFlush: constants.Z_SYNC_FLUSH, maxOutputLength: 64 * 1024 });
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code ?? "";
    if (!code.startsWith("Z_") && code !== "ERR_BUFFER_TOO_LARGE") throw e;
    if (code === "ERR_BUFFER_TOO_LARGE") return null; // inflates a lot from a few bytes: the reader's limit decides
    return `"${filename}" looks gzip-compressed but does not inflate (${(e as Error).message}). Compress the .gds with gzip and upload it again.`;
  }
  if (inflated.length < 4) return null; // too little inflated from the head to tell; the check run reads it all
  return sniff(inflated) === "application/vnd.gdsii" ? null : `"${filename}" is a gzip file, but what it holds is not a GDSII stream. Upload the .gds, or the .gds compressed with gzip.`;
}

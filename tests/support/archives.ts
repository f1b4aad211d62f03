import { zipBuffer } from "../../app/storage/zip.server";

/** A .zip of the given files, made in memory, for tests that need a source bundle. */
export function zipOf(files: Record<string, Buffer | string>): Promise<Buffer> {
  return zipBuffer(files);
}

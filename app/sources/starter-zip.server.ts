import { zipBuffer } from "~/storage/zip.server";
import type { StarterFile } from "./starter";

/** The starter files as one .zip in a folder (the bundle format most crews know), dated so it hashes the same. */
export function starterZip(folder: string, files: StarterFile[]): Promise<Buffer> {
  return zipBuffer(Object.fromEntries(files.map((f) => [`${folder}/${f.path}`, f.body])), new Date("2027-01-01T00:00:00Z"));
}

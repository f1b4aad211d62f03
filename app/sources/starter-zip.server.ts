import yazl from "yazl";
import type { StarterFile } from "./starter";

/** The starter files as one .zip (the bundle format most crews know), with a fixed date so it hashes the same. */
export function starterZip(folder: string, files: StarterFile[]): Promise<Buffer> {
  const zip = new yazl.ZipFile();
  for (const f of files) zip.addBuffer(Buffer.from(f.body, "utf8"), `${folder}/${f.path}`, { mtime: new Date("2027-01-01T00:00:00Z") });
  zip.end();
  const chunks: Buffer[] = [];
  return new Promise((resolve, reject) => {
    zip.outputStream.on("data", (c: Buffer) => chunks.push(c));
    zip.outputStream.on("end", () => resolve(Buffer.concat(chunks)));
    zip.outputStream.on("error", reject);
  });
}

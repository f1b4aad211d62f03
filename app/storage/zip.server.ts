import yazl from "yazl";

/** A .zip made in memory (yazl): source bundles for tests and demo data, the starter bundle. A fixed date hashes alike. */
export function zipBuffer(files: Record<string, Buffer | string>, mtime?: Date): Promise<Buffer> {
  const zip = new yazl.ZipFile();
  for (const [name, body] of Object.entries(files)) zip.addBuffer(Buffer.from(body), name, mtime ? { mtime } : {});
  zip.end();
  const chunks: Buffer[] = [];
  return new Promise((resolve, reject) => {
    zip.outputStream.on("data", (c: Buffer) => chunks.push(c));
    zip.outputStream.on("end", () => resolve(Buffer.concat(chunks)));
    zip.outputStream.on("error", reject);
  });
}

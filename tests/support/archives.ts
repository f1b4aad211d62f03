import yazl from "yazl";

/** A .zip of the given files, made in memory (yazl), for tests that need a source bundle. */
export function zipOf(files: Record<string, Buffer | string>): Promise<Buffer> {
  const z = new yazl.ZipFile();
  for (const [name, body] of Object.entries(files)) z.addBuffer(Buffer.from(body), name);
  z.end();
  const chunks: Buffer[] = [];
  return new Promise((resolve, reject) => {
    z.outputStream.on("data", (c: Buffer) => chunks.push(c));
    z.outputStream.on("end", () => resolve(Buffer.concat(chunks)));
    z.outputStream.on("error", reject);
  });
}

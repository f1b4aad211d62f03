import { createHash } from "node:crypto";
import { createReadStream } from "node:fs";
import { mkdir, open, readFile, readdir, rm, stat } from "node:fs/promises";
import { dirname, join, relative, resolve, sep } from "node:path";
import { Transform, type TransformCallback } from "node:stream";
import { pipeline } from "node:stream/promises";
import { createGunzip } from "node:zlib";
import tarStream from "tar-stream";
import yauzl from "yauzl";
import { BundleError } from "./bundle-error";
import { PathRegistry, folderDepth, safeMemberPath } from "./bundle-paths";
import { countSourceLines, isVerilogPath } from "./verilog-lexer";

export { BundleError } from "./bundle-error";

/** The ruleset's `uploadLimits` fit this shape directly. */
export interface BundleLimits {
  bundleUnpackedBytes: number;
  bundleFiles: number;
  bundleDepth: number;
  bundleCompressionRatio: number;
  /** Size of the archive itself, when the caller wants it checked here too. */
  bundleBytes?: number;
}

export interface BundleFile {
  path: string;
  bytes: number;
  sha256: string;
}

export interface BundleManifest {
  format: "zip" | "tar.gz";
  files: BundleFile[];
  verilogFiles: string[];
  sourceLines: number;
  totalBytes: number;
}

/**
 * Below this many inflated bytes the ratio is not judged: a small archive of repetitive text can
 * compress 200:1 without being a bomb (common practice, no source).
 */
const RATIO_FLOOR_BYTES = 1024 * 1024;
const TAR_BLOCK = 512;

export async function sha256File(path: string): Promise<string> {
  const hash = createHash("sha256");
  for await (const chunk of createReadStream(path)) hash.update(chunk as Buffer);
  return hash.digest("hex");
}

/**
 * Unpacks a .zip or .tar.gz (told apart by magic bytes) into destDir, which must not exist yet or
 * be empty. Every limit is counted on bytes actually inflated and enforced as soon as it is passed.
 * On any error destDir is removed and a BundleError (or an I/O error) is thrown.
 */
export async function extractBundle(archivePath: string, destDir: string, limits: BundleLimits): Promise<BundleManifest> {
  await prepareDestination(destDir);
  try {
    const archiveBytes = (await stat(archivePath)).size;
    if (limits.bundleBytes !== undefined && archiveBytes > limits.bundleBytes) {
      throw new BundleError("too-large", `The archive is ${archiveBytes} bytes; the limit is ${limits.bundleBytes} bytes.`);
    }
    const format = await detectFormat(archivePath);
    const budget = new Budget(limits, archiveBytes);
    const files = format === "zip" ? await extractZip(archivePath, destDir, budget) : await extractTarGz(archivePath, destDir, budget);
    files.sort((a, b) => (a.path < b.path ? -1 : a.path > b.path ? 1 : 0));
    const verilogFiles = files.filter((f) => isVerilogPath(f.path)).map((f) => f.path);
    let sourceLines = 0;
    for (const path of verilogFiles) sourceLines += countSourceLines(await readFile(join(destDir, path), "latin1"));
    return { format, files, verilogFiles, sourceLines, totalBytes: budget.fileBytes };
  } catch (error) {
    await rm(destDir, { recursive: true, force: true });
    throw error;
  }
}

async function prepareDestination(destDir: string): Promise<void> {
  await mkdir(destDir, { recursive: true });
  if ((await readdir(destDir)).length > 0) throw new Error(`extractBundle: destination ${destDir} is not empty`);
}

async function detectFormat(archivePath: string): Promise<"zip" | "tar.gz"> {
  const fh = await open(archivePath, "r");
  const head = Buffer.alloc(512);
  let length: number;
  try {
    ({ bytesRead: length } = await fh.read(head, 0, head.length, 0));
  } finally {
    await fh.close();
  }
  // ZIP local file header or end-of-central-directory (an empty zip): APPNOTE.TXT 4.3.7 / 4.3.16.
  if (length >= 4 && head[0] === 0x50 && head[1] === 0x4b && ((head[2] === 3 && head[3] === 4) || (head[2] === 5 && head[3] === 6))) return "zip";
  // gzip member header ID1 ID2: RFC 1952 section 2.3.1.
  if (length >= 2 && head[0] === 0x1f && head[1] === 0x8b) return "tar.gz";
  if (length >= 262 && head.subarray(257, 262).toString("latin1") === "ustar") {
    throw new BundleError("not-an-archive", "This is an uncompressed tar; upload it as .tar.gz (gzip-compressed) or .zip.");
  }
  throw new BundleError("not-an-archive", "This file is neither a .zip nor a .tar.gz archive.");
}

/** Counts what the archive costs and refuses it the moment a limit is passed. */
class Budget {
  entries = 0;
  fileBytes = 0;
  inflatedBytes = 0;
  readonly paths = new PathRegistry();

  constructor(
    readonly limits: BundleLimits,
    private readonly archiveBytes: number,
  ) {}

  admit(rawName: string, kind: "file" | "folder"): string {
    const path = safeMemberPath(rawName);
    this.entries++;
    if (this.entries > this.limits.bundleFiles) {
      throw new BundleError("too-many-files", `The bundle holds more than ${this.limits.bundleFiles} files and folders.`);
    }
    const depth = kind === "file" ? folderDepth(path) : folderDepth(path) + 1;
    if (depth > this.limits.bundleDepth) {
      throw new BundleError("too-deep", `"${path}" is nested ${depth} folders deep; the limit is ${this.limits.bundleDepth}.`, path);
    }
    if (kind === "file") this.paths.addFile(path);
    else this.paths.addFolder(path);
    return path;
  }

  addFileBytes(n: number, path: string): void {
    this.fileBytes += n;
    if (this.fileBytes > this.limits.bundleUnpackedBytes) {
      throw new BundleError("too-large", `Unpacked, the bundle is larger than ${this.limits.bundleUnpackedBytes} bytes.`, path);
    }
  }

  addInflated(n: number): void {
    this.inflatedBytes += n;
    const ratio = this.inflatedBytes / Math.max(1, this.archiveBytes);
    if (this.inflatedBytes > RATIO_FLOOR_BYTES && ratio > this.limits.bundleCompressionRatio) {
      throw new BundleError(
        "zip-bomb",
        `The archive inflates more than ${this.limits.bundleCompressionRatio} times its own size; that is a decompression bomb, not source code.`,
      );
    }
  }

  /** Tar headers and padding cost at most this much beyond the file bytes themselves. */
  tarInflatedCap(): number {
    return this.limits.bundleUnpackedBytes + (this.limits.bundleFiles + 4) * 4 * TAR_BLOCK + RATIO_FLOOR_BYTES;
  }
}

async function writeMember(destDir: string, path: string, data: AsyncIterable<Buffer>, budget: Budget, countsInflated: boolean): Promise<BundleFile> {
  const target = resolve(destDir, path);
  if (relative(resolve(destDir), target).split(sep).includes("..")) {
    throw new BundleError("path-traversal", `"${path}" would land outside the bundle.`, path);
  }
  await mkdir(dirname(target), { recursive: true });
  const hash = createHash("sha256");
  let bytes = 0;
  // "wx": never follow or overwrite anything already there.
  const fh = await open(target, "wx", 0o644);
  try {
    for await (const chunk of data) {
      bytes += chunk.length;
      budget.addFileBytes(chunk.length, path);
      if (countsInflated) budget.addInflated(chunk.length);
      hash.update(chunk);
      await fh.write(chunk);
    }
  } finally {
    await fh.close();
  }
  return { path, bytes, sha256: hash.digest("hex") };
}

// Unix file type bits in a mode (POSIX <sys/stat.h>).
const S_IFMT = 0o170000;
const S_IFDIR = 0o040000;
const S_IFREG = 0o100000;
const S_IFLNK = 0o120000;

async function extractZip(archivePath: string, destDir: string, budget: Budget): Promise<BundleFile[]> {
  const zip = await asCorrupt(() => yauzl.openPromise(archivePath, { lazyEntries: true, decodeStrings: false, validateEntrySizes: true, autoClose: true }));
  const files: BundleFile[] = [];
  try {
    for await (const entry of asCorruptIterable(zip.eachEntry())) {
      // With decodeStrings off, yauzl hands over the raw name bytes and skips its own name checks.
      const rawName = yauzl.getFileNameLowLevel(entry.generalPurposeBitFlag, entry.fileName as unknown as Buffer, entry.extraFields, false);
      const fileType = (entry.externalFileAttributes >>> 16) & S_IFMT;
      if (fileType === S_IFLNK) throw new BundleError("link", `"${rawName}" is a symbolic link; bundles may hold only plain files.`, rawName);
      if (fileType !== 0 && fileType !== S_IFDIR && fileType !== S_IFREG) {
        throw new BundleError("device", `"${rawName}" is a device, pipe or socket; bundles may hold only plain files.`, rawName);
      }
      if (rawName.endsWith("/") || rawName.endsWith("\\") || fileType === S_IFDIR) {
        budget.admit(rawName, "folder");
        continue;
      }
      const path = budget.admit(rawName, "file");
      if (entry.isEncrypted()) throw new BundleError("corrupt", `"${path}" is encrypted; upload an unencrypted archive.`, path);
      if (!entry.canDecodeFileData()) throw new BundleError("corrupt", `"${path}" uses a compression method Gatecrash cannot read; use deflate.`, path);
      const data = await asCorrupt(() => zip.openReadStreamPromise(entry));
      files.push(await asCorrupt(() => writeMember(destDir, path, data, budget, true)));
    }
  } finally {
    zip.close();
  }
  return files;
}

async function extractTarGz(archivePath: string, destDir: string, budget: Budget): Promise<BundleFile[]> {
  const cap = budget.tarInflatedCap();
  const refused: { error: BundleError | null } = { error: null };
  const meter = new Transform({
    transform(chunk: Buffer, _encoding, done: TransformCallback) {
      try {
        budget.addInflated(chunk.length);
        if (budget.inflatedBytes > cap) {
          throw new BundleError("too-large", `Unpacked, the bundle is larger than ${budget.limits.bundleUnpackedBytes} bytes.`);
        }
      } catch (error) {
        refused.error = error as BundleError; // addInflated only throws BundleError
        done(refused.error);
        return;
      }
      done(null, chunk);
    },
  });
  const extract = tarStream.extract();
  const feed = pipeline(createReadStream(archivePath), createGunzip(), meter, extract).then(
    () => null,
    (error: unknown) => error,
  );
  const files: BundleFile[] = [];
  try {
    for await (const entry of extract) {
      const header = entry.header;
      const name = header.name;
      switch (header.type) {
        case "file":
        case "contiguous-file": {
          const path = budget.admit(name, "file");
          // tar-stream's entry is a streamx Readable: async-iterable over Buffers.
          files.push(await writeMember(destDir, path, entry as unknown as AsyncIterable<Buffer>, budget, false));
          break;
        }
        case "directory":
          budget.admit(name, "folder");
          entry.resume();
          break;
        case "symlink":
        case "link":
          throw new BundleError("link", `"${name}" is a ${header.type === "link" ? "hard" : "symbolic"} link; bundles may hold only plain files.`, name);
        case "character-device":
        case "block-device":
        case "fifo":
          throw new BundleError("device", `"${name}" is a ${header.type}; bundles may hold only plain files.`, name);
        default:
          throw new BundleError("corrupt", `"${name}" is a tar member of type ${header.type ?? "unknown"}, which a source bundle does not need.`, name);
      }
    }
  } catch (error) {
    extract.destroy();
    await feed;
    if (error instanceof BundleError) throw error;
    if (refused.error) throw refused.error;
    throw corruptFrom(error);
  }
  const feedError = await feed;
  if (refused.error) throw refused.error;
  if (feedError) throw corruptFrom(feedError);
  return files;
}

/** A parser's error (yauzl, zlib, tar-stream) becomes "corrupt"; our own refusals and I/O errors pass. */
function corruptFrom(error: unknown): Error {
  if (error instanceof BundleError) return error;
  if (error instanceof Error && "syscall" in error) return error;
  const detail = error instanceof Error ? error.message : String(error);
  return new BundleError("corrupt", `The archive is damaged or truncated (${detail}).`);
}

async function asCorrupt<T>(run: () => Promise<T>): Promise<T> {
  try {
    return await run();
  } catch (error) {
    throw corruptFrom(error);
  }
}

async function* asCorruptIterable<T>(source: AsyncIterableIterator<T>): AsyncGenerator<T> {
  while (true) {
    const step = await asCorrupt(() => source.next());
    if (step.done) return;
    yield step.value;
  }
}

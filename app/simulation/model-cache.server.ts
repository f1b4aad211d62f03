import { chmodSync, copyFileSync, existsSync, lstatSync, mkdirSync, readdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from "node:fs";
import { createHash } from "node:crypto";
import { cpus, tmpdir } from "node:os";
import { join } from "node:path";
import { toolchainStamp } from "./runtime-cache.server";

/**
 * Compiled models, keyed by a hash of everything the C++ compiler reads that differs between builds: every
 * source and makefile verilator generated, the harness, the edge-mode header, the flags, the toolchain and the
 * processor. Uploading the same design again (a new layout, a fixed capture video) skips the C++ build.
 *
 * Why an entrant's binary may be reused: the key is taken on the host right after verilator ran, and the binary
 * is stored right after the compiler made it, before the model ever runs. The same key means byte-identical
 * generated sources, so the compiler would make the same model again. The profile-guided build alone runs the
 * model before its final compile; what it can feed that compile is its own profile, which the same design would
 * write the same way. Entries live in a folder of Gatecrash's own; a sandboxed process never sees it.
 */
export const MODEL_CACHE_DIR = join(tmpdir(), "gatecrash-model-cache");
const KEEP_ENTRIES = 300;
const MAX_SOURCE_BYTES = 64 * 1024 * 1024;
const MAX_BINARY_BYTES = 256 * 1024 * 1024;

export interface CachedModel {
  binary: string;
  /** how long the build that made it took */
  buildMs: number;
}

/** Regular files only, size-capped: the folder was written by a sandboxed process. */
function readPlain(path: string): Buffer | null {
  const st = lstatSync(path, { throwIfNoEntry: false });
  return st?.isFile() && st.size <= MAX_SOURCE_BYTES ? readFileSync(path) : null;
}

export function modelKey(objDir: string, inputs: { name: string; bytes: Buffer | string }[], flavour: string): string {
  const h = createHash("sha256");
  const part = (name: string, bytes: Buffer | string) => h.update(`${name}\0${Buffer.byteLength(bytes)}\0`).update(bytes);
  part("flavour", `${flavour} ${cpus()[0]?.model ?? "unknown"} ${toolchainStamp()}`);
  // .d and .dat files hold paths and timestamps, not compiler input
  for (const name of readdirSync(objDir).filter((n) => /\.(cpp|h|mk)$/.test(n)).sort()) {
    const bytes = readPlain(join(objDir, name));
    if (bytes === null) throw new Error(`generated file ${name} is not a plain file of reasonable size`);
    part(`obj/${name}`, bytes);
  }
  for (const i of inputs) part(i.name, i.bytes);
  return h.digest("hex");
}

export function cachedModel(key: string, root = MODEL_CACHE_DIR): CachedModel | null {
  const dir = join(root, key);
  if (!existsSync(join(dir, "Vtop"))) return null;
  const meta = JSON.parse(readFileSync(join(dir, "meta.json"), "utf8")) as { buildMs: number };
  return { binary: join(dir, "Vtop"), buildMs: meta.buildMs };
}

/** Copies a cached model into a build's obj folder, as the build itself would have left it. */
export function placeModel(model: CachedModel, target: string): void {
  rmSync(target, { force: true });
  copyFileSync(model.binary, target);
  chmodSync(target, 0o755);
}

export function storeModel(key: string, binary: string, buildMs: number, root = MODEL_CACHE_DIR): void {
  const st = lstatSync(binary, { throwIfNoEntry: false });
  if (!st?.isFile() || st.size > MAX_BINARY_BYTES) return;
  const staging = join(root, `.tmp-${key}-${process.pid}`);
  const dir = join(root, key);
  try {
    mkdirSync(root, { recursive: true, mode: 0o700 });
    rmSync(staging, { recursive: true, force: true });
    mkdirSync(staging);
    copyFileSync(binary, join(staging, "Vtop"));
    writeFileSync(join(staging, "meta.json"), JSON.stringify({ buildMs }));
    renameSync(staging, dir);
  } catch (e) {
    // Two workers on one machine stored the same model (the first one's stays), or the cache was emptied
    // meanwhile (the checks bench does that): either way this build is unaffected, only not kept.
    if (!["ENOTEMPTY", "EEXIST", "ENOENT"].includes((e as NodeJS.ErrnoException).code ?? "")) throw e;
    rmSync(staging, { recursive: true, force: true });
    return;
  }
  prune(root);
}

/** Keeps the most recently stored entries. */
function prune(root: string): void {
  const entries = readdirSync(root).filter((n) => !n.startsWith("."));
  if (entries.length <= KEEP_ENTRIES) return;
  const aged = entries.map((n) => ({ n, t: statSync(join(root, n), { throwIfNoEntry: false })?.mtimeMs ?? 0 })).sort((a, b) => a.t - b.t);
  for (const { n } of aged.slice(0, entries.length - KEEP_ENTRIES)) rmSync(join(root, n), { recursive: true, force: true });
}

/** Empties the cache (the checks bench measures cold builds this way). */
export function clearModelCache(): void {
  rmSync(MODEL_CACHE_DIR, { recursive: true, force: true });
}

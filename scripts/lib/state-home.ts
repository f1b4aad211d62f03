import { spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { chmodSync, existsSync, mkdirSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import { asPostgres } from "./postgres";

/**
 * The folder closest to the root, among the folders above `dir`, that the `postgres` user cannot enter; null when
 * it can reach `dir`'s parent (or when we are not root, so the server runs as ourselves). A project cloned into a
 * 0700 folder (root's home on Debian, a `mktemp -d`) is out of the server's reach, and out of the sandbox's.
 */
export function blockedAncestor(dir: string): string | null {
  if (process.getuid?.() !== 0) return null;
  const chain: string[] = [];
  for (let d = dirname(resolve(dir)); ; d = dirname(d)) {
    chain.unshift(d);
    if (d === dirname(d)) break;
  }
  for (const d of chain) {
    if (!existsSync(d)) return null;
    const [cmd, ...args] = asPostgres("/usr/bin/test", ["-x", d]);
    if (spawnSync(cmd, args).status !== 0) return d;
  }
  return null;
}

/**
 * Where the state other users must reach (PostgreSQL's cluster, the worker's scratch folder for the sandbox) lives:
 * in `preferred` when they can reach it, else in a folder of its own under `fallbackRoot`, named after the preferred
 * path so each checkout keeps its own data.
 */
export function sharedStateHome(preferred: string, fallbackRoot = "/var/lib/gatecrash"): { dir: string; movedBecause: string | null } {
  const blocked = blockedAncestor(join(preferred, "pg"));
  if (!blocked) return { dir: resolve(preferred), movedBecause: null };
  const dir = join(fallbackRoot, createHash("sha256").update(resolve(preferred)).digest("hex").slice(0, 16));
  mkdirSync(dir, { recursive: true, mode: 0o755 });
  chmodSync(fallbackRoot, 0o755);
  chmodSync(dir, 0o755);
  return { dir, movedBecause: `the postgres user cannot enter ${blocked}` };
}

import { mkdirSync, readdirSync, rmSync, statSync } from "node:fs";
import { join, resolve } from "node:path";
import { env } from "~/env.server";

/**
 * Each check run works in a folder of its own under WORKDIR, removed whatever the outcome. A worker killed
 * mid-run cannot remove its folder, so a worker that starts sweeps away run folders older than a day
 * (no run lives that long: a job expires after CHECK_RUN_EXPIRE_SECONDS), leaving the ones other workers
 * on this machine are using.
 */
const RUN_PREFIX = "run-";
export const STALE_WORK_FOLDER_MS = 24 * 3600 * 1000;

/** One folder per attempt: a stalled attempt still running on this machine keeps its own. */
export function runWorkDir(checkRunId: string, attempt: number): string {
  return resolve(env().WORKDIR, `${RUN_PREFIX}${checkRunId}-${attempt}`);
}

export function sweepWorkFolders(root = resolve(env().WORKDIR), now = Date.now(), maxAgeMs = STALE_WORK_FOLDER_MS): string[] {
  mkdirSync(root, { recursive: true });
  const removed: string[] = [];
  for (const name of readdirSync(root)) {
    if (!name.startsWith(RUN_PREFIX)) continue;
    const path = join(root, name);
    const st = statSync(path, { throwIfNoEntry: false });
    if (!st?.isDirectory() || now - st.mtimeMs < maxAgeMs) continue;
    rmSync(path, { recursive: true, force: true });
    removed.push(name);
  }
  return removed;
}

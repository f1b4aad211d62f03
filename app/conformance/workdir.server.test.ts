import { existsSync, mkdirSync, mkdtempSync, rmSync, utimesSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { STALE_WORK_FOLDER_MS, sweepWorkFolders } from "./workdir.server";

const root = mkdtempSync(join(tmpdir(), "gc-workdir-"));
afterAll(() => rmSync(root, { recursive: true, force: true }));

describe("the work-folder sweep at worker start", () => {
  it("removes run folders older than a day and keeps fresh ones and anything that is not a run folder", () => {
    const now = Date.now();
    const folder = (name: string, ageMs: number) => {
      const path = join(root, name);
      mkdirSync(join(path, "in"), { recursive: true });
      writeFileSync(join(path, "in", "bundle.archive"), "x");
      const at = new Date(now - ageMs);
      utimesSync(path, at, at);
      return path;
    };
    const stale = folder("run-old", STALE_WORK_FOLDER_MS + 60_000);
    const fresh = folder("run-new", STALE_WORK_FOLDER_MS - 60_000);
    const other = folder("keep-me", 10 * STALE_WORK_FOLDER_MS);
    expect(sweepWorkFolders(root, now)).toEqual(["run-old"]);
    expect(existsSync(stale)).toBe(false);
    expect(existsSync(fresh)).toBe(true);
    expect(existsSync(other)).toBe(true);
  });
});

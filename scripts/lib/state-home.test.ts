import { chmodSync, existsSync, mkdirSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import { clusterFor, initCluster } from "./postgres";
import { blockedAncestor, sharedStateHome } from "./state-home";

const made: string[] = [];
afterEach(() => { for (const d of made.splice(0)) rmSync(d, { recursive: true, force: true }); });

const asRoot = process.getuid?.() === 0;

describe("where npm start keeps PostgreSQL's data", () => {
  // As root the server runs as the postgres user; a checkout in a 0700 folder (mktemp -d, root's home) is out of its reach
  it.runIf(asRoot)("moves the cluster out of a folder the postgres user cannot enter, and initdb succeeds there", () => {
    const closed = mkdtempSync(join(tmpdir(), "gc-closed-")); // mkdtemp makes it 0700
    const fallback = mkdtempSync(join(tmpdir(), "gc-clusters-"));
    made.push(closed, fallback);
    const preferred = join(closed, "checkout", ".gatecrash");
    mkdirSync(join(closed, "checkout", ".gatecrash"), { recursive: true });

    expect(blockedAncestor(join(preferred, "pg"))).toBe(closed);
    const home = sharedStateHome(preferred, join(fallback, "root"));
    expect(home.movedBecause).toBe(`the postgres user cannot enter ${closed}`);
    expect(home.dir.startsWith(join(fallback, "root"))).toBe(true);
    // the same checkout always lands in the same place, so its data is there at the next start
    expect(sharedStateHome(preferred, join(fallback, "root")).dir).toBe(home.dir);

    chmodSync(fallback, 0o755);
    initCluster(clusterFor(join(home.dir, "pg"), 5432));
    expect(existsSync(join(home.dir, "pg", "PG_VERSION"))).toBe(true);
  }, 60_000);

  it.runIf(asRoot)("keeps the cluster in the checkout when the postgres user can reach it", () => {
    const open = mkdtempSync(join(tmpdir(), "gc-open-"));
    made.push(open);
    chmodSync(open, 0o755);
    const preferred = join(open, ".gatecrash");
    expect(blockedAncestor(join(preferred, "pg"))).toBeNull();
    expect(sharedStateHome(preferred, join(open, "unused"))).toEqual({ dir: preferred, movedBecause: null });
    expect(existsSync(join(open, "unused"))).toBe(false);
  });
});

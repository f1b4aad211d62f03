// What crews submit, measured against references in the same run: the sandboxed repository fetch (relay + one-host
// proxy) against a plain shallow clone on the host from the same loopback server, and a .gds.gz layout read
// against the same layout uncompressed. Best of five each. Run alone: npm run bench -- submissions
import { execFile, execFileSync } from "node:child_process";
import { promisify } from "node:util";
import { chmodSync, mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { generateDemoLayout } from "../../tests/support/demo-layout";
import { readLayoutFile } from "../../app/gdsii/reader.server";
import { fetchRepository } from "../../app/sources/repository.server";
import { DEMO_RULESET, rulesetSchema } from "../../app/rules/ruleset";
import { commitTree, startGitServer } from "../../tests/support/git-server";

const REPO = resolve(new URL("../..", import.meta.url).pathname);

async function best(times: number, task: () => Promise<unknown> | unknown): Promise<number> {
  let min = Infinity;
  for (let i = 0; i < times; i++) {
    const t = performance.now();
    await task();
    min = Math.min(min, performance.now() - t);
  }
  return min;
}

export async function benchSubmissions(): Promise<void> {
  const work = mkdtempSync(join(tmpdir(), "gc-bench-submit-"));
  chmodSync(work, 0o755);
  const server = await startGitServer();
  try {
    const commit = commitTree(server, "crew/entry.git", { "rtl/gc_entry.v": readFileSync(join(REPO, "demo/designs/xor-tide.v")), "README.md": "bench\n" });
    let n = 0;
    const sandboxed = await best(5, () =>
      fetchRepository({ url: server.url("crew/entry.git"), commit, workDir: join(work, `s${n++}`), transferBytes: 16 << 20, fetchSeconds: 60, submodules: false, allowLoopback: true }),
    );
    // async: the loopback server answers from this same process
    const plain = await best(5, () => promisify(execFile)("git", ["clone", "-q", "--depth", "1", "--no-tags", server.url("crew/entry.git"), join(work, `p${n++}`)]));
    console.log(`repository fetch: sandboxed ${sandboxed.toFixed(0)} ms, plain host clone ${plain.toFixed(0)} ms, ratio ${(sandboxed / plain).toFixed(2)}×`);

    const gds = join(work, "layout.gds");
    // a 9 × 9 tile die, far beyond any entry, so the read takes long enough to time
    const roomy = rulesetSchema.parse({ ...DEMO_RULESET, tile: { ...DEMO_RULESET.tile, allowedShapes: [{ name: "huge", cols: 9, rows: 9 }] } });
    writeFileSync(gds, generateDemoLayout({ ruleset: roomy, shape: "huge", flipFlops: 8000, logicCells: 150_000, seed: 9, wiresPerCell: 1 }).bytes);
    execFileSync("gzip", ["-k", "-6", gds]);
    const raw = await best(5, () => readLayoutFile(gds));
    const packed = await best(5, () => readLayoutFile(`${gds}.gz`));
    const mib = (p: string) => (statSync(p).size / 1048576).toFixed(1);
    console.log(`layout read: .gds (${mib(gds)} MiB) ${raw.toFixed(0)} ms, .gds.gz (${mib(`${gds}.gz`)} MiB) ${packed.toFixed(0)} ms, ratio ${(packed / raw).toFixed(2)}×`);
  } finally {
    await server.close();
    rmSync(work, { recursive: true, force: true });
  }
}

if (import.meta.url === `file://${process.argv[1]}`) await benchSubmissions();

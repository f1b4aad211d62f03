// What crews submit, measured against references in the same run: the sandboxed repository fetch (relay + one-host
// proxy) against a plain shallow clone on the host from the same loopback server, and a .gds.gz layout read
// against the same layout uncompressed. Best of five each. Run alone: npm run bench -- submissions
import { execFileSync } from "node:child_process";
import { chmodSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { generateDemoLayout } from "../../app/gdsii/demo-layout";
import { readLayoutFile } from "../../app/gdsii/reader.server";
import { fetchRepository } from "../../app/sources/repository.server";
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
    const plain = await best(5, () => execFileSync("git", ["clone", "-q", "--depth", "1", "--no-tags", server.url("crew/entry.git"), join(work, `p${n++}`)]));
    console.log(`repository fetch: sandboxed ${sandboxed.toFixed(0)} ms, plain host clone ${plain.toFixed(0)} ms, ratio ${(sandboxed / plain).toFixed(2)}×`);

    const gds = join(work, "layout.gds");
    writeFileSync(gds, generateDemoLayout({ shape: "4x4", flipFlops: 4000, logicCells: 60_000, seed: 9, wiresPerCell: 1 }).bytes);
    execFileSync("gzip", ["-k", "-6", gds]);
    const raw = await best(5, () => readLayoutFile(gds));
    const packed = await best(5, () => readLayoutFile(`${gds}.gz`));
    console.log(`layout read: .gds ${raw.toFixed(0)} ms, .gds.gz ${packed.toFixed(0)} ms, ratio ${(packed / raw).toFixed(2)}×`);
  } finally {
    await server.close();
    rmSync(work, { recursive: true, force: true });
  }
}

if (import.meta.url === `file://${process.argv[1]}`) await benchSubmissions();

/**
 * Resource hogs (tests/abuse/corpus.ts) through the whole check pipeline with short limits, printing the outcome and
 * wall time of each: `npx tsx tests/abuse/hogs.ts`. The suite runs the same designs (security-abuse.test.ts); this
 * prints the times, and is where bigger hogs go when a tool's own limit (yosys: 60 CPU seconds) is the one tested.
 */
import { chmodSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { DEMO_RULESET, type Ruleset } from "~/rules/ruleset";
import { runPipeline } from "~/conformance/pipeline.server";
import { writeZip } from "../fixtures/hostile/archives";
import { HOGS } from "./corpus";

async function main() {
  const work = mkdtempSync(join(tmpdir(), "gatecrash-hogs-"));
  chmodSync(work, 0o755);
  const ruleset: Ruleset = { ...DEMO_RULESET, simulation: { ...DEMO_RULESET.simulation, compileSeconds: 20, runSeconds: 10, memoryMb: 512, frames: 1 } };
  let bad = 0;
  try {
    for (const [name, text] of Object.entries(HOGS)) {
      const archive = join(work, `${name.replace(/\W+/g, "-")}.zip`);
      await writeZip(archive, [{ name: "top.v", data: text }]);
      const t = Date.now();
      const result = await runPipeline({ ruleset, workDir: join(work, name.replace(/\W+/g, "-")), bundlePath: archive, simulate: true, frames: 1, encode: false });
      const worst = result.findings.filter((f) => f.verdict !== "pass").map((f) => `${f.rule}: ${f.title}`);
      const ok = result.verdict !== "pass" && worst.length > 0;
      if (!ok) bad += 1;
      console.log(`${ok ? "ok  " : "BAD "} ${name}: ${result.verdict} in ${((Date.now() - t) / 1000).toFixed(1)} s — ${worst.slice(0, 3).join(" | ")}`);
    }
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
  process.exitCode = bad ? 1 : 0;
}

await main();

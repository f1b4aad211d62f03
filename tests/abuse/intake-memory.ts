/**
 * Runs bundles through the check pipeline in a process of its own and prints, as one JSON line, each bundle's
 * intake findings and the process's peak resident set (getrusage's ru_maxrss) before and after. The test that
 * starts it (tests/integration/security-abuse.test.ts) holds the growth to a limit: measured here, the figure is
 * this process's alone, not the test runner's with whatever its other tests left in the heap.
 *
 *   npx tsx tests/abuse/intake-memory.ts WORKDIR BUNDLE...
 */
import { join } from "node:path";
import { runPipeline } from "~/conformance/pipeline.server";
import { DEMO_RULESET } from "~/rules/ruleset";

const [workDir, ...bundles] = process.argv.slice(2);
const peakKb = () => process.resourceUsage().maxRSS;

const runs: { bundle: string; verdict: string; intake: { rule: string; verdict: string }[]; steps: string[] }[] = [];
let n = 0;
const baselineKb = peakKb();
for (const bundle of bundles) {
  const steps: string[] = [];
  const result = await runPipeline({
    ruleset: DEMO_RULESET,
    workDir: join(workDir, `intake-${++n}`),
    bundlePath: bundle,
    simulate: false,
    onStep: (step) => void steps.push(step),
  });
  runs.push({
    bundle,
    verdict: result.verdict,
    intake: result.findings.filter((f) => f.step === "intake").map((f) => ({ rule: f.rule, verdict: f.verdict })),
    steps,
  });
}
console.log(JSON.stringify({ baselineKb, peakKb: peakKb(), runs }));

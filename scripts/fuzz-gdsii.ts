// Longer fuzz run of the GDSII reader: npx tsx scripts/fuzz-gdsii.ts [cases=5000] [seed=1]
import { generateDemoLayout } from "../tests/support/demo-layout";
import { mutateAndRead } from "../tests/support/gdsii-fuzz";

const cases = Number(process.argv[2] ?? 5000);
const seed = Number(process.argv[3] ?? 1);
if (!Number.isInteger(cases) || cases < 1 || !Number.isInteger(seed)) {
  console.error("usage: npx tsx scripts/fuzz-gdsii.ts [cases (a whole number ≥ 1)] [seed (a whole number)]");
  process.exit(2);
}
const base = generateDemoLayout({ seed, flipFlops: 20, logicCells: 120 }).bytes;
const started = performance.now();
const outcome = mutateAndRead(base, { cases, seed });
const seconds = (performance.now() - started) / 1000;
console.log(`${cases} cases (seed ${seed}) in ${seconds.toFixed(1)} s: ${outcome.summaries} summaries, ${outcome.gdsiiErrors} GdsiiErrors, ${outcome.otherErrors.length} other errors`);
for (const e of outcome.otherErrors.slice(0, 20)) console.log(`  case ${e.caseIndex}: ${e.error}`);
process.exit(outcome.otherErrors.length ? 1 : 0);

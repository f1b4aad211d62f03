/**
 * `npm run bench`: the speed and memory goals, each measured against a reference in the same run and printed
 * as ratios (never asserted in unit tests). `npm run bench -- gdsii` (or simulation, load, archive, checks, submissions) runs one.
 */
import { benchGdsii } from "./bench/gdsii.bench";
import { benchSimulation } from "./bench/simulation.bench";
import { benchLoad } from "./bench/load.bench";
import { benchArchive } from "./bench/archive.bench";
import { benchChecks } from "./bench/checks.bench";
import { benchSubmissions } from "./bench/submissions.bench";

const BENCHES: Record<string, () => Promise<void>> = { gdsii: benchGdsii, simulation: benchSimulation, load: benchLoad, archive: benchArchive, checks: benchChecks, submissions: benchSubmissions };

const wanted = process.argv.slice(2).filter((a) => !a.startsWith("-"));
const unknown = wanted.filter((w) => !BENCHES[w]);
if (unknown.length) {
  console.error(`unknown benchmark(s): ${unknown.join(", ")}; known: ${Object.keys(BENCHES).join(", ")}`);
  process.exit(2);
}
for (const name of wanted.length ? wanted : Object.keys(BENCHES)) {
  console.log(`\n=== ${name} ===`);
  await BENCHES[name]();
}

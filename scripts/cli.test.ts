import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, statSync, utimesSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_RULESET } from "~/rules/ruleset";
import { generateDemoLayout } from "../tests/support/demo-layout";

/**
 * The compiled CLIs (scripts/cli.mjs bundling scripts/check.ts and scripts/recount.ts with esbuild) against the
 * same CLIs run from their TypeScript sources with tsx: byte for byte the same output and exit code on files this
 * test generates. The bundles go into a folder of this test's own (GATECRASH_CLI_DIR).
 */
let dir: string;
let cliDir: string;

function run(how: "compiled" | "tsx", name: "check" | "recount", args: string[]) {
  const argv = how === "compiled" ? ["scripts/cli.mjs", name, ...args] : ["node_modules/tsx/dist/cli.mjs", `scripts/${name}.ts`, ...args];
  const res = spawnSync(process.execPath, argv, { encoding: "utf8", timeout: 120_000, env: { ...process.env, GATECRASH_CLI_DIR: cliDir } });
  return { code: res.status, stdout: res.stdout, stderr: res.stderr };
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "gc-compiled-cli-"));
  cliDir = join(dir, "bundles");
  // A layout that passes the die and flip-flop checks, one with a forbidden memory macro, and a cut-off file.
  const good = generateDemoLayout({ ruleset: DEMO_RULESET, shape: "wide", flipFlops: 300, logicCells: 4000, wiresPerCell: 1, seed: 21 });
  writeFileSync(join(dir, "good.gds"), good.bytes);
  writeFileSync(join(dir, "macro.gds"), generateDemoLayout({ seed: 4, flipFlops: 60, logicCells: 600, break: { forbiddenCell: true, missingPin: true } }).bytes);
  writeFileSync(join(dir, "cut.gds"), good.bytes.subarray(0, 333));
  writeFileSync(join(dir, "facts.json"), JSON.stringify(good.facts));
  // Borda over three ballots of three candidates.
  writeFileSync(join(dir, "borda.json"), JSON.stringify({ method: "borda", ballots: [["a", "b", "c"], ["b", "a", "c"], ["a", "c", "b"]].map((ranking) => ({ ranking })) }));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("the compiled CLIs", () => {
  it("check: the bundle prints what the TypeScript sources print, for a clean, a broken and an unreadable layout", () => {
    const cases = [
      ["--layout", join(dir, "good.gds"), "--json"],
      ["--layout", join(dir, "macro.gds"), "--json"],
      ["--layout", join(dir, "macro.gds")],
      ["--layout", join(dir, "cut.gds"), "--json"],
      ["--layout", join(dir, "missing.gds")],
    ];
    const codes: (number | null)[] = [];
    for (const args of cases) {
      const compiled = run("compiled", "check", args);
      const source = run("tsx", "check", args);
      expect(compiled.stdout, args.join(" ")).toBe(source.stdout);
      expect(compiled.stderr, args.join(" ")).toBe(source.stderr);
      expect(compiled.code, args.join(" ")).toBe(source.code);
      codes.push(compiled.code);
    }
    // The generator's own record of what it placed is the answer key: the bundle really read the layout.
    const report = JSON.parse(run("compiled", "check", cases[0]).stdout);
    const facts = JSON.parse(readFileSync(join(dir, "facts.json"), "utf8"));
    expect(report.layout.instances).toEqual(facts.cellCounts);
    expect(report.layout.topCell).toBe(facts.topCell);
    // Exit codes of scripts/check.ts: 1 for a failing rule (the memory macro), 2 for an unreadable or missing input.
    expect(codes.slice(1)).toEqual([1, 1, 2, 2]);
    expect(report.findings.find((f: { rule: string }) => f.rule === "layout.cells.forbidden")?.verdict).toBe("pass");
  });

  it("recount: the bundle prints what the TypeScript sources print", () => {
    for (const args of [[join(dir, "borda.json")], [join(dir, "facts.json")], []]) {
      const compiled = run("compiled", "recount", args);
      const source = run("tsx", "recount", args);
      expect(compiled, args.join(" ")).toEqual(source);
    }
    // Borda count, n − 1 points for a first place (common practice, no source): a 2+1+2 = 5, b 1+2+0 = 3, c 0+0+1 = 1.
    const out = JSON.parse(run("compiled", "recount", [join(dir, "borda.json")]).stdout);
    expect(out.ranking.map((r: { candidate: string }) => r.candidate)).toEqual(["a", "b", "c"]);
  });

  it("reuses a fresh bundle and rebuilds one older than its inputs", () => {
    run("compiled", "recount", [join(dir, "borda.json")]);
    const bundle = join(cliDir, "recount.mjs");
    const first = statSync(bundle).mtimeMs;
    run("compiled", "recount", [join(dir, "borda.json")]);
    expect(statSync(bundle).mtimeMs).toBe(first);
    // Make the bundle older than every input (as if scripts/recount.ts had been edited after the build).
    const past = new Date("2001-01-01T00:00:00Z");
    utimesSync(bundle, past, past);
    const again = run("compiled", "recount", [join(dir, "borda.json")]);
    expect(again.code).toBe(0);
    expect(statSync(bundle).mtimeMs).toBeGreaterThan(past.getTime());
    const inputs: string[] = JSON.parse(readFileSync(join(cliDir, "recount.inputs.json"), "utf8")).inputs;
    expect(inputs).toEqual(expect.arrayContaining(["scripts/recount.ts", "app/scoring/recount.ts"]));
  });
});

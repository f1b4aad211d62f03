import { execFile } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { promisify } from "node:util";
import { afterAll, describe, expect, it } from "vitest";
import { readLayout } from "../../app/gdsii/reader";
import { checkLayout } from "../../app/layout/check-layout";
import { layoutMatchesSource } from "../../app/layout/matches-source";
import { DEMO_RULESET } from "../../app/rules/ruleset";
import { DEMO_DESIGNS, designPath } from "./index";
import { DEMO_FLIP_FLOPS, demoEntryLayout, demoPortsOf } from "./layouts";

// yosys (Debian's 0.23) is the reference for what each demo design is: our own trusted files, run directly.
const run = promisify(execFile);
const work = mkdtempSync(join(tmpdir(), "gc-demo-layouts-"));
afterAll(() => rmSync(work, { recursive: true, force: true }));

// yosys manual, "Gate-level cells": the flip-flop families of the generic cell library.
const FLIP_FLOP = /^\$_(?:DFF|SDFF|DFFE|SDFFE|SDFFCE|DFFSR|DFFSRE|ALDFF|ALDFFE)_/;

async function synthesized(slug: string) {
  const ports = join(work, `${slug}.ports.json`);
  const stat = join(work, `${slug}.stat.json`);
  await run("yosys", ["-q", "-p", `read_verilog ${designPath(slug)}; hierarchy -check -top gc_entry; proc; write_json ${ports}; synth -flatten -top gc_entry; tee -q -o ${stat} stat -json`]);
  const netlist = JSON.parse(readFileSync(ports, "utf8")) as { modules: Record<string, { ports: Record<string, { direction: string; bits: unknown[] }> }> };
  const statText = readFileSync(stat, "utf8");
  const cells = (JSON.parse(statText.slice(statText.indexOf("{"))) as { design: { num_cells_by_type: Record<string, number> } }).design.num_cells_by_type;
  return {
    flipFlops: Object.entries(cells).reduce((n, [type, count]) => (FLIP_FLOP.test(type) ? n + count : n), 0),
    ports: Object.entries(netlist.modules.gc_entry.ports).map(([name, p]) => ({ name, direction: p.direction, width: p.bits.length })),
  };
}

describe.each(DEMO_DESIGNS.map((d) => d.slug))("the demo layout of %s", (slug) => {
  it("is its design: yosys' flip-flops and ports, labelled and placed", async () => {
    const source = await synthesized(slug);
    expect(DEMO_FLIP_FLOPS[slug]).toBe(source.flipFlops);
    expect(demoPortsOf(slug).map(({ name, direction, width }) => ({ name, direction, width })).sort((a, b) => a.name.localeCompare(b.name))).toEqual(
      source.ports.sort((a, b) => a.name.localeCompare(b.name)),
    );
    const checked = checkLayout(readLayout(demoEntryLayout(slug).bytes), DEMO_RULESET);
    expect(checked.figures.flipFlops).toBe(source.flipFlops);
    for (const f of layoutMatchesSource(source, checked.figures, DEMO_RULESET)) expect(f.verdict, `${f.rule}: ${f.evidence}`).toBe("pass");
  }, 60_000);
});

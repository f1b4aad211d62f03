import type { Finding } from "~/rules/findings";
import type { Pin, Ruleset } from "~/rules/ruleset";

/** What the source checks measured; the pure half of the yosys step. */
export interface SourcePort {
  name: string;
  direction: "input" | "output" | "inout";
  width: number;
}

export interface SourceFigures {
  top: string;
  ports: SourcePort[];
  cells: number;
  cellsByType: Record<string, number>;
  flipFlops: number;
  resetlessFlipFlops: number;
  latches: number;
  initialBlocks: number;
  transistors: number | null;
  transistorsRaw: string | null;
  sourceLines?: number;
}

// Generic cell families of yosys 0.23 (EDA.md; yosys manual "Gate-level cells").
const FLIP_FLOP = /^\$_(?:DFF|SDFF|DFFE|SDFFE|SDFFCE|DFFSR|DFFSRE|ALDFF|ALDFFE)_/;
/** No reset of any kind: these start in whatever state the silicon powers up in. */
const RESETLESS_FLIP_FLOP = /^\$_(?:DFF_[PN]|DFFE_[PN][PN])_$/;
const LATCH = /^\$_(?:DLATCH|DLATCHSR|SR)_/;

export function countCells(cellsByType: Record<string, number>): Pick<SourceFigures, "cells" | "flipFlops" | "resetlessFlipFlops" | "latches"> {
  let cells = 0;
  let flipFlops = 0;
  let resetlessFlipFlops = 0;
  let latches = 0;
  for (const [type, count] of Object.entries(cellsByType)) {
    cells += count;
    if (FLIP_FLOP.test(type)) flipFlops += count;
    if (RESETLESS_FLIP_FLOP.test(type)) resetlessFlipFlops += count;
    if (LATCH.test(type)) latches += count;
  }
  return { cells, flipFlops, resetlessFlipFlops, latches };
}

/** yosys writes module names escaped ("\\top") in some outputs and plain in others. */
export function findModule<T>(modules: Record<string, T> | undefined, name: string): T | undefined {
  if (!modules) return undefined;
  return modules[name] ?? modules[`\\${name}`];
}

export function parseTransistors(raw: string | null): number | null {
  if (raw === null) return null;
  const m = /^(\d+)\+?$/.exec(raw.trim());
  return m ? Number(m[1]) : null;
}

function source(rule: string, verdict: Finding["verdict"], title: string, extra: Partial<Finding> = {}): Finding {
  return { step: "source", rule, verdict, title, ...extra };
}

export function portFindings(ports: SourcePort[], pins: Pin[]): Finding[] {
  const findings: Finding[] = [];
  const byName = new Map(ports.map((p) => [p.name, p]));
  const expected = new Set(pins.map((p) => p.name));
  for (const pin of pins) {
    const port = byName.get(pin.name);
    if (!port) {
      findings.push(
        source("source.ports.missing", "fail", `Pin ${pin.name} is missing from the top module`, {
          measured: null,
          limit: `${pin.direction} [${pin.width}] ${pin.name}`,
          advice: `Add a port "${pin.name}" (${pin.direction}, ${pin.width} bit${pin.width > 1 ? "s" : ""}) for the ${pin.role} pin.`,
        }),
      );
      continue;
    }
    if (port.direction !== pin.direction) {
      findings.push(
        source("source.ports.direction", "fail", `Pin ${pin.name} is an ${port.direction}; the pin list says ${pin.direction}`, {
          measured: port.direction,
          limit: pin.direction,
          evidence: pin.name,
          advice: `Declare ${pin.name} as ${pin.direction}.`,
        }),
      );
    }
    if (port.width !== pin.width) {
      findings.push(
        source("source.ports.width", "fail", `Pin ${pin.name} is ${port.width} bit(s) wide; the pin list says ${pin.width}`, {
          measured: port.width,
          limit: pin.width,
          evidence: pin.name,
          advice: `Declare ${pin.name} with ${pin.width} bit(s)${pin.width > 1 ? ` ([${pin.width - 1}:0])` : ""}.`,
        }),
      );
    }
  }
  for (const port of ports) {
    if (expected.has(port.name)) continue;
    findings.push(
      source("source.ports.extra", "fail", `Port ${port.name} is not on the pin list`, {
        measured: `${port.direction} [${port.width}] ${port.name}`,
        limit: null,
        evidence: port.name,
        advice: `Remove port ${port.name}, or use an internal signal instead; the shared chip wires only the listed pins.`,
      }),
    );
  }
  if (findings.length === 0) {
    findings.push(source("source.ports", "pass", "Ports match the pin list", { measured: `${ports.length} ports`, limit: `${pins.length} pins` }));
  }
  return findings;
}

export function figureFindings(figures: SourceFigures, ruleset: Ruleset, initialLines: string[]): Finding[] {
  const findings: Finding[] = [];
  findings.push(source("source.cells", "pass", "Generic cells after synthesis", { measured: figures.cells }));
  const budget = ruleset.flipFlopBudget;
  const overBudget = budget !== null && figures.flipFlops > budget;
  findings.push(
    source("source.flip-flops", overBudget ? "fail" : "pass", overBudget ? "More flip-flops than the budget allows" : "Flip-flops", {
      measured: figures.flipFlops,
      limit: budget,
      ...(overBudget ? { advice: `Bring the design down to ${budget} flip-flops: share counters, narrow registers.` } : {}),
    }),
  );
  findings.push(
    figures.latches > 0
      ? source("source.latches", "fail", "The design infers latches", {
          measured: figures.latches,
          limit: 0,
          advice: "Assign every output of a combinational block on every path (or use a clocked block); latches break timing on the shared chip.",
        })
      : source("source.latches", "pass", "No latches", { measured: 0, limit: 0 }),
  );
  if (figures.resetlessFlipFlops > 0) {
    findings.push(
      source("source.flip-flops.reset", "warn", "Flip-flops without a reset: silicon has no initial values", {
        measured: figures.resetlessFlipFlops,
        advice: "Reset every register from the reset pin, or make sure the design recovers from any start state.",
      }),
    );
  }
  if (figures.initialBlocks > 0) {
    findings.push(
      source("source.initial", "warn", "initial blocks are ignored by silicon", {
        measured: figures.initialBlocks,
        evidence: initialLines.slice(0, 10).join(", "),
        advice: "Set start values through the reset instead; an initial block works in simulation only.",
      }),
    );
  }
  findings.push(
    source("source.transistors", "pass", "Estimated transistors (yosys CMOS model)", {
      measured: figures.transistorsRaw,
    }),
  );
  return findings;
}

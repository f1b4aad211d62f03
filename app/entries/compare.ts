import type { EntryCheck } from "~/conformance/report-types";

/**
 * Two uploads of one entry side by side: every rule either check run reported (verdict and measured value of
 * each), and the figures pages show, so a crew sees what changed between two uploads. Pure: shared by the
 * entry page's loader and its component.
 */
export interface ComparedFinding {
  rule: string;
  step: string;
  title: string;
  a: { verdict: "pass" | "warn" | "fail"; measured: string | null } | null;
  b: { verdict: "pass" | "warn" | "fail"; measured: string | null } | null;
  changed: boolean;
}

export interface ComparedFigure {
  label: string;
  a: string;
  b: string;
  changed: boolean;
}

export interface UploadComparison {
  a: { number: number; verdict: string | null; state: string | null };
  b: { number: number; verdict: string | null; state: string | null };
  findings: ComparedFinding[];
  figures: ComparedFigure[];
}

type Figures = Record<string, unknown>;
const FIGURES: { label: string; path: string[]; unit?: string; digits?: number; scale?: number }[] = [
  { label: "Generic cells (yosys)", path: ["source", "cells"] },
  { label: "Flip-flops (synthesis)", path: ["source", "flipFlops"] },
  { label: "Transistors (estimate)", path: ["source", "transistors"] },
  { label: "Lines of code", path: ["source", "sourceLines"] },
  { label: "Flip-flops (layout)", path: ["layout", "flipFlops"] },
  { label: "Die width", path: ["layout", "widthUm"], unit: "µm", digits: 1 },
  { label: "Die height", path: ["layout", "heightUm"], unit: "µm", digits: 1 },
  { label: "Tile shape", path: ["layout", "matchedShape"] },
  { label: "Utilization", path: ["layout", "utilization"], unit: "%", digits: 1, scale: 100 },
  { label: "Placed instances", path: ["layout", "instanceTotal"] },
  { label: "Commit", path: ["repository", "commit"] },
  { label: "Simulation speed", path: ["speed", "realTimeMultiple"], unit: "× real time", digits: 2 },
];

function pick(figures: Figures | undefined, path: string[]): unknown {
  let at: unknown = figures;
  for (const key of path) at = at && typeof at === "object" ? (at as Figures)[key] : undefined;
  return at;
}

function show(value: unknown, f: (typeof FIGURES)[number]): string {
  if (value === undefined || value === null || value === "") return "—";
  if (typeof value === "number") {
    const v = value * (f.scale ?? 1);
    return `${f.digits === undefined ? String(Math.round(v)) : v.toFixed(f.digits)}${f.unit ? ` ${f.unit}` : ""}`;
  }
  return String(value);
}

export function compareChecks(a: EntryCheck, b: EntryCheck): UploadComparison {
  const rules = new Map<string, ComparedFinding>();
  const side = (check: EntryCheck, which: "a" | "b") => {
    for (const f of check.findings) {
      const row = rules.get(f.rule) ?? { rule: f.rule, step: f.step, title: f.title, a: null, b: null, changed: false };
      row[which] = { verdict: f.verdict, measured: f.measured };
      rules.set(f.rule, row);
    }
  };
  side(a, "a");
  side(b, "b");
  const findings = [...rules.values()].map((r) => ({ ...r, changed: r.a?.verdict !== r.b?.verdict || r.a?.measured !== r.b?.measured }));
  const figures = FIGURES.map((f) => {
    const va = show(pick(a.run?.figures, f.path), f);
    const vb = show(pick(b.run?.figures, f.path), f);
    return { label: f.label, a: va, b: vb, changed: va !== vb };
  }).filter((f) => f.a !== "—" || f.b !== "—");
  const head = (c: EntryCheck) => ({ number: c.uploadNumber, verdict: c.run?.verdict ?? null, state: c.run?.state ?? null });
  return { a: head(a), b: head(b), findings, figures };
}

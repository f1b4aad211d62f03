import { compileCellPattern, type Ruleset } from "~/rules/ruleset";
import { FILL_CELL_PATTERN } from "~/gdsii/conventions";
import type { LayoutSummary } from "~/gdsii/summary";

export type CellKind = "flipflop" | "logic" | "fill" | "forbidden" | "block";
export const CELL_KINDS: CellKind[] = ["flipflop", "logic", "fill", "forbidden", "block"];

/**
 * Gatecrash's palette for layout pictures: kinds differ in lightness as well as hue (so they survive
 * grey-scale and the common colour-vision deficiencies), and in the picture also by pattern.
 */
export const KIND_STYLE: Record<CellKind, { label: string; fill: string; rgb: [number, number, number] }> = {
  flipflop: { label: "flip-flops", fill: "#1b3f8b", rgb: [0x1b, 0x3f, 0x8b] },
  logic: { label: "logic", fill: "#e8a33d", rgb: [0xe8, 0xa3, 0x3d] },
  fill: { label: "fill", fill: "#d4d4cf", rgb: [0xd4, 0xd4, 0xcf] },
  forbidden: { label: "forbidden", fill: "#b3261e", rgb: [0xb3, 0x26, 0x1e] },
  block: { label: "blocks", fill: "#4f8f86", rgb: [0x4f, 0x8f, 0x86] },
};

export function cellKinder(summary: LayoutSummary, ruleset: Ruleset): (cell: string) => CellKind {
  const ff = compileCellPattern(ruleset.flipFlopPattern);
  const fill = compileCellPattern(FILL_CELL_PATTERN);
  const forbidden = ruleset.forbiddenCellPatterns.map(compileCellPattern);
  const memo = new Map<string, CellKind>();
  return (cell) => {
    let k = memo.get(cell);
    if (!k) {
      if (forbidden.some((re) => re.test(cell))) k = "forbidden";
      else if (ff.test(cell)) k = "flipflop";
      else if (fill.test(cell)) k = "fill";
      else if (summary.cells[cell] && !summary.cells[cell].leaf) k = "block";
      else k = "logic";
      memo.set(cell, k);
    }
    return k;
  };
}

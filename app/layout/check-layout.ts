import type { Finding } from "~/rules/findings";
import { compileCellPattern, patternProblem, type CellPattern, type Ruleset } from "~/rules/ruleset";
import { DIE_OUTLINE_LAYER, FILL_CELL_PATTERN } from "~/gdsii/conventions";
import type { BoxUm, LayoutSummary } from "~/gdsii/summary";

/**
 * Layout checks of one entry against its ruleset.
 *
 * The die: the bounding box of the top cell's own shapes on Gatecrash's die outline layer
 * (DIE_OUTLINE_LAYER, 200/0) when there are any; otherwise the tile-shaped box of the smallest
 * allowed shape that holds the layout, with its lower-left corner at the origin.
 *
 * Pins: a 1-bit pin must carry a label `name`; a bus is labelled either once as `name` or on every
 * bit as `name[0]` … `name[w-1]` (a bus with only some bits labelled fails). Labels count only on the
 * ruleset's pin layer (and datatype, when it names one), and must lie on the die edge within
 * `edgeToleranceUm`.
 */
export class LayoutCheckError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "LayoutCheckError";
  }
}

export interface LayoutFigures {
  topCell: string;
  bboxUm: BoxUm | null;
  dieUm: BoxUm;
  dieSource: "outline" | "tile-at-origin";
  widthUm: number;
  heightUm: number;
  matchedShape: string | null;
  flipFlops: number;
  flipFlopCells: Record<string, number>;
  instanceTotal: number;
  /** Σ instances × leaf-cell box area, fill excluded. */
  placedCellAreaUm2: number;
  fillAreaUm2: number;
  dieAreaUm2: number;
  utilization: number;
  pinsLabelled: string[];
  pinsMissing: string[];
  pinsOffEdge: string[];
  /** Distinct texts of the labels on the pin layer (held against the source's ports). */
  pinLayerLabels: string[];
  forbiddenCells: Record<string, number>;
}

/** Boxes agree within one nanometre of rounding. */
const SLACK_UM = 0.001;

export function checkLayout(summary: LayoutSummary, ruleset: Ruleset): { findings: Finding[]; figures: LayoutFigures } {
  const findings: Finding[] = [];
  const add = (f: Omit<Finding, "step">) => findings.push({ step: "layout", ...f });
  const ffPattern = pattern(ruleset.flipFlopPattern, "flip-flop pattern");
  const fillPattern = compileCellPattern(FILL_CELL_PATTERN);
  const forbidden = ruleset.forbiddenCellPatterns.map((p) => ({ source: p, re: pattern(p, "forbidden cell pattern") }));
  const { tile } = ruleset;

  if (summary.topCells.length > 1) {
    add({
      rule: "layout.top.multiple",
      verdict: "warn",
      title: "The layout has one top cell",
      measured: summary.topCells.length,
      limit: 1,
      evidence: `top cells: ${summary.topCells.join(", ")}; checked ${summary.topCell} (the largest)`,
      advice: "Export only the entry's top cell and what it places.",
    });
  }
  if (summary.topCell !== ruleset.topModule) {
    add({
      rule: "layout.top.name",
      verdict: "fail",
      title: "The top cell is the ruleset's top module",
      measured: summary.topCell,
      limit: ruleset.topModule,
      evidence: `the layout's top cell is ${summary.topCell}; the ruleset's top module is ${ruleset.topModule}`,
      advice: `Name the layout's top cell ${ruleset.topModule}, like the Verilog top module, and export that cell.`,
    });
  } else {
    add({ rule: "layout.top.name", verdict: "pass", title: "The top cell is the ruleset's top module", measured: summary.topCell, limit: ruleset.topModule });
  }

  // Absolute magnification or angle (STRANS bits 13 and 14): the reader composes every placement's transform with
  // the ones above it, which is wrong for these, so the figures below cannot be trusted for this layout.
  const abs = summary.absoluteTransforms;
  if (abs.placements > 0) {
    const which = [abs.magnification ? "magnification" : null, abs.angle ? "angle" : null].filter(Boolean).join(" and ");
    const cells = abs.cells.length > 5 ? `${abs.cells.slice(0, 5).join(", ")} and ${abs.cells.length - 5} more` : abs.cells.join(", ");
    add({
      rule: "layout.strans.absolute",
      verdict: "fail",
      title: "Placements use relative magnification and angle",
      measured: `${abs.placements} placement${abs.placements === 1 ? "" : "s"} with absolute ${which} in ${cells}`,
      limit: "none",
      evidence: "STRANS sets the absolute-magnification or absolute-angle flag; Gatecrash does not measure such placements, so the sizes and counts below may be off",
      advice: "Export the layout again with relative transforms (clear the absolute magnification and angle flags of the cell placements).",
    });
  }

  // Die and shape.
  const outline = summary.topCellLayers.find((l) => l.layer === DIE_OUTLINE_LAYER.layer && l.datatype === DIE_OUTLINE_LAYER.datatype);
  const extent = outline?.bboxUm ?? summary.bboxUm ?? [0, 0, 0, 0];
  const widthUm = extent[2] - extent[0];
  const heightUm = extent[3] - extent[1];
  const shapes = tile.allowedShapes
    .map((s) => ({ name: s.name, cols: s.cols, rows: s.rows, w: s.cols * tile.widthUm, h: s.rows * tile.heightUm }))
    .filter((s) => s.cols * s.rows <= tile.maxTiles)
    .sort((a, b) => a.w * a.h - b.w * b.h);
  const matched = shapes.find((s) => widthUm <= s.w + SLACK_UM && heightUm <= s.h + SLACK_UM) ?? null;
  const sizeText = `${fmt(widthUm)} × ${fmt(heightUm)} µm`;
  const allowedText = shapes.map((s) => `${s.name} (${fmt(s.w)} × ${fmt(s.h)} µm)`).join(", ") || "none within maxTiles";
  add({
    rule: "layout.die.size",
    verdict: matched ? "pass" : "fail",
    title: "The die fits an allowed tile shape",
    measured: sizeText,
    limit: allowedText,
    evidence: matched ? `fits shape ${matched.name}` : `${outline ? "die outline" : "bounding box"} of ${summary.topCell}`,
    advice: matched ? undefined : `Shrink the die to one of: ${allowedText}, at most ${tile.maxTiles} tiles.`,
  });
  const fallback = matched ?? shapes[0] ?? { w: tile.widthUm, h: tile.heightUm };
  const dieUm: BoxUm = outline ? outline.bboxUm : [0, 0, fallback.w, fallback.h];
  add({
    rule: "layout.die.outline",
    verdict: outline ? "pass" : "warn",
    title: `The top cell marks its die on layer ${DIE_OUTLINE_LAYER.layer}/${DIE_OUTLINE_LAYER.datatype}`,
    measured: outline ? sizeText : "no outline",
    evidence: outline ? undefined : `die taken as the ${fmt(dieUm[2])} × ${fmt(dieUm[3])} µm box at the origin`,
    advice: outline ? undefined : `Draw a rectangle of the die on layer ${DIE_OUTLINE_LAYER.layer}/${DIE_OUTLINE_LAYER.datatype} in the top cell.`,
  });

  // Geometry outside the die.
  const b = summary.bboxUm;
  const overhang = b ? [dieUm[0] - b[0], dieUm[1] - b[1], b[2] - dieUm[2], b[3] - dieUm[3]] : [0, 0, 0, 0];
  const worst = Math.max(...overhang);
  const sides = ["left", "bottom", "right", "top"].filter((_, i) => overhang[i] > SLACK_UM);
  add({
    rule: "layout.geometry.outside",
    verdict: worst > SLACK_UM ? "fail" : "pass",
    title: "All geometry lies inside the die",
    measured: worst > SLACK_UM ? `${fmt(worst)} µm outside (${sides.join(", ")})` : "inside",
    limit: `die ${boxText(dieUm)}`,
    evidence: b ? `bounding box ${boxText(b)}` : "empty layout",
    advice: worst > SLACK_UM ? "Move or trim the shapes that stick out of the die; the chip's neighbours sit right there." : undefined,
  });

  // Census: flip-flops, forbidden cells, area.
  let flipFlops = 0;
  let instanceTotal = 0;
  let placedCellAreaUm2 = 0;
  let fillAreaUm2 = 0;
  const flipFlopCells: Record<string, number> = {};
  const forbiddenCells: Record<string, number> = {};
  for (const [name, n] of Object.entries(summary.instances)) {
    instanceTotal += n;
    if (ffPattern.test(name)) {
      flipFlops += n;
      flipFlopCells[name] = n;
    }
    if (forbidden.some((f) => f.re.test(name))) forbiddenCells[name] = n;
    const cell = summary.cells[name];
    if (cell?.leaf && cell.bboxUm) {
      const area = n * (cell.bboxUm[2] - cell.bboxUm[0]) * (cell.bboxUm[3] - cell.bboxUm[1]);
      if (fillPattern.test(name)) fillAreaUm2 += area;
      else placedCellAreaUm2 += area;
    }
  }
  const budget = ruleset.flipFlopBudget;
  add({
    rule: "layout.flipflops.count",
    verdict: budget !== null && flipFlops > budget ? "fail" : "pass",
    title: "Flip-flops within the budget",
    measured: flipFlops,
    limit: budget,
    evidence: `cells matching /${ruleset.flipFlopPattern}/i: ${listCounts(flipFlopCells) || "none"}`,
    advice: budget !== null && flipFlops > budget ? `Remove ${flipFlops - budget} flip-flops (budget ${budget}).` : undefined,
  });
  const forbiddenNames = Object.keys(forbiddenCells);
  add({
    rule: "layout.cells.forbidden",
    verdict: forbiddenNames.length ? "fail" : "pass",
    title: "No forbidden cells (memory macros)",
    measured: forbiddenNames.length ? listCounts(forbiddenCells) : "none",
    limit: ruleset.forbiddenCellPatterns.join(", "),
    advice: forbiddenNames.length ? "Build storage from flip-flops or logic; macros are not allowed on the shared chip." : undefined,
  });
  const dieAreaUm2 = (dieUm[2] - dieUm[0]) * (dieUm[3] - dieUm[1]);
  const utilization = dieAreaUm2 > 0 ? placedCellAreaUm2 / dieAreaUm2 : 0;
  add({
    rule: "layout.utilization",
    verdict: utilization > 1 ? "warn" : "pass",
    title: "Placed-cell area and utilization of the die",
    measured: `${fmt(placedCellAreaUm2)} µm² (${(utilization * 100).toFixed(1)} %)`,
    limit: `${fmt(dieAreaUm2)} µm² die`,
    evidence: `${instanceTotal} instances; fill ${fmt(fillAreaUm2)} µm² not counted`,
    advice: utilization > 1 ? "Placed cells cover more than the die: cells overlap or lie outside it." : undefined,
  });

  // Pins.
  const pinLabels = summary.labels.filter(
    (l) => l.layer === ruleset.pinLayer.layer && (ruleset.pinLayer.datatype === null || l.texttype === ruleset.pinLayer.datatype),
  );
  const byText = new Map<string, (typeof pinLabels)[number][]>();
  for (const l of pinLabels) byText.set(l.text, [...(byText.get(l.text) ?? []), l]);
  const pinsLabelled: string[] = [];
  const pinsMissing: string[] = [];
  const pinsOffEdge: string[] = [];
  const expected = new Set<string>();
  const tol = ruleset.pinLayer.edgeToleranceUm;
  for (const pin of ruleset.pins) {
    const bits = pin.width === 1 ? [] : Array.from({ length: pin.width }, (_, i) => `${pin.name}[${i}]`);
    expected.add(pin.name);
    bits.forEach((t) => expected.add(t));
    const names = byText.has(pin.name) || bits.length === 0 ? [pin.name] : bits;
    for (const t of names) {
      const found = byText.get(t);
      if (!found) {
        pinsMissing.push(t);
        continue;
      }
      pinsLabelled.push(t);
      if (!found.some((l) => onEdge(l.xUm, l.yUm, dieUm, tol))) pinsOffEdge.push(`${t} at (${fmt(found[0].xUm)}, ${fmt(found[0].yUm)})`);
    }
  }
  const layerText = `layer ${ruleset.pinLayer.layer}${ruleset.pinLayer.datatype === null ? "" : `/${ruleset.pinLayer.datatype}`}`;
  add({
    rule: "layout.pins.labelled",
    verdict: pinsMissing.length ? "fail" : "pass",
    title: `Every pin of the pin list is labelled on ${layerText}`,
    measured: `${pinsLabelled.length} labelled`,
    limit: `${pinsLabelled.length + pinsMissing.length} required`,
    evidence: pinsMissing.length ? `missing: ${pinsMissing.join(", ")}` : undefined,
    advice: pinsMissing.length ? `Add a text label on ${layerText} for each missing pin (a bus as name or name[i] per bit).` : undefined,
  });
  add({
    rule: "layout.pins.edge",
    verdict: pinsOffEdge.length ? "fail" : "pass",
    title: "Pin labels sit on the die edge",
    measured: pinsOffEdge.length ? `${pinsOffEdge.length} off the edge` : "all on the edge",
    limit: `within ${fmt(tol)} µm of the die edge`,
    evidence: pinsOffEdge.length ? pinsOffEdge.join("; ") : undefined,
    advice: pinsOffEdge.length ? "Move the pins to the die boundary, where the chip's wiring reaches them." : undefined,
  });
  const extra = [...byText.keys()].filter((t) => !expected.has(t)).sort();
  if (extra.length) {
    add({
      rule: "layout.pins.extra",
      verdict: "warn",
      title: "Labels on the pin layer name pins of the pin list",
      measured: extra.length,
      evidence: `not in the pin list: ${extra.slice(0, 20).join(", ")}${extra.length > 20 ? " …" : ""}`,
      advice: "Remove stray labels from the pin layer or rename them to pins of the pin list.",
    });
  }

  return {
    findings,
    figures: {
      topCell: summary.topCell,
      bboxUm: summary.bboxUm,
      dieUm,
      dieSource: outline ? "outline" : "tile-at-origin",
      widthUm,
      heightUm,
      matchedShape: matched?.name ?? null,
      flipFlops,
      flipFlopCells,
      instanceTotal,
      placedCellAreaUm2,
      fillAreaUm2,
      dieAreaUm2,
      utilization,
      pinsLabelled,
      pinsMissing,
      pinsOffEdge,
      pinLayerLabels: [...byText.keys()].sort(),
      forbiddenCells,
    },
  };
}

function pattern(source: string, what: string): CellPattern {
  const problem = patternProblem(source);
  if (problem) throw new LayoutCheckError(`the ruleset's ${what} /${source}/ is not a valid pattern: ${problem}`);
  return compileCellPattern(source);
}

function onEdge(x: number, y: number, die: BoxUm, tol: number): boolean {
  const inside = x >= die[0] - tol && x <= die[2] + tol && y >= die[1] - tol && y <= die[3] + tol;
  const distance = Math.min(Math.abs(x - die[0]), Math.abs(x - die[2]), Math.abs(y - die[1]), Math.abs(y - die[3]));
  return inside && distance <= tol;
}

function fmt(v: number): string {
  return Number(v.toFixed(3)).toString();
}

function boxText(b: BoxUm): string {
  return `(${fmt(b[0])}, ${fmt(b[1])}) – (${fmt(b[2])}, ${fmt(b[3])}) µm`;
}

function listCounts(counts: Record<string, number>): string {
  return Object.entries(counts)
    .map(([k, v]) => `${k} ×${v}`)
    .join(", ");
}

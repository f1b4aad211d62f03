import type { Ruleset } from "~/rules/ruleset";
import type { BoxUm, LayoutSummary } from "~/gdsii/summary";
import { CELL_KINDS, cellKinder, KIND_STYLE, type CellKind } from "./cell-kinds";

/**
 * An SVG of the layout for zoom and pan in the browser: viewBox in µm with y pointing up
 * (a flipped group), the die outline, placed cells shaded by kind, pin labels and a legend.
 * Past `maxRects` placements the cells are aggregated into a density grid so the SVG stays small.
 * Needs a summary read with `collectPlacements`.
 */
export interface PictureOptions {
  dieUm: BoxUm;
  maxRects?: number;
  gridColumns?: number;
  title?: string;
}

const PATTERNS = `<defs>
<pattern id="gc-hatch" width="4" height="4" patternUnits="userSpaceOnUse" patternTransform="rotate(45)"><rect width="4" height="4" fill="${KIND_STYLE.flipflop.fill}"/><line x1="0" y1="0" x2="0" y2="4" stroke="#ffffff" stroke-width="1.2"/></pattern>
<pattern id="gc-dots" width="3" height="3" patternUnits="userSpaceOnUse"><rect width="3" height="3" fill="${KIND_STYLE.fill.fill}"/><circle cx="1.5" cy="1.5" r="0.6" fill="#8a8a84"/></pattern>
<pattern id="gc-cross" width="4" height="4" patternUnits="userSpaceOnUse"><rect width="4" height="4" fill="${KIND_STYLE.forbidden.fill}"/><path d="M0 0L4 4M4 0L0 4" stroke="#ffffff" stroke-width="0.8"/></pattern>
</defs>`;

// Solid for logic and blocks, patterns for the others: kinds stay apart without colour.
const KIND_FILL: Record<CellKind, string> = {
  flipflop: "url(#gc-hatch)",
  logic: KIND_STYLE.logic.fill,
  fill: "url(#gc-dots)",
  forbidden: "url(#gc-cross)",
  block: KIND_STYLE.block.fill,
};

export function layoutPictureSvg(summary: LayoutSummary, ruleset: Ruleset, opts: PictureOptions): string {
  const die = opts.dieUm;
  const box = summary.bboxUm ?? die;
  const x0 = Math.min(die[0], box[0]);
  const y0 = Math.min(die[1], box[1]);
  const x1 = Math.max(die[2], box[2]);
  const y1 = Math.max(die[3], box[3]);
  const w = x1 - x0;
  const h = y1 - y0;
  const pad = Math.max(w, h) * 0.06;
  const legendH = Math.max(w, h) * 0.08;
  const vb = [x0 - pad, -(y1 + pad), w + 2 * pad, h + 2 * pad + legendH].map(num).join(" ");
  const unit = Math.max(w, h) / 200; // stroke and font scale with the drawing
  const out: string[] = [];
  out.push(`<svg xmlns="http://www.w3.org/2000/svg" viewBox="${vb}" role="img" aria-label="${esc(opts.title ?? `Layout of ${summary.topCell}`)}">`);
  out.push(`<title>${esc(opts.title ?? `Layout of ${summary.topCell}`)}</title>`);
  out.push(PATTERNS);
  out.push(`<rect x="${num(x0 - pad)}" y="${num(-(y1 + pad))}" width="${num(w + 2 * pad)}" height="${num(h + 2 * pad + legendH)}" fill="#fbfbf8"/>`);
  out.push(`<g transform="scale(1,-1)">`);
  out.push(`<rect x="${num(die[0])}" y="${num(die[1])}" width="${num(die[2] - die[0])}" height="${num(die[3] - die[1])}" fill="#ffffff" stroke="#222" stroke-width="${num(unit)}"/>`);
  const p = summary.placements;
  const kindOf = cellKinder(summary, ruleset);
  const maxRects = opts.maxRects ?? 20_000;
  if (p && p.length <= maxRects) {
    const groups = new Map<CellKind, string[]>();
    for (let i = 0; i < p.length; i++) {
      const k = kindOf(p.cellNames[p.cell[i]]);
      const b = 4 * i;
      const list = groups.get(k) ?? [];
      list.push(`M${num(p.boxUm[b])} ${num(p.boxUm[b + 1])}H${num(p.boxUm[b + 2])}V${num(p.boxUm[b + 3])}H${num(p.boxUm[b])}Z`);
      groups.set(k, list);
    }
    for (const k of CELL_KINDS) {
      const list = groups.get(k);
      if (list) out.push(`<path data-kind="${k}" d="${list.join("")}" fill="${KIND_FILL[k]}" stroke="#333" stroke-width="${num(unit * 0.1)}"/>`);
    }
  } else if (p) {
    out.push(densityGrid(p, kindOf, [x0, y0, x1, y1], opts.gridColumns ?? 160));
  }
  out.push(`</g>`);
  const font = unit * 3;
  for (const l of summary.labels.filter((l) => l.layer === ruleset.pinLayer.layer).slice(0, 500)) {
    out.push(`<circle cx="${num(l.xUm)}" cy="${num(-l.yUm)}" r="${num(unit * 0.8)}" fill="#000"/>`);
    out.push(`<text x="${num(l.xUm + unit)}" y="${num(-l.yUm - unit)}" font-size="${num(font)}" font-family="Inter, sans-serif" fill="#000">${esc(l.text)}</text>`);
  }
  // Legend under the drawing.
  const ly = -(y0 - pad) + legendH * 0.2;
  CELL_KINDS.forEach((k, i) => {
    const lx = x0 + (i * w) / CELL_KINDS.length;
    out.push(`<rect x="${num(lx)}" y="${num(ly)}" width="${num(font)}" height="${num(font)}" fill="${KIND_FILL[k]}" stroke="#333" stroke-width="${num(unit * 0.2)}"/>`);
    out.push(`<text x="${num(lx + font * 1.4)}" y="${num(ly + font * 0.85)}" font-size="${num(font)}" font-family="Inter, sans-serif">${KIND_STYLE[k].label}</text>`);
  });
  out.push(`</svg>`);
  return out.join("\n");
}

function densityGrid(p: NonNullable<LayoutSummary["placements"]>, kindOf: (c: string) => CellKind, area: BoxUm, columns: number): string {
  const [x0, y0, x1, y1] = area;
  const cell = (x1 - x0) / columns || 1;
  const rows = Math.max(1, Math.ceil((y1 - y0) / cell));
  const kinds = CELL_KINDS.length;
  const cover = new Float64Array(columns * rows * kinds);
  for (let i = 0; i < p.length; i++) {
    const k = CELL_KINDS.indexOf(kindOf(p.cellNames[p.cell[i]]));
    const b = 4 * i;
    const cx = Math.min(columns - 1, Math.max(0, Math.floor(((p.boxUm[b] + p.boxUm[b + 2]) / 2 - x0) / cell)));
    const cy = Math.min(rows - 1, Math.max(0, Math.floor(((p.boxUm[b + 1] + p.boxUm[b + 3]) / 2 - y0) / cell)));
    cover[(cy * columns + cx) * kinds + k] += (p.boxUm[b + 2] - p.boxUm[b]) * (p.boxUm[b + 3] - p.boxUm[b + 1]);
  }
  const groups = new Map<CellKind, string[]>();
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < columns; c++) {
      let best = -1;
      let total = 0;
      for (let k = 0; k < kinds; k++) {
        const v = cover[(r * columns + c) * kinds + k];
        total += v;
        if (v > 0 && (best < 0 || v > cover[(r * columns + c) * kinds + best])) best = k;
      }
      if (best < 0) continue;
      const list = groups.get(CELL_KINDS[best]) ?? [];
      const opacityStep = Math.min(4, Math.ceil((total / (cell * cell)) * 4)); // 4 density steps keep paths few
      list.push(`${opacityStep}|M${num(x0 + c * cell)} ${num(y0 + r * cell)}h${num(cell)}v${num(cell)}h${num(-cell)}Z`);
      groups.set(CELL_KINDS[best], list);
    }
  }
  const out: string[] = [`<g data-aggregated="density-grid">`];
  for (const [k, list] of groups) {
    for (let step = 1; step <= 4; step++) {
      const d = list.filter((s) => s.startsWith(`${step}|`)).map((s) => s.slice(2)).join("");
      if (d) out.push(`<path data-kind="${k}" d="${d}" fill="${KIND_FILL[k]}" fill-opacity="${step / 4}"/>`);
    }
  }
  out.push(`</g>`);
  return out.join("\n");
}

function num(v: number): string {
  return Number(v.toFixed(3)).toString();
}

function esc(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}

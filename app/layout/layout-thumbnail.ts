import { PNG } from "pngjs";
import type { Ruleset } from "~/rules/ruleset";
import type { BoxUm, LayoutSummary } from "~/gdsii/summary";
import { CELL_KINDS, cellKinder, KIND_STYLE } from "./cell-kinds";

/**
 * A small PNG of the layout (die outline, placed cells by kind, pin positions), y pointing up.
 * Fill is drawn first so real cells stay visible on top. Needs a summary read with `collectPlacements`.
 */
export function layoutThumbnailPng(summary: LayoutSummary, ruleset: Ruleset, opts: { dieUm: BoxUm; widthPx?: number }): Buffer {
  const die = opts.dieUm;
  const box = summary.bboxUm ?? die;
  const x0 = Math.min(die[0], box[0]);
  const y0 = Math.min(die[1], box[1]);
  const x1 = Math.max(die[2], box[2]);
  const y1 = Math.max(die[3], box[3]);
  const width = Math.max(16, Math.min(2048, Math.round(opts.widthPx ?? 320)));
  const scale = (width - 2) / Math.max(x1 - x0, 1e-9);
  const height = Math.max(16, Math.min(2048, Math.round((y1 - y0) * scale) + 2));
  const png = new PNG({ width, height });
  const data = png.data;
  const paint = (px0: number, py0: number, px1: number, py1: number, rgb: [number, number, number]) => {
    const a = Math.max(0, Math.floor(px0));
    const b = Math.min(width - 1, Math.ceil(px1) - 1);
    const c = Math.max(0, Math.floor(py0));
    const d = Math.min(height - 1, Math.ceil(py1) - 1);
    for (let y = c; y <= d; y++) {
      for (let x = a; x <= Math.max(a, b); x++) {
        if (x >= width) break;
        const o = 4 * (y * width + x);
        data[o] = rgb[0];
        data[o + 1] = rgb[1];
        data[o + 2] = rgb[2];
        data[o + 3] = 255;
      }
    }
  };
  const toPx = (x: number, y: number): [number, number] => [1 + (x - x0) * scale, height - 1 - (y - y0) * scale];
  const rect = (b: ArrayLike<number>, at: number, rgb: [number, number, number]) => {
    const [ax, ay] = toPx(b[at], b[at + 3]);
    const [bx, by] = toPx(b[at + 2], b[at + 1]);
    paint(ax, ay, bx, by, rgb);
  };
  paint(0, 0, width, height, [0xfb, 0xfb, 0xf8]);
  rect(die, 0, [0xff, 0xff, 0xff]);
  const p = summary.placements;
  if (p) {
    const kindOf = cellKinder(summary, ruleset);
    const kinds = p.cellNames.map(kindOf);
    for (const k of CELL_KINDS) {
      for (let i = 0; i < p.length; i++) if (kinds[p.cell[i]] === k) rect(p.boxUm, 4 * i, KIND_STYLE[k].rgb);
    }
  }
  const [dx0, dy0] = toPx(die[0], die[3]);
  const [dx1, dy1] = toPx(die[2], die[1]);
  const ink: [number, number, number] = [0x22, 0x22, 0x22];
  paint(dx0, dy0, dx1, dy0 + 1, ink);
  paint(dx0, dy1 - 1, dx1, dy1, ink);
  paint(dx0, dy0, dx0 + 1, dy1, ink);
  paint(dx1 - 1, dy0, dx1, dy1, ink);
  for (const l of summary.labels) {
    if (l.layer !== ruleset.pinLayer.layer) continue;
    const [x, y] = toPx(l.xUm, l.yUm);
    paint(x - 1, y - 1, x + 2, y + 2, [0, 0, 0]);
  }
  return PNG.sync.write(png);
}

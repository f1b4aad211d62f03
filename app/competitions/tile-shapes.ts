import type { TileShape } from "~/rules/ruleset";

/** Geometry of a ruleset's allowed tile shapes, for the to-scale drawing on the rules page. */
export interface ShapeBox {
  shape: string;
  cols: number;
  rows: number;
  widthUm: number;
  heightUm: number;
  areaMm2: number;
  withinLimit: boolean;
}

export function shapeBoxes(tile: { widthUm: number; heightUm: number; maxTiles: number; allowedShapes: TileShape[] }): ShapeBox[] {
  return tile.allowedShapes.map(({ name: shape, cols, rows }) => {
    const widthUm = cols * tile.widthUm;
    const heightUm = rows * tile.heightUm;
    return { shape, cols, rows, widthUm, heightUm, areaMm2: (widthUm * heightUm) / 1e6, withinLimit: cols * rows <= tile.maxTiles };
  });
}

/** One scale (px per µm) for every shape, so they compare truly; a round scale bar length in µm. */
export function drawingScale(boxes: ShapeBox[], maxWidthPx = 640, maxHeightPx = 260, gapPx = 40): { pxPerUm: number; barUm: number } {
  const totalUm = boxes.reduce((s, b) => s + b.widthUm, 0);
  const tallest = Math.max(...boxes.map((b) => b.heightUm));
  const usable = maxWidthPx - gapPx * (boxes.length + 1);
  const pxPerUm = Math.min(usable / totalUm, maxHeightPx / tallest);
  const target = 120 / pxPerUm; // a bar of about 120 px
  const pow = 10 ** Math.floor(Math.log10(target));
  const barUm = [1, 2, 5, 10].map((m) => m * pow).reduce((best, v) => (Math.abs(v - target) < Math.abs(best - target) ? v : best));
  return { pxPerUm, barUm };
}

export const fmtArea = (mm2: number) => (mm2 < 0.1 ? mm2.toFixed(4) : mm2.toFixed(3));

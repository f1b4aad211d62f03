import { describe, expect, it } from "vitest";
import { DEFAULT_TILE, DEFAULT_TILE_SHAPES } from "~/rules/ruleset";
import { drawingScale, fmtArea, shapeBoxes } from "./tile-shapes";

describe("tile shapes", () => {
  it("sizes each shape from the tile (180 × 120 µm = 0.0216 mm²; 1 mm² = 10^6 µm², SI)", () => {
    const boxes = shapeBoxes({ ...DEFAULT_TILE, allowedShapes: [...DEFAULT_TILE_SHAPES, { name: "square", cols: 2, rows: 2 }] });
    expect(boxes.map((b) => [b.shape, b.widthUm, b.heightUm, b.areaMm2, b.withinLimit])).toEqual([
      ["single", 180, 120, 0.0216, true],
      ["wide", 360, 120, 0.0432, true],
      ["tall", 180, 240, 0.0432, true],
      ["square", 360, 240, 0.0864, false],
    ]);
    expect(fmtArea(0.0216)).toBe("0.0216");
  });

  it("draws every shape at one scale that fits, with a round scale bar", () => {
    const boxes = shapeBoxes(DEFAULT_TILE);
    const { pxPerUm, barUm } = drawingScale(boxes);
    const widthPx = boxes.reduce((s, b) => s + b.widthUm * pxPerUm, 0) + 40 * 4;
    expect(widthPx).toBeLessThanOrEqual(640.0001);
    expect(Math.max(...boxes.map((b) => b.heightUm * pxPerUm))).toBeLessThanOrEqual(260.0001);
    expect([1, 2, 5].some((m) => Number.isInteger(barUm / m) && /^10*$/.test(String(barUm / m)))).toBe(true);
  });
});

import { describe, expect, it } from "vitest";
import { drawingScale, fmtArea, shapeBoxes } from "./tile-shapes";

describe("tile shapes", () => {
  it("sizes each shape from the tile (160 × 100 µm = 0.016 mm²; 1 mm² = 10^6 µm², SI)", () => {
    const boxes = shapeBoxes({ widthUm: 160, heightUm: 100, maxTiles: 2, allowedShapes: ["1x1", "2x1", "1x2", "2x2"] });
    expect(boxes.map((b) => [b.shape, b.widthUm, b.heightUm, b.areaMm2, b.withinLimit])).toEqual([
      ["1x1", 160, 100, 0.016, true],
      ["2x1", 320, 100, 0.032, true],
      ["1x2", 160, 200, 0.032, true],
      ["2x2", 320, 200, 0.064, false],
    ]);
    expect(fmtArea(0.016)).toBe("0.0160");
  });

  it("draws every shape at one scale that fits, with a round scale bar", () => {
    const boxes = shapeBoxes({ widthUm: 160, heightUm: 100, maxTiles: 2, allowedShapes: ["1x1", "2x1", "1x2"] });
    const { pxPerUm, barUm } = drawingScale(boxes);
    const widthPx = boxes.reduce((s, b) => s + b.widthUm * pxPerUm, 0) + 40 * 4;
    expect(widthPx).toBeLessThanOrEqual(640.0001);
    expect(Math.max(...boxes.map((b) => b.heightUm * pxPerUm))).toBeLessThanOrEqual(260.0001);
    expect([1, 2, 5].some((m) => Number.isInteger(barUm / m) && /^10*$/.test(String(barUm / m)))).toBe(true);
  });
});

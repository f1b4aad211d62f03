import { describe, expect, it } from "vitest";
import { PNG } from "pngjs";
import { DEMO_RULESET } from "~/rules/ruleset";
import { generateDemoLayout } from "../../tests/support/demo-layout";
import { readLayout } from "~/gdsii/reader";
import { KIND_STYLE } from "./cell-kinds";
import { layoutPictureSvg } from "./layout-picture";
import { layoutThumbnailPng } from "./layout-thumbnail";

const demo = generateDemoLayout({ seed: 9, flipFlops: 140, logicCells: 1500, break: { forbiddenCell: true } });
const summary = readLayout(demo.bytes, { collectPlacements: 100_000 });
const die = demo.facts.dieUm;

describe("layout pictures", () => {
  it("draws an SVG in µm with y up, cells by kind, pins and a legend", () => {
    const svg = layoutPictureSvg(summary, DEMO_RULESET, { dieUm: die });
    expect(svg).toMatch(/^<svg xmlns="http:\/\/www.w3.org\/2000\/svg" viewBox="-10.8 -130.8 /); // 180 × 120 µm die, 6 % of the longer side as margin
    expect(svg).toContain('transform="scale(1,-1)"');
    for (const kind of ["flipflop", "logic", "fill", "forbidden"]) expect(svg).toContain(`data-kind="${kind}"`);
    for (const label of demo.facts.labels) expect(svg).toContain(`>${label.replace("[", "[")}</text>`);
    expect(svg).toContain(">flip-flops</text>");
  });

  it("aggregates into a density grid past the threshold, keeping the SVG bounded", () => {
    const full = layoutPictureSvg(summary, DEMO_RULESET, { dieUm: die });
    const grid = layoutPictureSvg(summary, DEMO_RULESET, { dieUm: die, maxRects: 100, gridColumns: 40 });
    expect(grid).toContain('data-aggregated="density-grid"');
    expect(grid.length).toBeLessThan(full.length);
    // At most 40 × 30 grid squares of ~30 characters each, plus labels and legend.
    expect(grid.length).toBeLessThan(40 * 30 * 40 + 20_000);
  });

  it("rasterizes a PNG thumbnail that pngjs decodes, with the kinds' colours in it", () => {
    const png = PNG.sync.read(layoutThumbnailPng(summary, DEMO_RULESET, { dieUm: die, widthPx: 320 }));
    expect(png.width).toBe(320);
    expect(png.height).toBeGreaterThan(190);
    const colours = new Set<string>();
    for (let i = 0; i < png.data.length; i += 4) colours.add(`${png.data[i]},${png.data[i + 1]},${png.data[i + 2]}`);
    for (const k of ["flipflop", "logic", "fill", "forbidden"] as const) expect(colours.has(KIND_STYLE[k].rgb.join(","))).toBe(true);
  });
});

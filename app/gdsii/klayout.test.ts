import { afterAll, describe, expect, it } from "vitest";
import { generateDemoLayout } from "../../tests/support/demo-layout";
import { readLayout } from "./reader";
import { klayoutFixture, klayoutSummary, writeTemp, type KlayoutSummary } from "../../tests/support/klayout";
import type { LayoutSummary } from "./summary";
import { writeLayout } from "./writer";

// KLayout (Debian's klayout 0.28.5, batch mode) is the independent reference. It stores coordinates
// on the database grid, so boxes agree to within one database unit (1 nm here).
const TOLERANCE_UM = 0.0011;
const cleanups: (() => void)[] = [];
afterAll(() => cleanups.forEach((c) => c()));

async function both(bytes: Uint8Array): Promise<[LayoutSummary, KlayoutSummary]> {
  const tmp = writeTemp(bytes);
  cleanups.push(tmp.cleanup);
  return [readLayout(bytes), await klayoutSummary(tmp.path)];
}

function expectSameBox(ours: number[] | null, theirs: number[] | null): void {
  expect(ours === null).toBe(theirs === null);
  if (!ours || !theirs) return;
  ours.forEach((v, i) => expect(Math.abs(v - theirs[i])).toBeLessThanOrEqual(TOLERANCE_UM));
}

function expectAgreement(ours: LayoutSummary, theirs: KlayoutSummary): void {
  expect(ours.topCells).toEqual(theirs.topCells);
  expect(ours.topCell).toBe(theirs.topCell);
  expectSameBox(ours.bboxUm, theirs.bboxUm);
  expect(ours.instances).toEqual(theirs.instances);
  const sortLabels = <T extends { text: string; xUm: number; yUm: number }>(l: T[]) =>
    [...l].sort((a, b) => a.text.localeCompare(b.text) || a.xUm - b.xUm || a.yUm - b.yUm);
  const a = sortLabels(ours.labels);
  const b = sortLabels(theirs.labels);
  expect(a.map((l) => l.text)).toEqual(b.map((l) => l.text));
  a.forEach((l, i) => {
    const what = `label ${l.text} #${i}`;
    expect(Math.abs(l.xUm - b[i].xUm), what).toBeLessThanOrEqual(TOLERANCE_UM);
    expect(Math.abs(l.yUm - b[i].yUm), what).toBeLessThanOrEqual(TOLERANCE_UM);
    expect(l.layer, what).toBe(b[i].layer);
    expect(l.texttype, what).toBe(b[i].texttype);
  });
  expect(ours.layers.map((k) => [k.layer, k.datatype])).toEqual(theirs.layers);
  // the same cells on both sides (none missing from ours, none extra), each with the same box
  expect(Object.keys(ours.cells).sort()).toEqual(Object.keys(theirs.cells).sort());
  for (const [name, box] of Object.entries(theirs.cells)) expectSameBox(ours.cells[name].bboxUm, box);
}

describe("Gatecrash's reader agrees with KLayout", () => {
  it("on a layout KLayout wrote: rotations 90/180/270/37/123.5°, mirrors, magnification, nesting, arrays, paths, labels", async () => {
    const [ours, theirs] = await both(await klayoutFixture());
    expectAgreement(ours, theirs);
    // Hand check of the census: block = 3×2 mids + 4×5 leaves; top = 2 blocks + 1 mid; mid = 6 leaves + 1 wire.
    expect(ours.instances).toEqual({ kx_block: 2, kx_mid: 13, kx_leaf: 2 * 20 + 13 * 6, kx_wire: 13 });
  });

  const variants = [{}, { tooBig: true }, { forbiddenCell: true, outsideBoundary: true }, { missingPin: true as const }];
  it.each(variants)("on the demo layout Gatecrash's writer wrote, with breaks %o", async (variant) => {
    const demo = generateDemoLayout({ seed: 7, flipFlops: 120, logicCells: 900, break: variant });
    const [ours, theirs] = await both(demo.bytes);
    expectAgreement(ours, theirs);
    // KLayout's census holds the numbers this test asked for (not the generator's own record of what it placed)
    const n = (pattern: RegExp) => Object.entries(theirs.instances).reduce((sum, [cell, k]) => (pattern.test(cell) ? sum + k : sum), 0);
    expect(n(/^gc_dffr?$/)).toBe(120);
    expect(n(/^gc_(inv|nand2|nor2|and2|xor2|mux2|buf)$/)).toBe(900);
    expect(n(/^gc_sram/)).toBe("forbiddenCell" in variant ? 1 : 0);
  });

  it("on arbitrary angles, magnification and mirrored arrays written by Gatecrash", async () => {
    const bytes = writeLayout({
      libName: "ANGLES",
      userUnitsPerDbUnit: 0.001,
      metersPerDbUnit: 1e-9,
      structures: [
        { name: "a", elements: [{ kind: "boundary", layer: 4, datatype: 0, points: [0, 0, 3000, 0, 3000, 700, 0, 700] }, { kind: "path", layer: 6, datatype: 0, width: 300, pathtype: 2, points: [0, 0, 0, 2000, 1500, 2000] }] },
        {
          name: "b",
          elements: [
            { kind: "sref", cell: "a", x: 100, y: 200, angle: 15, mag: 1.75 },
            { kind: "aref", cell: "a", cols: 5, rows: 3, x: -4000, y: 9000, colStep: [4000, 0], rowStep: [0, 3000], reflect: true, angle: 270 },
          ],
        },
        { name: "t", elements: [{ kind: "sref", cell: "b", x: 0, y: 0, angle: 211, reflect: true }, { kind: "sref", cell: "b", x: 50000, y: 0, mag: 0.5 }, { kind: "text", layer: 70, texttype: 0, x: 7, y: 9, text: "rst_n" }] },
      ],
    });
    const [ours, theirs] = await both(bytes);
    expectAgreement(ours, theirs);
  });
});

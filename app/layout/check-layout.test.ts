import { describe, expect, it } from "vitest";
import { worstVerdict } from "~/rules/findings";
import { DEMO_RULESET, rulesetSchema, DEMO_PINS } from "~/rules/ruleset";
import { generateDemoLayout } from "../../tests/support/demo-layout";
import { readLayout } from "~/gdsii/reader";
import { writeLayout } from "~/gdsii/writer";
import { checkLayout, LayoutCheckError } from "./check-layout";

const check = (opts: Parameters<typeof generateDemoLayout>[0], ruleset = DEMO_RULESET) =>
  checkLayout(readLayout(generateDemoLayout({ seed: 5, flipFlops: 140, logicCells: 1500, ...opts, ruleset }).bytes), ruleset);
const verdictOf = (r: ReturnType<typeof check>, rule: string) => r.findings.find((f) => f.rule === rule)?.verdict;

describe("checkLayout", () => {
  it("passes the demo layout and reports its figures", () => {
    const r = check({});
    expect(worstVerdict(r.findings)).toBe("pass");
    expect(r.findings.every((f) => f.step === "layout")).toBe(true);
    expect(r.figures.matchedShape).toBe("single");
    expect(r.figures.dieSource).toBe("outline");
    expect(r.figures.dieUm).toEqual([0, 0, 180, 120]); // DEMO_RULESET tile 180 × 120 µm
    expect(r.figures.flipFlops).toBe(140);
    // 70 gc_dff (6.4 × 2.8 µm) + 70 gc_dffr (7.2 × 2.8 µm) are part of the placed area, computed by hand.
    expect(r.figures.placedCellAreaUm2).toBeGreaterThan(70 * 6.4 * 2.8 + 70 * 7.2 * 2.8);
    expect(r.figures.utilization).toBeGreaterThan(0.1);
    expect(r.figures.utilization).toBeLessThan(1);
    // 8 pins of the demo pin list, three of them 2-bit buses labelled per bit: 5 + 3 × 2 = 11 labels.
    expect(r.figures.pinsLabelled).toHaveLength(11);
  });

  it("matches the wide (2 × 1 tiles) shape for a two-tile die", () => {
    const r = check({ shape: "wide" });
    expect(r.figures.matchedShape).toBe("wide");
    expect(verdictOf(r, "layout.die.size")).toBe("pass");
  });

  it("fails a die bigger than maxTiles allows", () => {
    const r = check({ break: { tooBig: true } });
    expect(verdictOf(r, "layout.die.size")).toBe("fail");
    expect(r.figures.matchedShape).toBeNull();
    expect(r.findings.find((f) => f.rule === "layout.die.size")?.measured).toBe("540 × 120 µm"); // 3 tiles × 180 µm
  });

  it("fails a missing pin label and names it", () => {
    const r = check({ break: { missingPin: "vga_g" } });
    expect(verdictOf(r, "layout.pins.labelled")).toBe("fail");
    expect(r.figures.pinsMissing).toEqual(["vga_g[0]", "vga_g[1]"]);
  });

  it("fails a forbidden memory macro", () => {
    const r = check({ break: { forbiddenCell: true } });
    expect(verdictOf(r, "layout.cells.forbidden")).toBe("fail");
    expect(r.figures.forbiddenCells).toEqual({ gc_sram_64x8: 1 });
  });

  it("fails geometry outside the die by the measured overhang", () => {
    const r = check({ break: { outsideBoundary: true } });
    expect(verdictOf(r, "layout.geometry.outside")).toBe("fail");
    expect(r.findings.find((f) => f.rule === "layout.geometry.outside")?.measured).toBe("5 µm outside (right)");
  });

  it("fails too many flip-flops against a budget", () => {
    const ruleset = rulesetSchema.parse({ topModule: "gc_entry", pins: DEMO_PINS, flipFlopBudget: 100 });
    const r = check({ flipFlops: 80, break: { tooManyFlipFlops: true } }, ruleset);
    expect(r.figures.flipFlops).toBe(110);
    expect(verdictOf(r, "layout.flipflops.count")).toBe("fail");
  });

  it("fails pins away from the die edge, warns on a missing outline and on stray labels", () => {
    const bytes = writeLayout({
      libName: "P",
      userUnitsPerDbUnit: 0.001,
      metersPerDbUnit: 1e-9,
      structures: [
        {
          name: "gc_entry",
          elements: [
            { kind: "boundary", layer: 1, datatype: 0, points: [0, 0, 180000, 0, 180000, 120000, 0, 120000] },
            ...["clk", "rst_n", "vga_r", "vga_g", "vga_b", "vga_hs", "vga_vs", "pwm_out"].map((t, i) => ({ kind: "text" as const, layer: DEMO_RULESET.pinLayer.layer, texttype: 0, x: 10000 * (i + 1), y: 0, text: t })),
            { kind: "text", layer: DEMO_RULESET.pinLayer.layer, texttype: 0, x: 50000, y: 60000, text: "clk" },
            { kind: "text", layer: DEMO_RULESET.pinLayer.layer, texttype: 0, x: 0, y: 20000, text: "debug" },
          ],
        },
      ],
    });
    const r = checkLayout(readLayout(bytes), DEMO_RULESET);
    expect(verdictOf(r, "layout.die.outline")).toBe("warn");
    expect(r.figures.dieSource).toBe("tile-at-origin");
    expect(verdictOf(r, "layout.pins.labelled")).toBe("pass"); // buses labelled once by name
    expect(verdictOf(r, "layout.pins.edge")).toBe("pass"); // one of the two clk labels is on the edge
    expect(verdictOf(r, "layout.pins.extra")).toBe("warn");
    const moved = writeLayout({
      libName: "P",
      userUnitsPerDbUnit: 0.001,
      metersPerDbUnit: 1e-9,
      structures: [{ name: "gc_entry", elements: [{ kind: "boundary", layer: 200, datatype: 0, points: [0, 0, 180000, 0, 180000, 120000, 0, 120000] }, { kind: "text", layer: DEMO_RULESET.pinLayer.layer, texttype: 0, x: 90000, y: 1500, text: "clk" }] }],
    });
    const r2 = checkLayout(readLayout(moved), DEMO_RULESET);
    expect(verdictOf(r2, "layout.pins.edge")).toBe("fail"); // 1.5 µm from the edge, tolerance 1 µm
  });

  it("reports a broken pattern in the ruleset as a LayoutCheckError", () => {
    const ruleset = { ...DEMO_RULESET, flipFlopPattern: "(" };
    expect(() => checkLayout(readLayout(generateDemoLayout({ flipFlops: 2, logicCells: 2 }).bytes), ruleset)).toThrow(LayoutCheckError);
  });
});

describe("placements with absolute transforms", () => {
  it("refuses a layout whose placements set absolute magnification or angle, naming the cells", () => {
    // A demo layout whose top cell places its flip-flops with STRANS 0x0004 (absolute magnification, bit 13 of the
    // GDSII Stream Format Manual 6.0's STRANS word), patched into the generated file record by record.
    const bytes = Buffer.from(generateDemoLayout({ seed: 5, flipFlops: 140, logicCells: 1500, ruleset: DEMO_RULESET }).bytes);
    const patched = withAbsoluteMagnification(bytes);
    const r = checkLayout(readLayout(patched), DEMO_RULESET);
    const f = r.findings.find((x) => x.rule === "layout.strans.absolute");
    expect(f?.verdict).toBe("fail");
    expect(String(f?.measured)).toMatch(/^\d+ placements? with absolute magnification in gc_entry$/);
    // the same layout without the flag has no such finding
    expect(checkLayout(readLayout(bytes), DEMO_RULESET).findings.some((x) => x.rule === "layout.strans.absolute")).toBe(false);
  });
});

/** Sets the absolute-magnification bit in every STRANS record (type 0x1a, 2 data bytes) of a GDSII stream. */
function withAbsoluteMagnification(bytes: Buffer): Buffer {
  const out = Buffer.from(bytes);
  let seen = 0;
  for (let pos = 0; pos + 4 <= out.length; ) {
    const len = out.readUInt16BE(pos);
    if (out[pos + 2] === 0x1a && len === 6) {
      out.writeUInt16BE(out.readUInt16BE(pos + 4) | 0x0004, pos + 4);
      seen++;
    }
    if (out[pos + 2] === 0x04) break; // ENDLIB
    pos += len;
  }
  if (seen === 0) throw new Error("the generated layout has no STRANS record to patch");
  return out;
}


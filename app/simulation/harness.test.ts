import { describe, expect, it } from "vitest";
import { DEMO_PINS, DEMO_RULESET, rulesetSchema } from "~/rules/ruleset";
import { generateHarness, HarnessError } from "./harness";
import { verilatorArgs } from "./build.server";
import { contactSheet, encodePng, FrameError, spreadIndices } from "./frames";
import { PNG } from "pngjs";

describe("harness generation", () => {
  it("drives and reads the pins named by the ruleset", () => {
    const cpp = generateHarness(DEMO_RULESET);
    for (const name of ["clk", "rst_n", "vga_r", "vga_g", "vga_b", "vga_hs", "vga_vs", "pwm_out"]) expect(cpp).toContain(`top->${name}`);
    expect(cpp).toContain("top->rst_n = 0;"); // active-low reset asserted
    expect(cpp).toContain("H_TOTAL = 800");
    expect(cpp).toContain("V_TOTAL = 525");
  });
  it("builds a savable model and filters the audio pin at the ruleset's cut-off", () => {
    expect(verilatorArgs(DEMO_RULESET, ["src/a.v"])).toContain("--savable");
    const cpp = generateHarness(rulesetSchema.parse({ ...DEMO_RULESET, audio: { lowPassHz: 1234 } }));
    expect(cpp).toContain("LOW_PASS_HZ = 1234;");
    expect(cpp).toContain("*this << *top"); // the model's whole state, saved at each frame start
  });
  it("follows a high-active reset", () => {
    const cpp = generateHarness(rulesetSchema.parse({ ...DEMO_RULESET, resetActive: "high" }));
    expect(cpp).toContain("top->rst_n = 1;\n  top->eval();");
  });
  it("refuses pin lists it cannot drive, with a message naming the problem", () => {
    const without = (role: string) => rulesetSchema.parse({ ...DEMO_RULESET, pins: DEMO_PINS.filter((p) => p.role !== role) });
    expect(() => generateHarness(without("vsync"))).toThrow(/no vsync pin/);
    expect(() => generateHarness(without("clock"))).toThrow(HarnessError);
    const wide = rulesetSchema.parse({ ...DEMO_RULESET, colourBitsPerChannel: 3 });
    expect(() => generateHarness(wide)).toThrow(/red pins add up to 2 bits/);
  });
});

describe("frames", () => {
  it("spreads picks from first to last frame", () => {
    expect(spreadIndices(100, 12)[0]).toBe(0);
    expect(spreadIndices(100, 12).at(-1)).toBe(99);
    expect(spreadIndices(4, 12)).toEqual([0, 1, 2, 3]);
  });
  it("writes PNGs that pngjs reads back pixel for pixel", () => {
    const img = { width: 8, height: 4, data: Uint8Array.from({ length: 96 }, (_, i) => (i * 29) % 256) };
    const back = PNG.sync.read(encodePng(img));
    expect([back.width, back.height]).toEqual([8, 4]);
    expect(back.data[4 * 5 + 1]).toBe(img.data[3 * 5 + 1]);
    const sheet = contactSheet([img, img, img], 2, 2, 1);
    expect([sheet.width, sheet.height]).toEqual([2 * 4 + 3, 2 * 2 + 3]);
    expect(() => encodePng({ width: 8, height: 4, data: new Uint8Array(5) })).toThrow(FrameError);
  });
});

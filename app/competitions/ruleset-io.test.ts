import { describe, expect, it } from "vitest";
import { DEMO_RULESET } from "~/rules/ruleset";
import { parseRulesetJson, rulesetJson } from "./ruleset-io";

describe("ruleset JSON", () => {
  it("round-trips the demo ruleset", () => {
    const r = parseRulesetJson(rulesetJson(DEMO_RULESET));
    expect(r.ok && r.ruleset).toEqual(DEMO_RULESET);
  });

  it("accepts a ruleset with only topModule and pins; the rest are the demo values", () => {
    const r = parseRulesetJson(JSON.stringify({ topModule: "tiny_top", pins: [{ name: "clk", direction: "input", width: 1, role: "clock" }] }));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.ruleset.topModule).toBe("tiny_top");
    expect(r.ruleset.tile).toEqual(DEMO_RULESET.tile);
    expect(r.ruleset.clock).toEqual(DEMO_RULESET.clock);
    expect(r.ruleset.uploadLimits).toEqual(DEMO_RULESET.uploadLimits);
  });

  it("names each problem by its path", () => {
    const bad = { ...DEMO_RULESET, pins: [{ ...DEMO_RULESET.pins[0], width: 0 }], tile: { ...DEMO_RULESET.tile, allowedShapes: ["3 by 1"] } };
    const r = parseRulesetJson(JSON.stringify(bad));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.issues.map((i) => i.path).sort()).toEqual(["pins.0.width", "tile.allowedShapes.0"]);
  });

  it("refuses patterns that do not compile, unknown video modes, repeated pins and broken JSON", () => {
    const r = parseRulesetJson(JSON.stringify({ ...DEMO_RULESET, flipFlopPattern: "(df", forbiddenCellPatterns: ["ok", "[x"], videoMode: "vga-13h", pins: [DEMO_RULESET.pins[0], DEMO_RULESET.pins[0]] }));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.issues.map((i) => i.path).sort()).toEqual(["flipFlopPattern", "forbiddenCellPatterns.1", "pins.1.name", "videoMode"]);
    const j = parseRulesetJson("{ not json");
    expect(!j.ok && j.errors[0]).toMatch(/not valid JSON/);
  });
});

describe("ruleset through the form", () => {
  it("comes back unchanged when saved without edits, even with byte limits that are not whole MiB", async () => {
    const { rulesetFromForm, rulesetToForm, rulesetFormSchema } = await import("./forms");
    const { rulesetSchema } = await import("~/rules/ruleset");
    const odd = rulesetSchema.parse({ ...DEMO_RULESET, uploadLimits: { ...DEMO_RULESET.uploadLimits, bundleBytes: 1_000_000, layoutBytes: 12_345_678 }, pinLayer: { layer: 5, datatype: 20, edgeToleranceUm: 0.5 }, clock: { frequencyHz: 50_000_000, tolerancePct: 0.1, clocksPerPixel: 2 }, monitor: { lineRateKHz: { min: 31.1, max: 31.6 }, refreshHz: { min: 59.2, max: 60.5 } } });
    const asForm = rulesetToForm(odd);
    // The browser sends strings; Conform coerces them to numbers as the schema says — here by hand.
    const coerced = JSON.parse(JSON.stringify(asForm), (_k, v) => (typeof v === "string" && v !== "" && !Number.isNaN(Number(v)) ? Number(v) : v === "" ? undefined : v));
    coerced.flashCheck.enabled = asForm.flashCheck.enabled === "on";
    coerced.repository.allowed = asForm.repository.allowed === "on";
    coerced.repository.submodules = asForm.repository.submodules === "on";
    coerced.licence = { required: asForm.licence.required === "on", openOnly: asForm.licence.openOnly === "on" };
    coerced.topModule = asForm.topModule;
    coerced.flipFlopPattern = asForm.flipFlopPattern;
    coerced.tile.shapes = asForm.tile.shapes;
    coerced.forbiddenCellPatterns = asForm.forbiddenCellPatterns;
    coerced.pins = asForm.pins.map((p) => ({ ...p, width: Number(p.width) }));
    const parsed = rulesetFormSchema.parse(coerced);
    expect(rulesetSchema.parse(rulesetFromForm(parsed))).toEqual(odd);
    // all four window fields blank: the mode's own window
    expect(rulesetFromForm({ ...parsed, monitor: {} }).monitor).toBeNull();
  });
});

describe("a ruleset no design could pass", () => {
  it("is refused on import with the clock named: a 50 MHz board at one clock a pixel draws 62.5 kHz lines", () => {
    const r = parseRulesetJson(JSON.stringify({ ...DEMO_RULESET, clock: { frequencyHz: 50_000_000 } }));
    expect(!r.ok && r.issues).toEqual([{ path: "clock", message: expect.stringMatching(/62\.500 kHz, outside the monitor's 31–32 kHz/) }]);
    expect(parseRulesetJson(JSON.stringify({ ...DEMO_RULESET, clock: { frequencyHz: 50_000_000, clocksPerPixel: 2 } })).ok).toBe(true);
  });
});

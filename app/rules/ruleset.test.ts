import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { validateRuleset } from "~/competitions/ruleset-io";
import { DEFAULT_PIN_LAYER, DEFAULT_TILE, DEMO_PINS, DEMO_RULESET, legacyShapeName, parseRuleset, RULESET_VERSION, upgradeRuleset } from "./ruleset";

/** A ruleset as version 1 stored it (every field written out, shapes as "CxR"). */
const V1 = {
  version: 1,
  topModule: "gc_entry",
  pins: DEMO_PINS,
  tile: { widthUm: 160, heightUm: 100, maxTiles: 3, allowedShapes: ["1x1", "2x1", "1x2", "3x1", "1x3", "2x2"] },
  pinLayer: { layer: 70, datatype: null, edgeToleranceUm: 1 },
};

describe("ruleset defaults and versions", () => {
  it("defaults to Gatecrash's own tile, shape names and pin layer", () => {
    expect(DEMO_RULESET.version).toBe(2);
    expect(DEMO_RULESET.tile).toEqual({
      widthUm: 180,
      heightUm: 120,
      maxTiles: 2,
      allowedShapes: [
        { name: "single", cols: 1, rows: 1 },
        { name: "wide", cols: 2, rows: 1 },
        { name: "tall", cols: 1, rows: 2 },
      ],
    });
    expect(DEMO_RULESET.pinLayer).toEqual({ layer: 201, datatype: null, edgeToleranceUm: 1 });
    // One tile is 0.0216 mm², inside the 0.02–0.04 mm² of the product brief (1 mm² = 10^6 µm², SI).
    expect((DEFAULT_TILE.widthUm * DEFAULT_TILE.heightUm) / 1e6).toBeCloseTo(0.0216, 6);
  });

  it("reads a version 1 ruleset: every stored value kept, shapes given names, version raised", () => {
    const r = parseRuleset(V1);
    expect(r.version).toBe(RULESET_VERSION);
    expect(r.tile.widthUm).toBe(160);
    expect(r.tile.heightUm).toBe(100);
    expect(r.pinLayer.layer).toBe(70);
    expect(r.tile.allowedShapes).toEqual([
      { name: "single", cols: 1, rows: 1 },
      { name: "wide", cols: 2, rows: 1 },
      { name: "tall", cols: 1, rows: 2 },
      { name: "wide-3", cols: 3, rows: 1 },
      { name: "tall-3", cols: 1, rows: 3 },
      { name: "block-2-by-2", cols: 2, rows: 2 },
    ]);
    // Upgrading twice changes nothing; a version 2 ruleset passes through untouched.
    expect(parseRuleset(upgradeRuleset(upgradeRuleset(V1)))).toEqual(r);
    expect(upgradeRuleset(DEMO_RULESET)).toBe(DEMO_RULESET);
    // A ruleset without a version is taken as version 1, as before versions were written.
    const { version: _v, ...unversioned } = V1;
    expect(parseRuleset(unversioned).tile.allowedShapes[0].name).toBe("single");
  });

  it("refuses what it cannot read, naming the field", () => {
    const bad = validateRuleset({ ...V1, tile: { ...V1.tile, allowedShapes: ["3 by 1"] } });
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.issues.map((i) => i.path)).toEqual(["tile.allowedShapes.0"]);
    const twice = validateRuleset({ ...DEMO_RULESET, tile: { ...DEMO_RULESET.tile, allowedShapes: [{ name: "a", cols: 1, rows: 1 }, { name: "a", cols: 2, rows: 1 }] } });
    expect(twice.ok).toBe(false);
    expect(legacyShapeName(1, 1)).toBe("single");
  });

  it("ships an example ruleset for an organizer's own shuttle that imports cleanly and sets every one of these values", () => {
    const text = readFileSync("public/rulesets/example-own-shuttle.json", "utf8");
    const r = validateRuleset(JSON.parse(text));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.ruleset.tile.widthUm).not.toBe(DEFAULT_TILE.widthUm);
    expect(r.ruleset.tile.heightUm).not.toBe(DEFAULT_TILE.heightUm);
    expect(r.ruleset.pinLayer.layer).not.toBe(DEFAULT_PIN_LAYER.layer);
    expect(r.ruleset.tile.allowedShapes.map((s) => s.name)).toEqual(["berth", "double-berth", "dock"]);
    expect(r.ruleset.version).toBe(RULESET_VERSION);
  });
});

import { describe, expect, it } from "vitest";
import { DEMO_RULESET } from "~/rules/ruleset";
import { MIN_PART_BYTES, partPlan, safeFilename, sizeProblem } from "./parts";

describe("partPlan", () => {
  it("uses 5 MiB parts, one part for small and empty files", () => {
    expect(partPlan(0)).toEqual({ partSize: MIN_PART_BYTES, partCount: 1 });
    expect(partPlan(10)).toEqual({ partSize: MIN_PART_BYTES, partCount: 1 });
    expect(partPlan(MIN_PART_BYTES)).toEqual({ partSize: MIN_PART_BYTES, partCount: 1 });
    expect(partPlan(MIN_PART_BYTES + 1)).toEqual({ partSize: MIN_PART_BYTES, partCount: 2 });
  });
  it("grows the part size so no file needs more than 10,000 parts", () => {
    const p = partPlan(100 * 1024 * 1024 * 1024);
    expect(p.partCount).toBeLessThanOrEqual(10_000);
    expect(p.partSize * p.partCount).toBeGreaterThanOrEqual(100 * 1024 * 1024 * 1024);
  });
});

describe("sizeProblem", () => {
  it("holds the size against the ruleset's limit for the kind", () => {
    const limit = DEMO_RULESET.uploadLimits.bundleBytes;
    expect(sizeProblem("bundle", "a.zip", limit, DEMO_RULESET, "claimed")).toBeNull();
    expect(sizeProblem("bundle", "a.zip", limit + 1, DEMO_RULESET, "claimed")).toMatch(/at most 8.0 MiB/);
    expect(sizeProblem("video", "a.webm", limit + 1, DEMO_RULESET, "stored")).toBeNull();
    expect(sizeProblem("still", "a.png", DEMO_RULESET.uploadLimits.stillBytes + 1, DEMO_RULESET, "stored")).toMatch(/as stored/);
    expect(sizeProblem("layout", "a.gds", 0, DEMO_RULESET, "claimed")).toMatch(/empty/);
  });
});

describe("safeFilename", () => {
  it("drops folders and odd characters", () => {
    expect(safeFilename("../../etc/passwd")).toBe("passwd");
    expect(safeFilename("C:\\demo\\my design (v2).zip")).toBe("my_design_v2_.zip");
    expect(safeFilename("...")).toBe("file");
  });
});

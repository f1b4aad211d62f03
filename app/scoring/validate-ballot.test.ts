import { describe, expect, it } from "vitest";
import { sortBallots, validateBallot } from "./validate-ballot";

const entries = ["glow", "tide", "ember"];
const codes = (check: { ok: boolean; problems?: { code: string }[] }) => (check.ok ? [] : check.problems!.map((p) => p.code));

describe("validateBallot: points", () => {
  it("accepts 0–5 whole points for known entries and returns a clean copy", () => {
    const check = validateBallot("points", { points: { glow: 0, tide: 5 } }, entries);
    expect(check).toEqual({ ok: true, ballot: { points: { glow: 0, tide: 5 } } });
  });

  it("names unknown entries, out-of-range and fractional points", () => {
    const check = validateBallot("points", { points: { glow: 6, tide: -1, ember: 2.5, nova: 3 } }, entries);
    expect(codes(check)).toEqual(["points-out-of-range", "points-out-of-range", "points-not-integer", "unknown-candidate"]);
    if (!check.ok) expect(check.problems[3].message).toBe('"nova" is not an entry of this competition');
  });

  it("rejects empty and malformed ballots without throwing", () => {
    expect(codes(validateBallot("points", { points: {} }, entries))).toEqual(["empty"]);
    expect(codes(validateBallot("points", null, entries))).toEqual(["malformed"]);
    expect(codes(validateBallot("points", { points: [1, 2] }, entries))).toEqual(["malformed"]);
    expect(codes(validateBallot("points", { points: { glow: "5" } }, entries))).toEqual(["points-not-integer"]);
  });
});

describe("validateBallot: ranked", () => {
  it("accepts a partial ranking of known entries", () => {
    expect(validateBallot("ranked", { ranking: ["tide", "glow"] }, entries)).toEqual({ ok: true, ballot: { ranking: ["tide", "glow"] } });
  });

  it("names duplicates and unknown entries", () => {
    const check = validateBallot("ranked", { ranking: ["tide", "nova", "tide"] }, entries);
    expect(codes(check)).toEqual(["unknown-candidate", "duplicate-candidate"]);
    if (!check.ok) expect(check.problems[1].message).toBe('"tide" is ranked more than once');
  });

  it("rejects empty, non-string and malformed rankings", () => {
    expect(codes(validateBallot("ranked", { ranking: [] }, entries))).toEqual(["empty"]);
    expect(codes(validateBallot("ranked", { ranking: ["glow", 7] }, entries))).toEqual(["malformed"]);
    expect(codes(validateBallot("ranked", "glow>tide", entries))).toEqual(["malformed"]);
  });
});

describe("sortBallots", () => {
  it("sets invalid ballots aside with their index and reasons", () => {
    const sorted = sortBallots("ranked", [{ ranking: ["glow"] }, { ranking: ["glow", "glow"] }, { ranking: ["tide"] }], entries);
    expect(sorted.valid).toHaveLength(2);
    expect(sorted.rejected.map((r) => [r.index, r.problems[0].code])).toEqual([[1, "duplicate-candidate"]]);
  });

  it("takes the entries from the ballots when no list is given", () => {
    expect(sortBallots("points", [{ points: { b: 1 } }, { points: { a: 2, b: 3 } }]).candidates).toEqual(["b", "a"]);
  });
});

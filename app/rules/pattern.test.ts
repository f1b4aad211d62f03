import { describe, expect, it } from "vitest";
import { compileCellPattern, patternProblem } from "./ruleset";

/**
 * Organizer-written cell-name patterns run against entrant-chosen cell names, so they are compiled with RE2's
 * linear-time engine (re2js, the JavaScript port of RE2): a pattern with nested quantifiers cannot take
 * exponential time. "(a+)+$" on "aaa…a!" is the classic catastrophic-backtracking case (OWASP, "Regular
 * expression Denial of Service - ReDoS"): a backtracking engine needs about 2^n steps for n letters, so n = 40
 * would not finish in a backtracking engine within a day.
 */
describe("cell-name patterns", () => {
  it("match a ReDoS input without backtracking", () => {
    const p = compileCellPattern("(a+)+$");
    expect(p.test("a".repeat(40) + "!")).toBe(false);
    expect(p.test("a".repeat(40))).toBe(true);
    const nested = compileCellPattern("^(\\w+\\s?)*$");
    expect(nested.test("x".repeat(5000) + "!")).toBe(false);
  });

  it("are case-insensitive and search anywhere in the name, as before", () => {
    const ff = compileCellPattern("(?:^|_)(?:df|dff|sdff|edff)");
    expect(ff.test("gc_DFF_X1")).toBe(true);
    expect(ff.test("sky_sdff_1")).toBe(true);
    expect(ff.test("buffer")).toBe(false);
    expect(compileCellPattern("ram\\d").test("my_RAM8")).toBe(true);
  });

  it("name what a pattern uses that a linear-time engine cannot do, or that does not compile", () => {
    expect(patternProblem("(?=dff)")).toMatch(/lookahead|not supported|invalid/i);
    expect(patternProblem("(a)\\1")).toMatch(/back|not supported|invalid/i);
    expect(patternProblem("([")).toMatch(/missing|invalid/i);
    expect(patternProblem("(?:^|_)dff")).toBeNull();
  });
});

import { describe, expect, it } from "vitest";
import { CODE_ALPHABET, codeHolderToken, generateCode, normaliseCode, readCodeHolderToken, tokenMatches } from "./codes";

describe("vote codes", () => {
  it("are two groups of four from the look-alike-free alphabet", () => {
    for (let i = 0; i < 200; i++) {
      const c = generateCode();
      expect(c).toMatch(/^[A-Z2-9]{4}-[A-Z2-9]{4}$/);
      for (const ch of c.replace("-", "")) expect(CODE_ALPHABET).toContain(ch);
      expect(c).not.toMatch(/[01OIL]/);
    }
  });

  it("do not repeat in a large batch", () => {
    const set = new Set(Array.from({ length: 5000 }, generateCode));
    expect(set.size).toBe(5000);
  });

  it("accept what people type: lower case, spaces, dashes", () => {
    expect(normaliseCode(" kx7m q2hd ")).toBe("KX7M-Q2HD");
    expect(normaliseCode("KX7M-Q2HD")).toBe("KX7M-Q2HD");
    expect(normaliseCode("KX7M-Q2H")).toBeNull();
    expect(normaliseCode("KX7M-Q2H0")).toBeNull(); // 0 is not in the alphabet
  });

  it("holder tokens verify only for the same code, compo and redemption moment", () => {
    const at = new Date("2027-05-01T20:00:00Z");
    const t = codeHolderToken("s".repeat(32), "code-1", "compo-a", at);
    expect(readCodeHolderToken(t)?.codeId).toBe("code-1");
    expect(tokenMatches("s".repeat(32), t, "code-1", "compo-a", at)).toBe(true);
    expect(tokenMatches("s".repeat(32), t, "code-1", "compo-b", at)).toBe(false);
    expect(tokenMatches("s".repeat(32), t, "code-1", "compo-a", new Date(at.getTime() + 1))).toBe(false);
    expect(tokenMatches("t".repeat(32), t, "code-1", "compo-a", at)).toBe(false);
  });
});

import { describe, expect, it } from "vitest";
import { acceptanceWindow, expectedRates, windowProblem } from "./monitor";
import { DEMO_RULESET, parseRuleset } from "./ruleset";

const withClock = (clock: Partial<typeof DEMO_RULESET.clock>, extra: object = {}) =>
  parseRuleset({ ...DEMO_RULESET, ...extra, clock: { ...DEMO_RULESET.clock, ...clock } });

describe("the monitor acceptance window", () => {
  it("defaults to the mode's window (common practice, no published source: 31–32 kHz, 59–61 Hz for 640×480 @ 60)", () => {
    expect(acceptanceWindow(DEMO_RULESET)).toEqual({ lineRateKHz: { min: 31, max: 32 }, refreshHz: { min: 59, max: 61 }, source: "mode" });
  });
  it("finds a 25 MHz, a 25.175 MHz and a 50 MHz ÷ 2 board usable, at ±0.5 %", () => {
    expect(windowProblem(withClock({ frequencyHz: 25_000_000 }))).toBeNull();
    expect(windowProblem(withClock({ frequencyHz: 25_175_000 }))).toBeNull();
    expect(windowProblem(withClock({ frequencyHz: 50_000_000, clocksPerPixel: 2 }))).toBeNull();
    expect(expectedRates(withClock({ frequencyHz: 25_000_000 })).nominal.refreshHz).toBeCloseTo(59.524, 3); // 25e6 / (800 × 525)
  });
  it("tells the organizer when no design could pass: 50 MHz without the divider, or a window the mode misses", () => {
    expect(windowProblem(withClock({ frequencyHz: 50_000_000 }))).toMatch(/62\.500 kHz, outside the monitor's 31–32 kHz/);
    const narrow = withClock({ frequencyHz: 25_000_000 }, { monitor: { lineRateKHz: { min: 31, max: 32 }, refreshHz: { min: 59.6, max: 61 } } });
    expect(windowProblem(narrow)).toMatch(/59\.524 frames a second, outside the monitor's 59\.6–61 Hz/);
  });
  it("refuses a window whose lowest value is above its highest", () => {
    expect(() => withClock({}, { monitor: { lineRateKHz: { min: 33, max: 31 }, refreshHz: { min: 59, max: 61 } } })).toThrow(/lowest value/);
  });
});

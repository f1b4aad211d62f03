import { describe, expect, it } from "vitest";
import { DEMO_RULESET } from "~/rules/ruleset";
import { captureSpan, FlashAnalyzer, flashFigures, flashGrid, relativeLuminance, srgbToLinear, chromaticity, type FlashReport, type FlashViewing } from "./flash";
import type { RgbImage } from "./frames";

// Check values: WCAG 2.2 definition of relative luminance (L = 0.2126 R + 0.7152 G + 0.0722 B on
// linearised sRGB, IEC 61966-2-1 transfer function).
describe("relative luminance (WCAG 2.2 definition)", () => {
  it("is 1 for white and 0 for black", () => {
    expect(relativeLuminance(255, 255, 255)).toBeCloseTo(1, 10);
    expect(relativeLuminance(0, 0, 0)).toBe(0);
  });
  it("is the red coefficient 0.2126 for pure red", () => {
    expect(relativeLuminance(255, 0, 0)).toBeCloseTo(0.2126, 10);
  });
  it("is about 0.2159 for #808080", () => {
    // ((128/255 + 0.055) / 1.055) ^ 2.4 = 0.21586 (IEC 61966-2-1 transfer)
    expect(relativeLuminance(128, 128, 128)).toBeCloseTo(0.2159, 4);
  });
  it("uses the linear segment below the threshold", () => {
    expect(srgbToLinear(10 / 255)).toBeCloseTo(10 / 255 / 12.92, 12);
  });
  it("puts pure sRGB red at its IEC 61966-2-1 primary in CIE 1976 u'v'", () => {
    // red primary x = 0.64, y = 0.33 → u' = 4x/(-2x+12y+3) = 0.4507, v' = 9y/(-2x+12y+3) = 0.5229
    const [u, v] = chromaticity(1, 0, 0);
    expect(u).toBeCloseTo(0.4507, 3);
    expect(v).toBeCloseTo(0.5229, 3);
  });
});

const W = 640, H = 480, FPS = 60;

function frame(fill: (x: number, y: number) => [number, number, number]): RgbImage {
  const data = new Uint8Array(W * H * 3);
  for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) data.set(fill(x, y), (y * W + x) * 3);
  return { width: W, height: H, data };
}

/** `seconds` of frames alternating between two images at `flashesPerSecond` full cycles a second. */
function run(a: RgbImage, b: RgbImage, flashesPerSecond: number, seconds = 2, viewing: FlashViewing = "desk"): FlashReport {
  const analyzer = new FlashAnalyzer(W / 4, H / 4, FPS, viewing);
  const ga = flashGrid(a, 4), gb = flashGrid(b, 4);
  for (let i = 0; i < FPS * seconds; i++) {
    const phase = Math.floor((i * 2 * flashesPerSecond) / FPS) % 2;
    analyzer.push(phase ? gb : ga);
  }
  return analyzer.report();
}

const black = frame(() => [0, 0, 0]);
const white = frame(() => [255, 255, 255]);

describe("general flash threshold (WCAG 2.2 SC 2.3.1)", () => {
  it("passes three full-screen flashes a second", () => {
    const r = run(black, white, 3);
    expect(r.general.worstFlashes).toBe(3);
    expect(r.general.passes).toBe(true);
    expect(r.passes).toBe(true);
  });
  it("fails four full-screen flashes a second and says where", () => {
    const r = run(black, white, 4);
    expect(r.general.worstFlashes).toBe(4);
    expect(r.general.passes).toBe(false);
    expect(r.general.region).not.toBeNull();
    expect(r.general.worstSecondStartS).not.toBeNull();
  });
  it("passes four flashes a second on an area below 25 % of a 10° field", () => {
    // field at 640×480: 341/1024·640 × 256/768·480 = 213 × 160 px; 25 % = 8 525 px; an 80×80 square is 6 400 px
    const square = frame((x, y) => (x >= 300 && x < 380 && y >= 200 && y < 280 ? [255, 255, 255] : [0, 0, 0]));
    const r = run(black, square, 4);
    expect(r.general.peakFieldShare).toBeGreaterThan(0.15);
    expect(r.general.peakFieldShare).toBeLessThan(0.25);
    expect(r.general.passes).toBe(true);
  });
  it("fails the same rate once the square covers more than 25 % of the field", () => {
    const square = frame((x, y) => (x >= 300 && x < 400 && y >= 200 && y < 300 ? [255, 255, 255] : [0, 0, 0]));
    expect(run(black, square, 4).general.passes).toBe(false);
  });
  it("ignores changes between two bright states (darker image not below 0.80)", () => {
    const light = frame(() => [235, 235, 235]); // L ≈ 0.83
    expect(run(light, white, 5).general.worstFlashes).toBe(0);
  });
  it("ignores changes smaller than 10 % of maximum luminance", () => {
    const g1 = frame(() => [100, 100, 100]), g2 = frame(() => [110, 110, 110]); // L 0.127 → 0.156
    expect(run(g1, g2, 5).general.worstFlashes).toBe(0);
  });
});

describe("red flash threshold (WCAG 2.2 definition, saturated red per ISO 9241-391 note)", () => {
  it("fails saturated red alternating with a grey of the same luminance, as a red flash only", () => {
    const red = frame(() => [255, 0, 0]); // L = 0.2126
    const grey = frame(() => [127, 127, 127]); // L = 0.2122: no general flash
    const r = run(grey, red, 4);
    expect(r.general.worstFlashes).toBe(0);
    expect(r.red.worstFlashes).toBe(4);
    expect(r.red.passes).toBe(false);
    expect(r.passes).toBe(false);
  });
  it("passes three red flashes a second", () => {
    const red = frame(() => [255, 0, 0]);
    const grey = frame(() => [127, 127, 127]);
    expect(run(grey, red, 3).red.passes).toBe(true);
  });
  it("does not count a change between two non-red colours", () => {
    const green = frame(() => [0, 160, 0]);
    const blue = frame(() => [0, 0, 255]);
    expect(run(green, blue, 5).red.worstFlashes).toBe(0);
  });
});

describe("viewing in a hall: the area exemption does not apply", () => {
  // WCAG 2.2's 341 × 256 px at 1024 × 768 estimates a 10° field at a desk; in a hall the exemption is dropped
  const square = frame((x, y) => (x >= 300 && x < 380 && y >= 200 && y < 280 ? [255, 255, 255] : [0, 0, 0]));
  it("fails a small square flashing four times a second that desk viewing lets pass", () => {
    expect(run(black, square, 4, 2, "desk").general.passes).toBe(true);
    const hall = run(black, square, 4, 2, "hall");
    expect(hall.viewing).toBe("hall");
    expect(hall.general.worstFlashes).toBe(4);
    expect(hall.general.passes).toBe(false);
    // the worst place is inside the square
    expect(hall.general.region!.x * W).toBeGreaterThanOrEqual(300);
    expect(hall.general.region!.x * W).toBeLessThan(380);
  });
  it("still passes three flashes a second, and counts per place: stripes scrolling past are not a flash a frame", () => {
    expect(run(black, square, 3, 2, "hall").general.passes).toBe(true);
    // 32-px stripes moving 2 px a frame: every frame changes somewhere, but each place changes every 16 frames
    const analyzer = new FlashAnalyzer(W / 4, H / 4, FPS, "hall");
    for (let i = 0; i < 120; i++) analyzer.push(flashGrid(frame((x) => ((Math.floor((x + 2 * i) / 32) % 2) ? [255, 255, 255] : [0, 0, 0])), 4));
    const r = analyzer.report();
    expect(r.general.worstFlashes).toBeLessThanOrEqual(2);
    expect(r.general.passes).toBe(true);
  });
});

describe("flash figures name the span they cover", () => {
  const report = run(black, white, 2, 2);
  it("says the whole loop when the demo looped, and the first seconds when it did not", () => {
    const looped = flashFigures(report, DEMO_RULESET, captureSpan(2.2, { detected: true, firstLoopFrame: 0, periodSeconds: 1.2 }, 60, null));
    expect(looped).toMatchObject({ verdict: "pass", wholeDemo: true, span: "the whole 1.2 s loop", worstSecondFlashes: 2 });
    expect(looped.statement).toContain("in the whole 1.2 s loop");
    expect(looped.source).toMatch(/2\.3\.1/);
    const first = flashFigures(report, DEMO_RULESET, captureSpan(180, { detected: false, firstLoopFrame: 0, periodSeconds: null }, 60, "the demo did not loop within 180 s"));
    expect(first).toMatchObject({ wholeDemo: false, span: "the first 180 s (the demo did not loop within 180 s)" });
  });
  it("claims nothing under one second", () => {
    const f = flashFigures(report, DEMO_RULESET, captureSpan(0.5, { detected: false, firstLoopFrame: 0, periodSeconds: null }, 60, null));
    expect(f).toMatchObject({ verdict: "unmeasured", worstSecondFlashes: null, worstSecondAt: null });
    expect(f.statement).toMatch(/not measured/);
  });
  it("turns a failure into a block when the ruleset says so", () => {
    const fast = run(black, white, 5, 2);
    const ruleset = { ...DEMO_RULESET, flashCheck: { ...DEMO_RULESET.flashCheck, action: "block" as const } };
    const f = flashFigures(fast, ruleset, captureSpan(2, { detected: false, firstLoopFrame: 0, periodSeconds: null }, 60, null));
    expect(f.verdict).toBe("fail");
    expect(f.worstSecondFlashes).toBe(5);
    expect(f.statement).toMatch(/FLAGGED — 5 flashes in one second/);
  });
});

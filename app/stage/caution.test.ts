import { describe, expect, it } from "vitest";
import { FlashAnalyzer, flashGrid, GENERAL_CHANGE, relativeLuminance } from "~/simulation/flash";
import type { RgbImage } from "~/simulation/frames";

/**
 * Why stage mode does not dim: WCAG 2.2, SC 2.3.1 and its definition of "general flash and red flash thresholds"
 * (a pair of opposing changes in relative luminance of 10 % or more of the maximum, the darker image below 0.80).
 * CSS `opacity` over black multiplies the stored (gamma-encoded) sRGB values (CSS Color 4 / Compositing 1:
 * simple alpha compositing on the stored values), so white at 40 % becomes 102/255.
 */
function solid(v: number): RgbImage {
  const data = new Uint8Array(640 * 480 * 3).fill(v);
  return { width: 640, height: 480, data };
}

function analyse(frames: RgbImage[], fps: number) {
  const a = new FlashAnalyzer(640 / 16, 480 / 16, fps);
  for (const f of frames) a.push(flashGrid(f, 16));
  return a.report();
}

describe("dimming a flagged entry does not make it safe", () => {
  it("a black↔white flicker shown at 40 % opacity still exceeds the general-flash luminance change", () => {
    const dimmedWhite = Math.round(0.4 * 255); // 102
    // relative luminance of sRGB 102/255: ((0.4 + 0.055) / 1.055)^2.4 ≈ 0.133 (IEC 61966-2-1 transfer function)
    expect(relativeLuminance(dimmedWhite, dimmedWhite, dimmedWhite)).toBeCloseTo(0.1329, 3);
    expect(relativeLuminance(dimmedWhite, dimmedWhite, dimmedWhite) - relativeLuminance(0, 0, 0)).toBeGreaterThan(GENERAL_CHANGE);

    // 10 flashes a second at 60 frames a second, full screen: 3 frames white, 3 black.
    const flicker = (hi: number) => Array.from({ length: 120 }, (_, i) => solid(Math.floor(i / 3) % 2 === 0 ? hi : 0));
    const full = analyse(flicker(255), 60);
    const dimmed = analyse(flicker(dimmedWhite), 60);
    expect(full.general.passes).toBe(false);
    expect(dimmed.general.passes).toBe(false);
    expect(dimmed.general.worstFlashes).toBe(full.general.worstFlashes);
    expect(dimmed.general.worstFlashes).toBeGreaterThan(3);
  });

  it("only a dimming down to under a 10 % luminance step would pass, which leaves nothing to watch", () => {
    // sRGB 89/255 has relative luminance ≈ 0.0999 (below the 0.10 change): the flicker then passes, at about a third of full brightness.
    expect(relativeLuminance(89, 89, 89)).toBeLessThan(GENERAL_CHANGE);
    const barely = analyse(Array.from({ length: 120 }, (_, i) => solid(Math.floor(i / 3) % 2 === 0 ? 89 : 0)), 60);
    expect(barely.general.passes).toBe(true);
  });
});

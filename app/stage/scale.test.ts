import { describe, expect, it } from "vitest";
import { stageFit, stageFitCss } from "./scale";

// Screen sizes: 1920×1080 and 3840×2160 are the HD and UHD image formats of ITU-R BT.709 and BT.2020;
// 1024×768 and 1280×1024 are VESA DMT modes (XGA, SXGA); 1280×720 is BT.709's other format.
// The expected numbers are worked by hand from k = floor(min(W/640, H/480)), the picture k·640 × k·480, centred.
describe("stageFit: whole-pixel scaling of a 640×480 picture, letterboxed", () => {
  it.each([
    // W, H, k, picture width, height, left bar, top bar
    [1920, 1080, 2, 1280, 960, 320, 60], // min(3, 2.25) → 2: bars left/right 320 and top/bottom 60
    [3840, 2160, 4, 2560, 1920, 640, 120], // min(6, 4.5) → 4
    [1280, 720, 1, 640, 480, 320, 120], // min(2, 1.5) → 1
    [1024, 768, 1, 640, 480, 192, 144], // 1.6 → 1: never 1.6 (that would blur or drop pixels)
    [1280, 1024, 2, 1280, 960, 0, 32], // min(2, 2.13) → 2: width exactly filled, letterbox only
    [640, 480, 1, 640, 480, 0, 0],
    [1919, 1440, 2, 1280, 960, 319, 240], // one pixel short of 3× in width: stays 2 (odd bar rounds down)
    [1920, 1440, 3, 1920, 1440, 0, 0],
  ])("%i×%i → ×%i", (w, h, k, width, height, left, top) => {
    const fit = stageFit(w, h);
    expect(fit).toEqual({ scale: k, whole: true, width, height, left, top });
    expect(Number.isInteger(fit.scale)).toBe(true);
    // the bars on both sides together with the picture fill the screen exactly
    expect(width + 2 * left).toBeLessThanOrEqual(w);
    expect(w - width - 2 * left).toBeLessThanOrEqual(1);
  });

  it("shrinks by a fraction, and says so, only when the screen is smaller than the picture", () => {
    expect(stageFit(320, 480)).toEqual({ scale: 0.5, whole: false, width: 320, height: 240, left: 0, top: 120 });
    expect(stageFit(639, 480).whole).toBe(false);
  });

  it("fits another picture size by the same rule (a crew video of 800×600)", () => {
    expect(stageFit(1920, 1080, { width: 800, height: 600 })).toEqual({ scale: 1, whole: true, width: 800, height: 600, left: 560, top: 240 });
  });

  it("gives an empty fit for an empty screen instead of dividing by zero", () => {
    expect(stageFit(0, 0)).toMatchObject({ scale: 0, width: 0, height: 0 });
  });
});

describe("stageFitCss: whole pixels of the screen, given in CSS pixels", () => {
  it("at 125 % desktop scaling a 1920×1080 screen is 1536×864 CSS pixels and still gets ×2 screen pixels", () => {
    // 1920 / 1.25 = 1536, 1080 / 1.25 = 864; ×2 on the screen is 1280×960 screen pixels = 1024×768 CSS pixels
    expect(stageFitCss(1536, 864, 1.25)).toEqual({ scale: 2, whole: true, width: 1024, height: 768, left: 256, top: 48 });
  });
  it("at 200 % (a HiDPI laptop, 1440×900 CSS = 2880×1800) the screen gets ×3", () => {
    // min(2880/640, 1800/480) = min(4.5, 3.75) → 3: 1920×1440 screen pixels = 960×720 CSS
    expect(stageFitCss(1440, 900, 2)).toEqual({ scale: 3, whole: true, width: 960, height: 720, left: 240, top: 90 });
  });
  it("treats a missing ratio as 1", () => {
    expect(stageFitCss(1920, 1080, Number.NaN)).toEqual(stageFit(1920, 1080));
  });
});

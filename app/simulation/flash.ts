import type { Finding } from "~/rules/findings";
import type { Ruleset } from "~/rules/ruleset";
import type { RgbImage } from "./frames";

/**
 * Flash safety per WCAG 2.2 success criterion 2.3.1 (Three Flashes or Below Threshold) and the WCAG 2.2
 * definitions of "relative luminance" and "general flash and red flash thresholds":
 * - general flash: a pair of opposing changes in relative luminance of 10 % or more of the maximum
 *   relative luminance (1.0) where the relative luminance of the darker image is below 0.80;
 * - red flash: a pair of opposing transitions involving a saturated red, which WCAG 2.2's note defines as
 *   "one transition is either to or from a state with a value R/(R + G + B) that is greater than or equal
 *   to 0.8, and the difference between states is more than 0.2 (unitless) in the CIE 1976 UCS
 *   chromaticity diagram" (citing ISO 9241-391);
 * - content passes if no more than three flashes happen in any one second, or the flashing area is no
 *   more than 25 % of any 10° visual field, which WCAG estimates as a 341 × 256 px rectangle on a
 *   1024 × 768 screen. We take the frame as that screen, so at 640 × 480 the field is 213 × 160 px.
 *
 * Frames are analysed on a grid of cells (linear-light averages). Choices that the standard leaves open:
 * R/(R+G+B) is taken on the stored (gamma-encoded) values; a black cell has no chromaticity, so it is given
 * the D65 white point's; a transition is counted for a frame when the cells changing in it cover more than
 * 25 % of the worst-placed field window; more than six transitions in a second (over three flashes) fail.
 *
 * Viewing (the ruleset's flashCheck.viewing): the 341 × 256 estimate is for a desk monitor at reading distance.
 * "desk" applies it as above. "hall" — a projector in a hall, where a 10° field is a much smaller share of the
 * screen — drops the area exemption: transitions are counted per cell, so a flash anywhere on the screen counts,
 * whatever its size, when one place flashes more than three times in a second.
 */
export type FlashViewing = "desk" | "hall";

/** sRGB linearisation threshold of IEC 61966-2-1 (WCAG 2.0/2.1 print 0.03928; both agree on every 8-bit value). */
export const LINEARISE_THRESHOLD = 0.04045;

export function srgbToLinear(encoded: number): number {
  return encoded <= LINEARISE_THRESHOLD ? encoded / 12.92 : ((encoded + 0.055) / 1.055) ** 2.4;
}

export function linearToSrgb(linear: number): number {
  return linear <= 0.0031308 ? linear * 12.92 : 1.055 * linear ** (1 / 2.4) - 0.055;
}

const LINEAR_8BIT = Float64Array.from({ length: 256 }, (_, v) => srgbToLinear(v / 255));

/** WCAG relative luminance of an 8-bit sRGB colour: 0.2126 R + 0.7152 G + 0.0722 B on linear values. */
export function relativeLuminance(r: number, g: number, b: number): number {
  return 0.2126 * LINEAR_8BIT[r] + 0.7152 * LINEAR_8BIT[g] + 0.0722 * LINEAR_8BIT[b];
}

// D65 white in CIE 1976 u'v' (from x = 0.3127, y = 0.3290)
const WHITE_U = 0.1978;
const WHITE_V = 0.4683;

/** CIE 1976 UCS u'v' of linear sRGB, via the IEC 61966-2-1 RGB→XYZ matrix. */
export function chromaticity(rl: number, gl: number, bl: number): [number, number] {
  const X = 0.4124 * rl + 0.3576 * gl + 0.1805 * bl;
  const Y = 0.2126 * rl + 0.7152 * gl + 0.0722 * bl;
  const Z = 0.0193 * rl + 0.1192 * gl + 0.9505 * bl;
  const d = X + 15 * Y + 3 * Z;
  if (d < 1e-6) return [WHITE_U, WHITE_V];
  return [(4 * X) / d, (9 * Y) / d];
}

export const GENERAL_CHANGE = 0.1;
export const DARKER_BELOW = 0.8;
export const SATURATED_RED_SHARE = 0.8;
export const RED_CHROMA_CHANGE = 0.2;
export const MAX_TRANSITIONS_PER_SECOND = 6; // three flashes, each a pair of opposing changes
export const FIELD_FRACTION_W = 341 / 1024;
export const FIELD_FRACTION_H = 256 / 768;
export const FIELD_AREA_SHARE = 0.25;
/** hall viewing keeps this many transitions per cell: more than a second holds at 60 frames a second */
const HALL_RING = 64;

/** One frame reduced to cells of linear RGB (r, g, b per cell). */
export interface FlashGrid {
  width: number;
  height: number;
  linear: Float32Array;
}

export class FlashInputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "FlashInputError";
  }
}

/** Averages an image into cells of `cell`×`cell` pixels, in linear light. */
export function flashGrid(img: RgbImage, cell: number): FlashGrid {
  if (!Number.isInteger(cell) || cell < 1 || img.width % cell || img.height % cell) {
    throw new FlashInputError(`cannot divide ${img.width}×${img.height} into ${cell}-pixel cells`);
  }
  const w = img.width / cell, h = img.height / cell;
  const linear = new Float32Array(w * h * 3);
  const area = cell * cell;
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      let r = 0, g = 0, b = 0;
      for (let dy = 0; dy < cell; dy++) {
        let i = ((y * cell + dy) * img.width + x * cell) * 3;
        for (let dx = 0; dx < cell; dx++, i += 3) {
          r += LINEAR_8BIT[img.data[i]];
          g += LINEAR_8BIT[img.data[i + 1]];
          b += LINEAR_8BIT[img.data[i + 2]];
        }
      }
      const o = (y * w + x) * 3;
      linear[o] = r / area;
      linear[o + 1] = g / area;
      linear[o + 2] = b / area;
    }
  }
  return { width: w, height: h, linear };
}

export interface FlashRegion {
  /** in fractions of the frame, 0..1 */
  x: number;
  y: number;
  width: number;
  height: number;
}

export interface FlashKindReport {
  /** flashes (pairs of opposing transitions over the area threshold) in the worst one-second window */
  worstFlashes: number;
  worstSecondStartS: number | null;
  /** the field window with the largest changing area in the worst second */
  region: FlashRegion | null;
  /** largest share of a field window changing in any one frame, 0..1 */
  peakFieldShare: number;
  passes: boolean;
}

export interface FlashReport {
  framesAnalysed: number;
  fps: number;
  viewing: FlashViewing;
  grid: { width: number; height: number };
  field: { width: number; height: number; areaShare: number };
  general: FlashKindReport;
  red: FlashKindReport;
  passes: boolean;
}

interface FrameEvent {
  frame: number;
  share: number;
  region: FlashRegion;
}

/** Largest sum of `mask` over any fw×fh window, via a summed-area table (`sat`: (w+1)×(h+1), reused). */
function worstWindow(mask: Uint8Array, w: number, h: number, fw: number, fh: number, sat: Int32Array): { sum: number; x: number; y: number } {
  for (let y = 0; y < h; y++) {
    let row = 0;
    for (let x = 0; x < w; x++) {
      row += mask[y * w + x];
      sat[(y + 1) * (w + 1) + x + 1] = sat[y * (w + 1) + x + 1] + row;
    }
  }
  let best = { sum: 0, x: 0, y: 0 };
  for (let y = 0; y + fh <= h; y++) {
    for (let x = 0; x + fw <= w; x++) {
      const s = sat[(y + fh) * (w + 1) + x + fw] - sat[y * (w + 1) + x + fw] - sat[(y + fh) * (w + 1) + x] + sat[y * (w + 1) + x];
      if (s > best.sum) best = { sum: s, x, y };
    }
  }
  return best;
}

/** Whether a cell of linear RGB is a saturated red: R/(R+G+B) ≥ 0.8 on encoded values (see above). */
function saturatedRed(rl: number, gl: number, bl: number): boolean {
  // encoding is monotonic: unless red is the largest channel, R/(R+G+B) is at most one half
  if (rl <= gl || rl <= bl) return false;
  const re = linearToSrgb(rl), ge = linearToSrgb(gl), be = linearToSrgb(bl);
  const sum = re + ge + be;
  return sum > 1e-3 && re / sum >= SATURATED_RED_SHARE;
}

/** Streaming analyser: push frames in order, then read the report. */
export class FlashAnalyzer {
  private frame = 0;
  private readonly cells: number;
  private readonly fw: number;
  private readonly fh: number;
  private readonly threshold: number;
  // general flash state per cell: extremes since the last transition and its direction
  private readonly lo: Float32Array;
  private readonly hi: Float32Array;
  private readonly dir: Int8Array;
  // red flash state per cell: chromaticity and saturation at the last transition
  private readonly refU: Float32Array;
  private readonly refV: Float32Array;
  private readonly refRed: Uint8Array;
  private readonly generalMask: Uint8Array;
  private readonly redMask: Uint8Array;
  private readonly generalEvents: FrameEvent[] = [];
  private readonly redEvents: FrameEvent[] = [];
  private readonly sat: Int32Array;
  private peakGeneral = 0;
  private peakRed = 0;
  // hall viewing: the last HALL_RING transition frames of every cell, per kind, and the worst window found
  private readonly hallRing: Int32Array[] = [];
  private readonly hallCount: Int32Array[] = [];
  private readonly hallWorst = [{ count: 0, frame: -1, cell: -1 }, { count: 0, frame: -1, cell: -1 }];

  constructor(readonly width: number, readonly height: number, readonly fps: number, readonly viewing: FlashViewing = "desk") {
    if (!(fps > 0) || !Number.isFinite(fps)) throw new FlashInputError(`frame rate must be positive, not ${fps}`);
    if (width < 3 || height < 3) throw new FlashInputError(`a flash grid of ${width}×${height} cells is too coarse`);
    this.cells = width * height;
    this.fw = Math.max(1, Math.round(width * FIELD_FRACTION_W));
    this.fh = Math.max(1, Math.round(height * FIELD_FRACTION_H));
    this.threshold = FIELD_AREA_SHARE * this.fw * this.fh;
    this.lo = new Float32Array(this.cells);
    this.hi = new Float32Array(this.cells);
    this.dir = new Int8Array(this.cells);
    this.refU = new Float32Array(this.cells);
    this.refV = new Float32Array(this.cells);
    this.refRed = new Uint8Array(this.cells);
    this.generalMask = new Uint8Array(this.cells);
    this.redMask = new Uint8Array(this.cells);
    this.sat = new Int32Array((width + 1) * (height + 1));
    if (viewing === "hall") {
      for (let k = 0; k < 2; k++) {
        this.hallRing.push(new Int32Array(this.cells * HALL_RING));
        this.hallCount.push(new Int32Array(this.cells));
      }
    }
  }

  /** hall viewing: a transition of `kind` (0 general, 1 red) at cell `c`; counts that cell's transitions in the last second. */
  private hallTransition(kind: number, c: number): void {
    const ring = this.hallRing[kind], counts = this.hallCount[kind];
    const n = counts[c];
    const base = c * HALL_RING;
    ring[base + (n % HALL_RING)] = this.frame;
    counts[c] = n + 1;
    let inWindow = 0, earliest = this.frame;
    for (let k = 0; k < Math.min(n + 1, HALL_RING); k++) {
      const f = ring[base + ((n - k + HALL_RING) % HALL_RING)];
      if ((this.frame - f) / this.fps >= 1) break;
      inWindow++;
      earliest = f;
    }
    const worst = this.hallWorst[kind];
    if (inWindow > worst.count) { worst.count = inWindow; worst.frame = earliest; worst.cell = c; }
  }

  push(grid: FlashGrid): void {
    if (grid.width !== this.width || grid.height !== this.height || grid.linear.length !== this.cells * 3) {
      throw new FlashInputError(`expected a ${this.width}×${this.height} grid, got ${grid.width}×${grid.height}`);
    }
    const first = this.frame === 0;
    this.generalMask.fill(0);
    this.redMask.fill(0);
    let generalCount = 0, redCount = 0;
    for (let c = 0; c < this.cells; c++) {
      const rl = grid.linear[c * 3], gl = grid.linear[c * 3 + 1], bl = grid.linear[c * 3 + 2];
      const lum = 0.2126 * rl + 0.7152 * gl + 0.0722 * bl;
      const isRed = saturatedRed(rl, gl, bl) ? 1 : 0;
      if (first) {
        this.lo[c] = this.hi[c] = lum;
        [this.refU[c], this.refV[c]] = chromaticity(rl, gl, bl);
        this.refRed[c] = isRed;
        continue;
      }
      if (lum < this.lo[c]) this.lo[c] = lum;
      if (lum > this.hi[c]) this.hi[c] = lum;
      if (this.dir[c] !== 1 && lum - this.lo[c] >= GENERAL_CHANGE && this.lo[c] < DARKER_BELOW) {
        this.dir[c] = 1; this.lo[c] = this.hi[c] = lum; this.generalMask[c] = 1; generalCount++;
        if (this.hallRing.length) this.hallTransition(0, c);
      } else if (this.dir[c] !== -1 && this.hi[c] - lum >= GENERAL_CHANGE && lum < DARKER_BELOW) {
        this.dir[c] = -1; this.lo[c] = this.hi[c] = lum; this.generalMask[c] = 1; generalCount++;
        if (this.hallRing.length) this.hallTransition(0, c);
      }
      // chromaticity only matters when a saturated red is involved on either side
      if (isRed || this.refRed[c]) {
        const [u, v] = chromaticity(rl, gl, bl);
        if (Math.hypot(u - this.refU[c], v - this.refV[c]) > RED_CHROMA_CHANGE) {
          this.refU[c] = u; this.refV[c] = v; this.refRed[c] = isRed; this.redMask[c] = 1; redCount++;
          if (this.hallRing.length) this.hallTransition(1, c);
        }
      }
    }
    if (!first && this.viewing === "hall") {
      this.peakGeneral = Math.max(this.peakGeneral, generalCount / this.cells);
      this.peakRed = Math.max(this.peakRed, redCount / this.cells);
    } else if (!first) {
      this.peakGeneral = Math.max(this.peakGeneral, generalCount ? this.record(this.generalMask, this.generalEvents) : 0);
      this.peakRed = Math.max(this.peakRed, redCount ? this.record(this.redMask, this.redEvents) : 0);
    }
    this.frame++;
  }

  private record(mask: Uint8Array, events: FrameEvent[]): number {
    const best = worstWindow(mask, this.width, this.height, this.fw, this.fh, this.sat);
    const share = best.sum / (this.fw * this.fh);
    if (best.sum > this.threshold) {
      events.push({
        frame: this.frame,
        share,
        region: { x: best.x / this.width, y: best.y / this.height, width: this.fw / this.width, height: this.fh / this.height },
      });
    }
    return share;
  }

  private summarise(events: FrameEvent[], peak: number, fps: number): FlashKindReport {
    let worst = 0, worstStart = -1;
    for (let i = 0, j = 0; i < events.length; i++) {
      // events j..i lie inside one second ending at event i
      while ((events[i].frame - events[j].frame) / fps >= 1) j++;
      if (i - j + 1 > worst) { worst = i - j + 1; worstStart = j; }
    }
    let region: FlashRegion | null = null;
    if (worstStart >= 0) {
      let top = events[worstStart];
      for (let k = worstStart; k < worstStart + worst; k++) if (events[k].share > top.share) top = events[k];
      region = top.region;
    }
    return {
      worstFlashes: worst / 2,
      worstSecondStartS: worstStart >= 0 ? events[worstStart].frame / fps : null,
      region,
      peakFieldShare: peak,
      passes: worst <= MAX_TRANSITIONS_PER_SECOND,
    };
  }

  private summariseHall(kind: number, peak: number, fps: number): FlashKindReport {
    const w = this.hallWorst[kind];
    const region = w.cell < 0 ? null : { x: (w.cell % this.width) / this.width, y: Math.floor(w.cell / this.width) / this.height, width: 1 / this.width, height: 1 / this.height };
    return { worstFlashes: w.count / 2, worstSecondStartS: w.frame < 0 ? null : w.frame / fps, region, peakFieldShare: peak, passes: w.count <= MAX_TRANSITIONS_PER_SECOND };
  }

  /** Frames pushed so far. */
  get frames(): number {
    return this.frame;
  }

  /** `fps`: the frame rate measured once all frames are in, when it differs from the one assumed at the start. */
  report(fps = this.fps): FlashReport {
    if (!(fps > 0) || !Number.isFinite(fps)) throw new FlashInputError(`frame rate must be positive, not ${fps}`);
    const hall = this.viewing === "hall";
    const general = hall ? this.summariseHall(0, this.peakGeneral, fps) : this.summarise(this.generalEvents, this.peakGeneral, fps);
    const red = hall ? this.summariseHall(1, this.peakRed, fps) : this.summarise(this.redEvents, this.peakRed, fps);
    return {
      framesAnalysed: this.frame,
      fps,
      viewing: this.viewing,
      grid: { width: this.width, height: this.height },
      field: { width: this.fw, height: this.fh, areaShare: FIELD_AREA_SHARE },
      general,
      red,
      passes: general.passes && red.passes,
    };
  }
}

function where(region: FlashRegion | null, frameWidth: number, frameHeight: number): string {
  if (!region) return "";
  const x = Math.round(region.x * frameWidth), y = Math.round(region.y * frameHeight);
  const w = Math.round(region.width * frameWidth), h = Math.round(region.height * frameHeight);
  return ` in the ${w}×${h} px field at (${x}, ${y})`;
}

/** What a flash report covers, in words the public reads: "the whole 34.1 s loop", "the first 180 s". */
export interface FlashSpan {
  analysedSeconds: number;
  /** every frame the viewer can ever see was analysed: the whole loop (and the intro before it), or a whole video */
  wholeDemo: boolean;
  text: string;
}

export const WCAG_SOURCE = "WCAG 2.2 success criterion 2.3.1 and its definition of the general flash and red flash thresholds";

const secondsText = (s: number) => `${s < 10 ? s.toFixed(1) : Math.round(s)} s`;

/** The span of a reference capture: its loop when one was found, else the first seconds. */
export function captureSpan(seconds: number, loop: { detected: boolean; firstLoopFrame: number; periodSeconds: number | null }, fps: number, stoppedBy: string | null): FlashSpan {
  if (loop.detected && loop.periodSeconds !== null) {
    const intro = loop.firstLoopFrame / fps;
    const text = intro >= 0.05 ? `the ${secondsText(intro)} intro and the whole ${secondsText(loop.periodSeconds)} loop` : `the whole ${secondsText(loop.periodSeconds)} loop`;
    return { analysedSeconds: seconds, wholeDemo: true, text };
  }
  return { analysedSeconds: seconds, wholeDemo: false, text: `the first ${secondsText(seconds)}${stoppedBy ? ` (${stoppedBy})` : ""}` };
}

/** The span of an uploaded video: whole when it ended before the limit. */
export function videoSpan(seconds: number, whole: boolean): FlashSpan {
  return { analysedSeconds: seconds, wholeDemo: whole, text: whole ? `the whole ${secondsText(seconds)} video` : `the first ${secondsText(seconds)} of the video` };
}

export type FlashVerdictWord = "pass" | "warn" | "fail" | "unmeasured";

/** The flash figures a check run stores and pages read (app/showcase/figures.ts). */
export interface FlashFigures {
  verdict: FlashVerdictWord;
  worstSecondFlashes: number | null;
  /** seconds from the start of the analysed span to the start of the worst one-second window */
  worstSecondAt: number | null;
  analysedSeconds: number;
  wholeDemo: boolean;
  span: string;
  viewing: FlashViewing;
  /** the sentence for the public, naming the span */
  statement: string;
  source: string;
}

/** Under one second nothing is claimed: WCAG counts flashes in any one-second period. */
export function flashFigures(report: FlashReport, ruleset: Ruleset, span: FlashSpan, action: "warn" | "block" = ruleset.flashCheck.action): FlashFigures {
  const worst = Math.max(report.general.worstFlashes, report.red.worstFlashes);
  const worstKind = report.general.worstFlashes >= report.red.worstFlashes ? report.general : report.red;
  const unmeasured = span.analysedSeconds < 1;
  const verdict: FlashVerdictWord = unmeasured ? "unmeasured" : report.passes ? "pass" : action === "block" ? "fail" : "warn";
  const viewing = report.viewing === "hall" ? "hall viewing: a flash anywhere on the screen counts" : "desk viewing: WCAG's 10° field area rule applies";
  const at = worstKind.worstSecondStartS;
  const statement =
    verdict === "unmeasured"
      ? `Flash check: not measured — only ${span.analysedSeconds.toFixed(2)} s was analysed, less than the one second WCAG 2.3.1 counts flashes in; nothing is claimed.`
      : verdict === "pass"
        ? `Flash check: no flashes over the WCAG 2.3.1 thresholds in ${span.text} (at most ${worst} a second; ${viewing}).`
        : `Flash check: FLAGGED — ${worst} flashes in one second${at === null ? "" : ` from ${at.toFixed(1)} s`}, over the WCAG 2.3.1 limit of three, in ${span.text} (${viewing}).`;
  return {
    verdict,
    worstSecondFlashes: unmeasured ? null : worst,
    worstSecondAt: unmeasured ? null : at,
    analysedSeconds: span.analysedSeconds,
    wholeDemo: span.wholeDemo,
    span: span.text,
    viewing: report.viewing,
    statement,
    source: WCAG_SOURCE,
  };
}

/** Findings for a flash report; `action` of the ruleset turns a failure into a warning or a block. */
export function flashFindings(report: FlashReport, ruleset: Ruleset, subject = "reference capture", frameWidth = 640, frameHeight = 480, span?: FlashSpan): Finding[] {
  const failVerdict = ruleset.flashCheck.action === "block" ? "fail" : "warn";
  const kinds = [
    ["general", "general flashes", report.general],
    ["red", "red flashes", report.red],
  ] as const;
  const seconds = report.framesAnalysed / report.fps;
  const covered = span ?? { analysedSeconds: seconds, wholeDemo: false, text: `the first ${seconds.toFixed(2)} s` };
  const unmeasured = covered.analysedSeconds < 1;
  const area = report.viewing === "hall" ? "anywhere on the screen (hall viewing)" : "over 25 % of a 10° field";
  return kinds.map(([key, label, k]) => ({
    step: "flash" as const,
    rule: `flash.${key}`,
    verdict: unmeasured ? "warn" : k.passes ? "pass" : failVerdict,
    title: `${label} per second (WCAG 2.2 SC 2.3.1)`,
    measured: unmeasured ? "unmeasured" : k.worstFlashes,
    limit: MAX_TRANSITIONS_PER_SECOND / 2,
    evidence: unmeasured
      ? `only ${report.framesAnalysed} frames (${covered.analysedSeconds.toFixed(2)} s) of the ${subject} were analysed, less than the one-second window WCAG counts in: nothing is claimed`
      : (k.worstSecondStartS === null
        ? `no ${label} ${area} in ${covered.text} of the ${subject}`
        : `worst second starts at ${k.worstSecondStartS.toFixed(2)} s${where(k.region, frameWidth, frameHeight)}, in ${covered.text} of the ${subject}`) + `; ${WCAG_SOURCE}`,
    advice: unmeasured
      ? "capture at least one second (more frames, or the whole demo) so the flash check can measure"
      : k.passes ? undefined : "slow the flashing to three a second or fewer, shrink the flashing area, or soften the contrast",
  }));
}

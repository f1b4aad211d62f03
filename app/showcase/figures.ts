import type { PublicStats } from "./shapes";

/** Re-exported for app/stage (stage mode), which still imports it from here. */
export type { PublicStats };
/**
 * Reading the public figures of a check run (app/conformance writes them as loose JSON per step). Everything
 * here is defensive: a step that has not run, or wrote an older shape, gives null and the page says "not measured".
 */

export type FlashVerdict = "pass" | "warn" | "fail";

export interface FlashSummary {
  /** null: the flash check has not measured this entry (yet). */
  verdict: FlashVerdict | null;
  /** Flashes in the worst one-second window, when measured. */
  worstSecondFlashes: number | null;
  /** One sentence for the warning box. */
  statement: string;
}

type Json = Record<string, unknown>;

function obj(v: unknown): Json | null {
  return typeof v === "object" && v !== null && !Array.isArray(v) ? (v as Json) : null;
}
function num(v: unknown): number | null {
  return typeof v === "number" && Number.isFinite(v) ? v : null;
}
function str(v: unknown): string | null {
  return typeof v === "string" && v.length > 0 ? v : null;
}

/** The flash summary of the reference capture (figures.flash). */
export function flashSummary(figures: Record<string, unknown> | null | undefined): FlashSummary {
  return summarise(obj(figures?.flash));
}

/** The flash summary of the crew's own capture video (figures.captureFlash): its player is gated by this one. */
export function captureFlashSummary(figures: Record<string, unknown> | null | undefined): FlashSummary {
  return summarise(obj(figures?.captureFlash));
}

/** Where the demo loops, as the reference capture found it (figures.loop), for the player's loop mark. */
export interface LoopSummary {
  detected: boolean;
  periodSeconds: number | null;
  /** seconds into the preview where the loop starts (after the intro) */
  loopStartSeconds: number | null;
  capturedSeconds: number | null;
  statement: string | null;
}

export function loopSummary(figures: Record<string, unknown> | null | undefined): LoopSummary | null {
  const loop = obj(figures?.loop);
  if (!loop) return null;
  const captured = num(loop.capturedSeconds);
  const period = num(loop.periodSeconds);
  const detected = loop.detected === true && period !== null;
  const first = num(loop.firstLoopFrame);
  const fps = captured !== null && num(loop.framesCaptured) ? num(loop.framesCaptured)! / captured : null;
  return {
    detected,
    periodSeconds: detected ? period : null,
    loopStartSeconds: detected && first !== null && fps ? first / fps : null,
    capturedSeconds: captured,
    statement: str(loop.statement),
  };
}

function summarise(flash: Json | null): FlashSummary {
  if (!flash) return { verdict: null, worstSecondFlashes: null, statement: "Flash check: not measured yet." };
  // figures written since whole-demo captures carry their own sentence, naming the span analysed
  const own = str(flash.statement);
  if (flash.verdict === "unmeasured") return { verdict: null, worstSecondFlashes: null, statement: own ?? "Flash check: not measured." };
  const raw = flash.verdict;
  let verdict: FlashVerdict | null = raw === "pass" || raw === "warn" || raw === "fail" ? raw : null;
  if (verdict === null && typeof flash.passes === "boolean") verdict = flash.passes ? "pass" : "warn";
  const worst =
    num(flash.worstSecondFlashes) ??
    (() => {
      const g = num(obj(flash.general)?.worstFlashes);
      const r = num(obj(flash.red)?.worstFlashes);
      return g === null && r === null ? null : Math.max(g ?? 0, r ?? 0);
    })();
  if (verdict === null) return { verdict: null, worstSecondFlashes: worst, statement: "Flash check: not measured yet." };
  if (own) return { verdict, worstSecondFlashes: worst, statement: own };
  // older figures measured one second or so and did not say how much: the statement must not claim more
  const perSecond = worst === null ? "" : ` (worst second: ${worst} flash${worst === 1 ? "" : "es"})`;
  const statement =
    verdict === "pass"
      ? `Flash check: passed in the part analysed (its length was not recorded) — within the WCAG 2.2 general and red flash thresholds${perSecond}.`
      : `Flash check: FLAGGED — this entry flashes more than three times a second${perSecond}.`;
  return { verdict, worstSecondFlashes: worst, statement };
}

/** True when stage mode must treat the entry as flagged: anything but a measured pass. */
export function isFlashFlagged(f: FlashSummary): boolean {
  return f.verdict !== "pass";
}

export function publicStats(figures: Record<string, unknown> | null | undefined): PublicStats {
  const source = obj(figures?.source);
  const layout = obj(figures?.layout);
  const width = num(layout?.widthUm);
  const height = num(layout?.heightUm);
  return {
    flipFlops: num(source?.flipFlops) ?? num(layout?.flipFlops),
    cells: num(source?.cells),
    sourceLines: num(source?.sourceLines) ?? num(source?.lines),
    tileShape: str(layout?.matchedShape),
    tileSizeUm: width !== null && height !== null ? { width, height } : null,
    utilization: num(layout?.utilization),
  };
}

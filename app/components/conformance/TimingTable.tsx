import { VIDEO_MODES, type AcceptanceWindow } from "~/rules/video-modes";

/** What the timing is judged against: the ruleset's mode, its clocks per pixel and the monitor window. */
export interface TimingRules {
  modeId: string;
  clocksPerPixel: number;
  window: AcceptanceWindow;
}

export interface VideoFigures {
  hsync: { periodClocks: number | null; pulseClocks: number | null; polarity: string | null };
  vsync: { periodLines: number | null; pulseLines: number | null; polarity: string | null };
  linesPerFrame: number | null;
  framesRendered: number;
  frameRateHz: number | null;
  /** absent in runs made before the line rate was recorded */
  lineRateHz?: number | null;
}

export interface SpeedFigures {
  cycles: number;
  seconds: number;
  cyclesPerSecond: number;
  realTimeMultiple: number;
  /** absent in runs made before these were recorded */
  edgeMode?: "rising-only" | "both-edges";
  profileGuided?: boolean;
  modelCached?: boolean;
}

function buildNote(speed: SpeedFigures): string {
  const notes = [
    speed.edgeMode === "rising-only" ? "only the rising clock edge evaluated, as nothing in the design reacts to the falling one" : null,
    speed.edgeMode === "both-edges" ? "both clock edges evaluated" : null,
    speed.profileGuided ? "model compiled with a profile of its own first frames" : null,
    speed.modelCached ? "compiled model reused from an earlier check of the same design" : null,
  ].filter(Boolean);
  return notes.length ? ` Build: ${notes.join("; ")}.` : "";
}

const inRange = (v: number | null | undefined, r: { min: number; max: number }) => v != null && v >= r.min && v <= r.max;

/** Measured sync timing beside the standard's values (in board clocks) and the monitor window for the rates. */
export function TimingTable({ video, speed, rules }: { video: VideoFigures; speed: SpeedFigures | null; rules: TimingRules }) {
  const mode = VIDEO_MODES[rules.modeId];
  const cpp = rules.clocksPerPixel;
  const w = rules.window;
  const same = (a: unknown, b: unknown) => String(a) === String(b);
  const lineKHz = video.lineRateHz != null ? video.lineRateHz / 1000 : null;
  const rows: [string, string | number | null, string | number, boolean][] = mode
    ? [
        ["hsync period (clocks)", video.hsync.periodClocks, mode.h.total * cpp, same(video.hsync.periodClocks, mode.h.total * cpp)],
        ["hsync pulse (clocks)", video.hsync.pulseClocks, mode.h.sync * cpp, same(video.hsync.pulseClocks, mode.h.sync * cpp)],
        ["hsync polarity", video.hsync.polarity, mode.h.syncPolarity, same(video.hsync.polarity, mode.h.syncPolarity)],
        ["vsync period (lines)", video.vsync.periodLines, mode.v.total, same(video.vsync.periodLines, mode.v.total)],
        ["vsync pulse (lines)", video.vsync.pulseLines, mode.v.sync, same(video.vsync.pulseLines, mode.v.sync)],
        ["vsync polarity", video.vsync.polarity, mode.v.syncPolarity, same(video.vsync.polarity, mode.v.syncPolarity)],
        ["lines per frame", video.linesPerFrame, mode.v.total, same(video.linesPerFrame, mode.v.total)],
        ...(video.lineRateHz !== undefined
          ? [["line rate (kHz)", lineKHz?.toFixed(3) ?? null, `${w.lineRateKHz.min}–${w.lineRateKHz.max}`, inRange(lineKHz, w.lineRateKHz)] as [string, string | null, string, boolean]]
          : []),
        ["frame rate (Hz)", video.frameRateHz?.toFixed(3) ?? null, `${w.refreshHz.min}–${w.refreshHz.max}`, inRange(video.frameRateHz, w.refreshHz)],
      ]
    : [];
  return (
    <div>
      <table className="w-full text-sm">
        <caption className="mb-2 text-left text-sm text-mute">Measured over {video.framesRendered} simulated frames, against {mode?.label ?? rules.modeId}
          {cpp > 1 ? ` at ${cpp} clocks a pixel` : ""}; rates against the monitor window</caption>
        <thead>
          <tr className="text-left text-xs uppercase tracking-wide text-mute">
            <th className="py-1">Signal</th>
            <th className="py-1">Measured</th>
            <th className="py-1">Required</th>
          </tr>
        </thead>
        <tbody>
          {rows.map(([name, measured, standard, ok]) => (
            <tr key={name} className="border-t border-line">
              <td className="py-1.5">{name}</td>
              <td className={`py-1.5 font-mono ${ok ? "" : "font-bold text-fail"}`}>{measured ?? "not seen"}</td>
              <td className="py-1.5 font-mono text-mute">{standard}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {speed && (
        <p className="mt-3 text-sm text-ink-soft">
          Simulation speed: {(speed.cyclesPerSecond / 1e6).toFixed(1)} M cycles/s — {speed.realTimeMultiple.toFixed(2)}× real time at the
          ruleset's clock ({speed.cycles.toLocaleString("en")} cycles in {speed.seconds.toFixed(1)} s).{buildNote(speed)}
        </p>
      )}
    </div>
  );
}

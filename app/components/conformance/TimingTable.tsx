import { VIDEO_MODES } from "~/rules/video-modes";

export interface VideoFigures {
  hsync: { periodClocks: number | null; pulseClocks: number | null; polarity: string | null };
  vsync: { periodLines: number | null; pulseLines: number | null; polarity: string | null };
  linesPerFrame: number | null;
  framesRendered: number;
  frameRateHz: number | null;
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

/** Measured sync timing beside the standard's values (VESA DMT for the default mode). */
export function TimingTable({ video, speed, modeId }: { video: VideoFigures; speed: SpeedFigures | null; modeId: string }) {
  const mode = VIDEO_MODES[modeId];
  const frameRate = mode ? mode.pixelClockHz / (mode.h.total * mode.v.total) : null;
  const rows: [string, string | number | null, string | number][] = mode
    ? [
        ["hsync period (clocks)", video.hsync.periodClocks, mode.h.total],
        ["hsync pulse (clocks)", video.hsync.pulseClocks, mode.h.sync],
        ["hsync polarity", video.hsync.polarity, mode.h.syncPolarity],
        ["vsync period (lines)", video.vsync.periodLines, mode.v.total],
        ["vsync pulse (lines)", video.vsync.pulseLines, mode.v.sync],
        ["vsync polarity", video.vsync.polarity, mode.v.syncPolarity],
        ["lines per frame", video.linesPerFrame, mode.v.total],
        ["frame rate (Hz)", video.frameRateHz?.toFixed(3) ?? null, frameRate!.toFixed(3)],
      ]
    : [];
  return (
    <div>
      <table className="w-full text-sm">
        <caption className="mb-2 text-left text-sm text-mute">Measured over {video.framesRendered} simulated frames, against {mode?.label ?? modeId}</caption>
        <thead>
          <tr className="text-left text-xs uppercase tracking-wide text-mute">
            <th className="py-1">Signal</th>
            <th className="py-1">Measured</th>
            <th className="py-1">Standard</th>
          </tr>
        </thead>
        <tbody>
          {rows.map(([name, measured, standard]) => (
            <tr key={name} className="border-t border-line">
              <td className="py-1.5">{name}</td>
              <td className={`py-1.5 font-mono ${String(measured) === String(standard) ? "" : "font-bold text-fail"}`}>{measured ?? "not seen"}</td>
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

import { useEffect, useState } from "react";
import type { EntryCheck } from "~/conformance/report-types";
import { flashSummary } from "~/showcase/figures";
import { AudioCaution, PlayerGate } from "../PlayerGate";
import { FindingsTable } from "./FindingsTable";
import { LayoutViewer } from "./LayoutViewer";
import { TimingTable, type SpeedFigures, type VideoFigures } from "./TimingTable";
import { VerdictBadge } from "./VerdictBadge";

const STEPS = [
  ["intake", "Unpack"],
  ["precheck", "Pre-check"],
  ["source", "yosys"],
  ["layout", "Layout"],
  ["simulation", "Simulate"],
  ["capture", "Capture video"],
] as const;

/**
 * The entry's conformance report, live: while the run is queued or running the panel asks the JSON API every
 * two seconds and shows the step it is on; then it shows the report, the reference capture and the figures.
 */
export function CheckRunPanel({ entryId, initial, videoMode }: { entryId: string; initial: EntryCheck | null; videoMode: string }) {
  const [check, setCheck] = useState(initial);
  const [offline, setOffline] = useState(false);
  const active = check?.run?.state === "queued" || check?.run?.state === "running";

  useEffect(() => {
    if (!active) return;
    let stopped = false;
    const timer = setTimeout(async () => {
      try {
        const res = await fetch(`/api/checks/${entryId}`, { headers: { accept: "application/json" } });
        if (!res.ok) throw new Error(String(res.status));
        const body = (await res.json()) as { check: EntryCheck | null };
        if (!stopped) {
          setCheck(body.check);
          setOffline(false);
        }
      } catch {
        // A dropped connection: keep what we have and ask again on the next tick.
        if (!stopped) setOffline(true);
      }
    }, 2000);
    return () => {
      stopped = true;
      clearTimeout(timer);
    };
  }, [active, check, entryId]);

  if (!check) return <p className="text-mute">No upload yet: upload a source bundle and a layout to get a check report within seconds.</p>;
  const run = check.run;
  if (!run) return <p className="text-mute">Upload {check.uploadNumber} is waiting for its check run.</p>;

  const fig = run.figures as {
    video?: VideoFigures | null;
    speed?: SpeedFigures | null;
    audio?: { rms: number; dcOffset: number; dominantHz: number | null } | null;
    skipped?: { step: string; reason: string }[];
  };
  const a = check.artifacts;
  const flash = flashSummary(run.figures);
  return (
    <section aria-labelledby="check-title" className="card space-y-6" data-testid="check-run-panel" data-state={run.state}>
      <header className="flex flex-wrap items-center gap-3">
        <h2 id="check-title" className="text-xl font-bold">
          Check of upload {check.uploadNumber}
        </h2>
        {run.verdict && <VerdictBadge verdict={run.verdict} large />}
        {offline && <span className="text-xs font-semibold text-warn">Connection lost — retrying…</span>}
      </header>

      {active && (
        <ol className="flex flex-wrap gap-2" aria-label="Check progress" aria-live="polite">
          <li className={`rounded-full px-3 py-1 text-xs font-semibold ${run.state === "queued" ? "bg-signal text-white" : "bg-line text-ink-soft"}`}>Queued</li>
          {STEPS.map(([id, label]) => (
            <li key={id} className={`rounded-full px-3 py-1 text-xs font-semibold ${run.step === id ? "bg-signal text-white" : "bg-line text-ink-soft"}`} aria-current={run.step === id ? "step" : undefined}>
              {label}
            </li>
          ))}
        </ol>
      )}
      {run.state === "error" && (
        <p role="alert" className="rounded-md border border-fail bg-fail-soft p-3 text-sm text-fail">
          The check could not finish ({run.error}). Gatecrash retries it by itself; if it keeps failing, the organizers can see it too.
        </p>
      )}

      {run.state === "done" && (
        <>
          <FindingsTable findings={check.findings} />
          {fig.skipped && fig.skipped.length > 0 && (
            <ul className="text-sm text-mute">
              {fig.skipped.map((s) => (
                <li key={s.step}>
                  Not run — {s.step}: {s.reason}.
                </li>
              ))}
            </ul>
          )}
          <p className="rounded-md bg-paper p-3 text-xs text-ink-soft">
            A passing check run shows the design meets this compo's rules as Gatecrash measures them. It is not signoff: it does not
            replace the foundry's or the shuttle's own design-rule (DRC) and layout-versus-schematic (LVS) checks.
          </p>
        </>
      )}

      {(a.webm || a.mp4) && (
        <div>
          <h3 className="mb-2 font-bold">Reference capture</h3>
          <div className="max-w-2xl">
            <PlayerGate
              label="Reference capture"
              sources={[a.webm && { src: a.webm.url, type: "video/webm" }, a.mp4 && { src: a.mp4.url, type: "video/mp4" }].filter((x): x is { src: string; type: string } => Boolean(x))}
              poster={a["first-frame"]?.url}
              flashVerdict={flash.verdict}
              flashStatement={flash.statement}
            />
          </div>
        </div>
      )}
      {(a["first-frame"] || a["contact-sheet"]) && (
        <div className="grid gap-4 sm:grid-cols-2">
          {a["first-frame"] && (
            <figure>
              <img src={a["first-frame"].url} alt="First frame of the reference capture" className="w-full rounded border border-line" style={{ imageRendering: "pixelated" }} />
              <figcaption className="mt-1 text-xs text-mute">First frame after reset</figcaption>
            </figure>
          )}
          {a["contact-sheet"] && (
            <figure>
              <img src={a["contact-sheet"].url} alt="Twelve frames spread over the simulated run" className="w-full rounded border border-line" />
              <figcaption className="mt-1 text-xs text-mute">Frames spread over the run</figcaption>
            </figure>
          )}
        </div>
      )}
      {fig.video && <TimingTable video={fig.video} speed={fig.speed ?? null} modeId={videoMode} />}
      {a.wav && (
        <div>
          <h3 className="mb-2 font-bold">Audio from the PWM pin</h3>
          <AudioCaution />
          <audio controls preload="none" src={a.wav.url} className="mt-2 w-full max-w-xl" />
          {a.waveform && <img src={a.waveform.url} alt="Waveform of the decoded audio" className="mt-2 w-full max-w-xl" />}
          {fig.audio && (
            <p className="mt-1 text-xs text-mute">
              Level {(fig.audio.rms * 100).toFixed(1)} % RMS · DC offset {fig.audio.dcOffset.toFixed(2)} · dominant{" "}
              {fig.audio.dominantHz ? `${fig.audio.dominantHz.toFixed(0)} Hz` : "none (silence)"}
            </p>
          )}
        </div>
      )}
      {a["layout-svg"] && (
        <div>
          <h3 className="mb-2 font-bold">Layout</h3>
          <LayoutViewer src={a["layout-svg"].url} alt="Layout of the top cell: die outline, placed cells by kind, pin labels" />
        </div>
      )}
    </section>
  );
}

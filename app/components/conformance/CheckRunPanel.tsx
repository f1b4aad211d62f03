import type { EntryCheck } from "~/conformance/report-types";
import { flashSummary, loopSummary } from "~/showcase/figures";
import { AudioCaution, PlayerGate } from "../PlayerGate";
import { FindingsTable } from "./FindingsTable";
import { LayoutViewer } from "./LayoutViewer";
import { TimingTable, type SpeedFigures, type TimingRules, type VideoFigures } from "./TimingTable";
import { CHECK_STEPS } from "./steps";
import { VerdictBadge } from "./VerdictBadge";


/** "place 3 in line, 2 checks running now" */
function QueueLine({ queue }: { queue: { place: number; running: number } | null }) {
  // queued with no job waiting: a worker has just taken it
  if (!queue) return <p className="text-sm text-ink-soft" data-testid="queue-place">Starting…</p>;
  return (
    <p className="text-sm text-ink-soft" data-testid="queue-place" data-place={queue.place}>
      {queue.place === 1 ? "Next in line" : `Place ${queue.place} in line`}
      {queue.running > 0 && ` · ${queue.running} ${queue.running === 1 ? "check" : "checks"} running now`}. One place per entry: a newer upload takes its older one's place.
    </p>
  );
}

/**
 * The entry's conformance report as it grows: the place in the queue while it waits, the step it is on and every
 * finding so far while it runs (the cheap steps report before the reference capture is built, the first still
 * appears as soon as the simulated design draws it), then the whole report. The page keeps `check` live
 * (useLiveCheck), so this panel and the page's header always show the same state.
 */
export function CheckRunPanel({ check, offline, timingRules }: { check: EntryCheck | null; offline: boolean; timingRules: TimingRules }) {
  if (!check) return <p className="text-mute">No upload yet: upload a source bundle and a layout to get a check report within seconds.</p>;
  const run = check.run;
  if (!run) return <p className="text-mute">Upload {check.uploadNumber} is waiting for its check run.</p>;
  const active = run.state === "queued" || run.state === "running";

  const fig = run.figures as {
    video?: VideoFigures | null;
    speed?: SpeedFigures | null;
    audio?: { rms: number; dcOffset: number; dominantHz: number | null } | null;
    skipped?: { step: string; reason: string }[];
  };
  const a = check.artifacts;
  const flash = flashSummary(run.figures);
  const loop = loopSummary(run.figures);
  const settled = run.state === "done" || run.state === "error";
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
        <div className="space-y-2">
          <ol className="flex flex-wrap gap-2" aria-label="Check progress" aria-live="polite">
            <li className={`rounded-full px-3 py-1 text-xs font-semibold ${run.state === "queued" ? "bg-signal text-white" : "bg-line text-ink-soft"}`}>Queued</li>
            {CHECK_STEPS.map(([id, label]) => (
              <li key={id} className={`rounded-full px-3 py-1 text-xs font-semibold ${run.step === id ? "bg-signal text-white" : "bg-line text-ink-soft"}`} aria-current={run.step === id ? "step" : undefined}>
                {label}
              </li>
            ))}
          </ol>
          {run.state === "queued" && <QueueLine queue={run.queue} />}
          {run.state === "queued" && run.error && <p className="text-sm text-warn">The last attempt failed on Gatecrash's side; it is tried again by itself.</p>}
        </div>
      )}
      {run.state === "error" && (
        <p role="alert" className="rounded-md border border-fail bg-fail-soft p-3 text-sm text-fail">
          Gatecrash could not finish this check after several attempts ({run.error}). The findings below stand; the organizers can see this too.
        </p>
      )}
      {run.state === "superseded" && <p className="text-sm text-mute">A newer upload came in before this one was checked, so it was not checked.</p>}

      {check.findings.length > 0 && (
        <>
          {active && <p className="text-sm text-ink-soft" data-testid="partial-report">Findings so far — more follow as the check goes on.</p>}
          <FindingsTable findings={check.findings} />
        </>
      )}
      {settled && (
        <>
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
              loop={loop?.detected && loop.periodSeconds !== null ? { startSeconds: loop.loopStartSeconds ?? 0, periodSeconds: loop.periodSeconds } : null}
            />
          </div>
        </div>
      )}
      {loop?.statement && (
        <p className="text-sm" data-testid="loop-statement">
          <strong>Whole demo:</strong> {loop.statement}.
        </p>
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
      {fig.video && <TimingTable video={fig.video} speed={fig.speed ?? null} rules={timingRules} />}
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

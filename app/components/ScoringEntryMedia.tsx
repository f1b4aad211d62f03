import { useState } from "react";
import type { FlashNote } from "~/judging/presentation";

/**
 * The reference capture on the judge's entry page: nothing plays until the judge has read the
 * photosensitivity warning with the flash check's result, and the audio sits beside its PWM caution.
 */
export interface MediaArtifact {
  url: string;
  mediaType: string;
}

export function ScoringEntryMedia({ video, audio, still, flash }: { video: MediaArtifact | null; audio: MediaArtifact | null; still: MediaArtifact | null; flash: FlashNote }) {
  const [accepted, setAccepted] = useState(false);
  const flashText =
    flash.verdict === "pass"
      ? "The flash check on this reference capture passed (WCAG 2.2 SC 2.3.1 thresholds)."
      : flash.verdict === "unknown"
        ? "No flash check result yet for this capture: treat it as possibly flashing."
        : `The flash check flagged this capture: up to ${flash.worstSecondFlashes ?? "several"} flashes in its worst second, above the WCAG 2.2 SC 2.3.1 limit of three.`;
  if (!video && !audio) {
    return (
      <div className="card" data-testid="capture-not-ready">
        <p className="font-semibold">Reference capture not ready yet</p>
        <p className="mt-1 text-sm text-ink-soft">
          Gatecrash renders the capture itself by simulating the design. It appears here when the check run has finished; every judge then sees the same
          video.
        </p>
        {still && <img src={still.url} alt="First frame of the reference capture" className="mt-4 w-full max-w-md rounded border border-line" />}
      </div>
    );
  }
  return (
    <div className="card space-y-4">
      {!accepted ? (
        <div role="region" aria-label="Photosensitivity warning" className={`rounded-md border px-4 py-3 ${flash.verdict === "pass" ? "border-line bg-paper" : "border-warn bg-warn-soft"}`}>
          <p className="font-semibold">Photosensitivity warning</p>
          <p className="mt-1 text-sm">Entries can flash and show fast-changing patterns. {flashText}</p>
          <button type="button" className="btn-primary mt-3" onClick={() => setAccepted(true)}>
            I have read this — show the capture
          </button>
        </div>
      ) : (
        <>
          <p className={`text-sm ${flash.verdict === "pass" ? "text-ink-soft" : "font-semibold text-warn"}`}>{flashText}</p>
          {video && (
            <video controls preload="metadata" className="w-full max-w-2xl rounded border border-line bg-ink" aria-label="Reference capture">
              <source src={video.url} type={video.mediaType} />
            </video>
          )}
        </>
      )}
      {audio && (
        <div>
          <p className="text-sm text-ink-soft">
            <strong>Audio caution:</strong> the audio pin is 1-bit PWM — a full-scale square wave with a DC offset. Listen through a low-pass filter and a
            coupling capacitor, and start at low volume.
          </p>
          {accepted && <audio controls preload="none" src={audio.url} className="mt-2" aria-label="Reference audio" />}
        </div>
      )}
    </div>
  );
}

import { useState, type ReactNode } from "react";

/**
 * The photosensitivity warning every player sits behind: nothing loads until the viewer chooses to watch.
 * States the flash check's result so people can decide with the facts.
 */
export interface FlashSummary {
  verdict: "pass" | "warn" | "fail";
  worstSecondFlashes: number;
}

export function CaptureGate({ flash, children, label = "reference capture" }: { flash: FlashSummary | null; children: ReactNode; label?: string }) {
  const [accepted, setAccepted] = useState(false);
  if (accepted) return <>{children}</>;
  const result =
    flash === null
      ? "The flash check has not measured this video yet."
      : flash.verdict === "pass"
        ? `The flash check found no flashing over the WCAG 2.2 (SC 2.3.1) thresholds (worst second: ${flash.worstSecondFlashes} flashes).`
        : `The flash check found flashing over the WCAG 2.2 (SC 2.3.1) thresholds: ${flash.worstSecondFlashes} flashes in the worst second.`;
  return (
    <div role="region" aria-label={`Photosensitivity warning for the ${label}`} className={`rounded-lg border-2 p-5 ${flash && flash.verdict !== "pass" ? "border-fail bg-fail-soft" : "border-warn bg-warn-soft"}`}>
      <p className="font-bold text-ink">Photosensitivity warning</p>
      <p className="mt-1 text-sm text-ink-soft">
        Demo entries can show fast flashing and high-contrast patterns that may trigger seizures in people with photosensitive
        epilepsy. {result}
      </p>
      <button type="button" className="btn-primary mt-3" onClick={() => setAccepted(true)}>
        Show the {label}
      </button>
    </div>
  );
}

export function AudioCaution() {
  return (
    <p className="text-xs text-ink-soft">
      Listening caution: the audio comes from a 1-bit PWM pin, a full-scale square wave with a DC offset. Start at low volume;
      on real hardware listen through a low-pass filter and a coupling capacitor.
    </p>
  );
}

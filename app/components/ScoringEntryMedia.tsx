import type { FlashSummary } from "~/showcase/figures";
import { AudioCaution, PlayerGate } from "./PlayerGate";

/**
 * The reference capture on the judge's entry page, behind the same photosensitivity gate as every other
 * player (with the flash check's result); the audio sits beside its PWM caution.
 */
export interface MediaArtifact {
  url: string;
  mediaType: string;
}

export function ScoringEntryMedia({ video, audio, still, flash }: { video: MediaArtifact | null; audio: MediaArtifact | null; still: MediaArtifact | null; flash: FlashSummary }) {
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
      <div className="max-w-2xl">
        <PlayerGate label="Reference capture" sources={video ? [{ src: video.url, type: video.mediaType }] : []} poster={still?.url} flashVerdict={flash.verdict} flashStatement={flash.statement} />
      </div>
      {audio && (
        <div>
          <AudioCaution className="text-sm text-ink-soft" />
          <audio controls preload="none" src={audio.url} className="mt-2" aria-label="Reference audio" />
        </div>
      )}
    </div>
  );
}

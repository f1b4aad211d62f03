import { useId, useRef, useState } from "react";

/**
 * Every player sits behind this gate: the photosensitivity warning with the entry's flash-check result.
 * Nothing loads (no video element exists) until the viewer accepts.
 */
export interface PlayerSource {
  src: string;
  type: string;
}

export function PlayerGate({
  label,
  sources,
  poster,
  flashVerdict,
  flashStatement,
  notReady = "Reference capture not ready yet: Gatecrash renders it when the check run finishes.",
  tone = "light",
  autoPlay = false,
  loop = null,
}: {
  label: string;
  sources: PlayerSource[];
  poster?: string | null;
  flashVerdict: "pass" | "warn" | "fail" | null;
  flashStatement: string;
  notReady?: string;
  tone?: "light" | "dark";
  autoPlay?: boolean;
  /** where the demo loops, to mark on the seek bar: seconds into the video where the loop starts, and its length */
  loop?: { startSeconds: number; periodSeconds: number } | null;
}) {
  const [accepted, setAccepted] = useState(false);
  const [time, setTime] = useState(0);
  const [duration, setDuration] = useState(0);
  const videoRef = useRef<HTMLVideoElement>(null);
  const headingId = useId();
  const flagged = flashVerdict !== "pass";
  if (sources.length === 0) {
    return (
      <div className={`rounded-lg border border-dashed p-6 text-sm ${tone === "dark" ? "border-white/30 text-white/80" : "border-line text-mute"}`} data-testid="player-not-ready">
        <p className="font-semibold">{label}</p>
        <p className="mt-1">{notReady}</p>
      </div>
    );
  }
  if (!accepted) {
    return (
      <section
        aria-labelledby={headingId}
        data-testid="photosensitivity-gate"
        className={`rounded-lg border-2 p-5 ${flagged ? "border-fail bg-fail-soft text-ink" : "border-warn bg-warn-soft text-ink"}`}
      >
        <h3 id={headingId} className="font-extrabold">
          Photosensitivity warning — {label}
        </h3>
        <p className="mt-2 text-sm">
          This capture may contain flashing lights and fast-changing patterns. If you or anyone watching has photosensitive
          epilepsy or is sensitive to flashing, do not play it.
        </p>
        <p className="mt-2 text-sm font-semibold" data-testid="flash-statement">
          {flashStatement}
        </p>
        <AudioCaution className="mt-2 text-sm" />
        <button type="button" className="btn-primary mt-4" onClick={() => setAccepted(true)}>
          I understand — load and play
        </button>
      </section>
    );
  }
  return (
    <figure>
      <video
        ref={videoRef}
        controls
        autoPlay={autoPlay}
        playsInline
        preload="metadata"
        poster={poster ?? undefined}
        className="w-full rounded-lg bg-black"
        aria-label={label}
        data-testid="player-video"
        onLoadedMetadata={(e) => setDuration(e.currentTarget.duration)}
        onTimeUpdate={(e) => setTime(e.currentTarget.currentTime)}
      >
        {sources.map((s) => (
          <source key={s.src} src={s.src} type={s.type} />
        ))}
        Your browser cannot play this video.
      </video>
      {loop && (
        <LoopSeekBar
          time={time}
          duration={duration > 0 && Number.isFinite(duration) ? duration : loop.startSeconds + loop.periodSeconds}
          loop={loop}
          tone={tone}
          onSeek={(t) => {
            if (videoRef.current) videoRef.current.currentTime = t;
            setTime(t);
          }}
        />
      )}
      <figcaption className={`mt-1 text-xs ${tone === "dark" ? "text-white/70" : "text-mute"}`}>
        {label} · {flashStatement}
      </figcaption>
      {/* The preview carries the PWM pin's audio, so its caution stays beside the player. */}
      <AudioCaution className={`mt-1 text-xs ${tone === "dark" ? "text-white/70" : "text-mute"}`} />
    </figure>
  );
}

/** The caution beside any audio from a 1-bit PWM pin. */
export function AudioCaution({ className = "" }: { className?: string }) {
  return (
    <p className={className} data-testid="audio-caution">
      <strong>Audio caution:</strong> the sound comes from a 1-bit PWM pin, a full-scale square wave with a DC offset. Listen through a
      low-pass filter and a coupling capacitor, and start at low volume.
    </p>
  );
}

/** A seek bar with the demo's loop marked: the intro before the mark, one whole loop after it. */
export function LoopSeekBar({
  time,
  duration,
  loop,
  tone = "light",
  onSeek,
}: {
  time: number;
  duration: number;
  loop: { startSeconds: number; periodSeconds: number };
  tone?: "light" | "dark";
  onSeek: (seconds: number) => void;
}) {
  const pct = duration > 0 ? Math.min(100, (loop.startSeconds / duration) * 100) : 0;
  const muted = tone === "dark" ? "text-white/70" : "text-mute";
  return (
    <div className="mt-2" data-testid="loop-seek-bar">
      <div className="relative">
        <input
          type="range"
          min={0}
          max={duration}
          step={0.01}
          value={Math.min(time, duration)}
          onChange={(e) => onSeek(Number(e.currentTarget.value))}
          className="w-full accent-signal"
          aria-label={`Seek; the loop starts at ${loop.startSeconds.toFixed(1)} s and lasts ${loop.periodSeconds.toFixed(1)} s`}
        />
        <span aria-hidden="true" className="pointer-events-none absolute top-0 h-full w-0.5 bg-warn" style={{ left: `${pct}%` }} data-testid="loop-mark" />
      </div>
      <p className={`text-xs ${muted}`}>
        {loop.startSeconds > 0.05 ? `Intro 0–${loop.startSeconds.toFixed(1)} s, then the loop` : "The whole loop"} ({loop.periodSeconds.toFixed(1)} s) to the end; it
        repeats from the mark.
        <button type="button" className="ml-2 underline" onClick={() => onSeek(loop.startSeconds)}>
          Go to the loop point
        </button>
      </p>
    </div>
  );
}

import { useCallback, useEffect, useRef, useState } from "react";
import { formatInZone } from "~/competitions/zone-format";
import { STAGE_AUDIO_CAUTION, STAGE_FLASH_CAUTION } from "~/stage/caution";
import { STAGE_SOURCE, stageFitCss } from "~/stage/scale";
import type { StageScreen, StageVideo } from "~/stage/screens";
import { ShowcaseStats } from "./ShowcaseStats";

/**
 * Stage mode for the big screen: dark, large type, driven by the keyboard.
 * → / Space / PageDown next · ← / PageUp previous · Home first · End last · F full screen · Enter plays the capture
 * (after the on-screen photosensitivity warning) · Escape stops it. A capture plays from the start with sound,
 * over the whole stage at 640×480 scaled by whole screen pixels, letterboxed (app/stage/scale.ts).
 * Flagged entries are not in the list unless an organizer signed off; then a warning slide comes first.
 */
export function StageDeck({ screens, exitHref }: { screens: StageScreen[]; exitHref: string }) {
  const [i, setI] = useState(() => {
    if (typeof window === "undefined") return 0;
    const n = Number(window.location.hash.replace("#", "")) - 1;
    return Number.isInteger(n) && n >= 0 && n < screens.length ? n : 0;
  });
  const [playing, setPlaying] = useState(false);
  const root = useRef<HTMLDivElement>(null);
  const go = useCallback(
    (n: number) => {
      const next = Math.max(0, Math.min(screens.length - 1, n));
      setI(next);
      setPlaying(false);
      window.history.replaceState(null, "", `#${next + 1}`);
    },
    [screens.length],
  );

  useEffect(() => {
    root.current?.focus();
  }, []);

  useEffect(() => {
    function onKey(ev: KeyboardEvent) {
      if (ev.altKey || ev.ctrlKey || ev.metaKey) return;
      const t = ev.target as HTMLElement | null;
      if (t && t.tagName === "A") return;
      switch (ev.key) {
        case "ArrowRight":
        case "PageDown":
        case " ":
          ev.preventDefault();
          go(i + 1);
          break;
        case "ArrowLeft":
        case "PageUp":
          ev.preventDefault();
          go(i - 1);
          break;
        case "Home":
          ev.preventDefault();
          go(0);
          break;
        case "End":
          ev.preventDefault();
          go(screens.length - 1);
          break;
        case "f":
        case "F":
          ev.preventDefault();
          if (document.fullscreenElement) void document.exitFullscreen();
          else void root.current?.requestFullscreen?.();
          break;
        case "Enter": {
          const cur = screens[i];
          if (cur?.kind === "entry" && cur.video) {
            ev.preventDefault();
            setPlaying(true);
          }
          break;
        }
        case "Escape":
          if (playing) {
            ev.preventDefault();
            setPlaying(false);
          }
          break;
      }
    }
    window.addEventListener("keydown", onKey);
    return () => window.removeEventListener("keydown", onKey);
  }, [go, i, screens, playing]);

  const s = screens[i];
  return (
    <div
      ref={root}
      tabIndex={-1}
      className="fixed inset-0 z-50 flex flex-col overflow-hidden bg-[#0e0b16] text-white outline-none"
      style={{ backgroundImage: "radial-gradient(circle at 85% 10%, rgba(217,72,15,.22), transparent 45%), radial-gradient(circle at 5% 95%, rgba(95,61,196,.25), transparent 40%)" }}
      data-testid="stage"
      aria-roledescription="presentation"
      aria-label="Stage mode"
    >
      <div className="flex items-center justify-between px-10 pt-6 text-sm font-semibold tracking-[0.3em] text-white/50">
        <span>
          <span className="text-[#ff7a3d]">GATECRASH</span> · STAGE
        </span>
        <span data-testid="stage-counter">
          {i + 1} / {screens.length}
        </span>
      </div>
      <section className="flex flex-1 items-center justify-center px-16 py-8" aria-live="polite" data-testid={`stage-screen-${s.kind}`}>
        <Screen s={s} onPlay={() => setPlaying(true)} />
      </section>
      {playing && s.kind === "entry" && s.video && <StagePlayer video={s.video} poster={s.poster} />}
      <div className="flex items-center justify-between px-10 pb-5 text-xs text-white/40">
        <span>→ / Space next · ← back · Home start · F full screen{s.kind === "entry" ? " · Enter play · Esc stop" : ""}</span>
        <a href={exitHref} className="underline hover:text-white">
          Leave stage mode
        </a>
      </div>
    </div>
  );
}

/**
 * The capture over the whole stage: black around it, the picture at a whole number of screen pixels per pixel,
 * nearest-neighbour. Mounted fresh for every play, so it starts from the beginning; sound on (the Enter key that
 * started it is the user gesture browsers ask for before playing sound).
 */
function StagePlayer({ video, poster }: { video: StageVideo; poster: string | null }) {
  const [screen, setScreen] = useState<{ w: number; h: number; dpr: number } | null>(null);
  const [source, setSource] = useState<{ width: number; height: number }>(STAGE_SOURCE);
  const [ended, setEnded] = useState(false);
  useEffect(() => {
    const measure = () => setScreen({ w: window.innerWidth, h: window.innerHeight, dpr: window.devicePixelRatio });
    measure();
    window.addEventListener("resize", measure);
    return () => window.removeEventListener("resize", measure);
  }, []);
  const fit = screen ? stageFitCss(screen.w, screen.h, screen.dpr, source) : null;
  return (
    <div className="fixed inset-0 z-[60] bg-black" data-testid="stage-player">
      {fit && (
        <video
          key={video.src}
          autoPlay
          playsInline
          preload="auto"
          poster={poster ?? undefined}
          onLoadedMetadata={(ev) => {
            const v = ev.currentTarget;
            v.currentTime = 0;
            // The reference capture is 640×480; a crew's own video is fitted by its own size, by the same rule.
            if (v.videoWidth > 0 && v.videoHeight > 0 && (v.videoWidth !== source.width || v.videoHeight !== source.height)) setSource({ width: v.videoWidth, height: v.videoHeight });
          }}
          onEnded={() => setEnded(true)}
          className="absolute bg-black"
          style={{ imageRendering: "pixelated", left: fit.left, top: fit.top, width: fit.width, height: fit.height }}
          data-testid="stage-video"
          data-scale={fit.scale}
          data-whole={fit.whole ? "yes" : "no"}
          data-source={video.source}
        >
          <source src={video.src} type={video.type} />
        </video>
      )}
      {ended && (
        <p className="absolute inset-x-0 bottom-6 text-center text-xl text-white/60" data-testid="stage-video-ended">
          End of the capture · → next · Esc back to the entry
        </p>
      )}
    </div>
  );
}

function Screen({ s, onPlay }: { s: StageScreen; onPlay: () => void }) {
  switch (s.kind) {
    case "intro":
      return (
        <div className="max-w-5xl text-center">
          <p className="text-2xl font-semibold uppercase tracking-[0.35em] text-[#ff7a3d]">{s.eventTitle}</p>
          <h1 className="mt-6 text-8xl font-extrabold leading-none">{s.title}</h1>
          <p className="mx-auto mt-8 max-w-3xl text-3xl text-white/80">{s.description}</p>
          <p className="mt-10 text-2xl text-white/60">
            {s.entryCount} entries on the big screen{s.heldBack ? ` · ${s.heldBack} held back by the flash check` : ""}
          </p>
        </div>
      );
    case "flash-warning":
      return (
        <div role="alert" className="max-w-6xl rounded-2xl border-8 border-[#ff4f7b] bg-[#3a0d1e] px-14 py-12 text-center" data-testid="stage-flash-warning">
          <p className="text-3xl font-semibold uppercase tracking-[0.3em] text-[#ffd1dd]">Photosensitivity warning</p>
          <h2 className="mt-6 text-7xl font-extrabold leading-tight">The next entry may flash</h2>
          <p className="mt-6 text-4xl font-semibold text-white">{s.title}</p>
          <p className="mt-6 text-3xl text-white/90" data-testid="flash-statement">{s.flash.statement}</p>
          <p className="mt-8 text-3xl font-extrabold text-[#ffd1dd]">If flashing lights affect you, look away from the screen now.</p>
          <p className="mx-auto mt-8 max-w-4xl text-xl text-white/70">{STAGE_FLASH_CAUTION}</p>
          <p className="mt-6 text-xl text-white/60" data-testid="stage-signoff">
            Shown on the sign-off of {s.signOff.by}, {formatInZone(s.signOff.at, s.timeZone)}.
          </p>
        </div>
      );
    case "entry":
      return (
        <div className={`grid w-full max-w-[110rem] grid-cols-[3fr_2fr] items-center gap-12`}>
          <div className="relative">
            {s.flagged && (
              <div role="alert" className="mb-4 rounded-lg border-4 border-[#ff4f7b] bg-[#3a0d1e] px-6 py-4 text-2xl font-extrabold text-[#ffd1dd]" data-testid="stage-flash-flagged">
                ⚠ Flash warning — {s.flash.statement} Shown on an organizer's sign-off.
              </div>
            )}
            {!s.video ? (
              <div className="flex aspect-[4/3] items-center justify-center rounded-xl border-2 border-dashed border-white/30 text-3xl text-white/60" data-testid="player-not-ready">
                Reference capture not ready yet
              </div>
            ) : (
              <div className="flex aspect-[4/3] flex-col items-center justify-center gap-5 rounded-xl border-2 border-[#ffb020] bg-[#2a1e05] p-10 text-center" data-testid="photosensitivity-gate">
                <p className="text-3xl font-extrabold text-[#ffd37a]">Photosensitivity warning</p>
                <p className="text-2xl text-white/85">This capture may flash. Look away if flashing lights affect you.</p>
                <p className="text-2xl font-semibold text-white" data-testid="flash-statement">{s.flash.statement}</p>
                <p className="text-lg text-white/60">{STAGE_AUDIO_CAUTION}</p>
                <p className="text-base text-white/50">{s.video.source === "crew" ? "Plays the crew's own video" : "Plays the reference capture"}, from the start, with sound, full screen.</p>
                <button type="button" onClick={onPlay} className="rounded-lg bg-[#ff7a3d] px-6 py-3 text-2xl font-extrabold text-[#0e0b16]">
                  Play (Enter)
                </button>
              </div>
            )}
          </div>
          <div>
            <p className="text-3xl font-semibold text-[#ff7a3d]">
              Entry {s.position} of {s.total}
            </p>
            <h2 className="mt-3 text-7xl font-extrabold leading-tight" data-testid="stage-entry-title">{s.title}</h2>
            <p className="mt-4 text-4xl text-white/80">{s.crew ? `by ${s.crew}` : "crew revealed with the results"}</p>
            <div className="mt-10 text-3xl">
              <ShowcaseStats stats={s.stats} tone="dark" compact />
            </div>
          </div>
        </div>
      );
    case "vote":
      return (
        <div className="flex items-center gap-20">
          <div className="rounded-2xl bg-white p-6" data-testid="stage-qr" role="img" aria-label={`QR code for ${s.url}`} dangerouslySetInnerHTML={{ __html: s.qrSvg.replace("<svg ", '<svg width="420" height="420" ') }} />
          <div className="max-w-3xl">
            <p className="text-3xl font-semibold uppercase tracking-[0.3em] text-[#ff7a3d]">Vote now</p>
            <h2 className="mt-4 text-8xl font-extrabold leading-none">Your turn.</h2>
            <p className="mt-8 break-all font-mono text-4xl text-white">{s.url}</p>
            <p className="mt-6 text-3xl text-white/70">
              {s.method === "points" ? "Give every entry 0–5 points." : "Rank the entries, favourite first."} Sign in, or use the code on your slip.
              {s.closesAt ? ` Voting closes ${new Date(s.closesAt).toLocaleString("en-GB", { timeZone: s.timeZone, weekday: "long", hour: "2-digit", minute: "2-digit" })}.` : ""}
            </p>
          </div>
        </div>
      );
    case "reveal-intro":
      return (
        <div className="text-center">
          <p className="text-3xl font-semibold uppercase tracking-[0.35em] text-[#ff7a3d]">The results</p>
          <h2 className="mt-6 text-8xl font-extrabold">From last place to first</h2>
          <p className="mt-8 text-3xl text-white/60">{s.entryCount} entries · published version {s.version}</p>
        </div>
      );
    case "reveal":
      return (
        <div className="text-center" data-testid="stage-reveal">
          <p className={`font-extrabold leading-none tabular-nums ${s.place === 1 ? "text-[14rem] text-[#ff7a3d]" : "text-[10rem] text-white/90"}`}>
            {s.place}
            {s.tied ? "=" : ""}
            <span className="align-top text-5xl">{ordinal(s.place)}</span>
          </p>
          <h2 className="mt-4 text-7xl font-extrabold">{s.title}</h2>
          <p className="mt-4 text-4xl text-white/80">by {s.crew}</p>
          <p className="mt-8 text-2xl text-white/50 tabular-nums">
            mixed {s.mixed.toFixed(3)} · jury {s.juryScore === null ? "—" : s.juryScore.toFixed(3)} · audience {s.audienceScore === null ? "—" : s.audienceScore.toFixed(2)}
          </p>
        </div>
      );
    case "award":
      return (
        <div className="text-center" data-testid="stage-award">
          <p className="text-3xl font-semibold uppercase tracking-[0.35em] text-[#ff7a3d]">Award</p>
          <h2 className="mt-6 text-8xl font-extrabold leading-none">{s.award}</h2>
          <p className="mt-10 text-6xl font-extrabold">{s.title}</p>
          <p className="mt-4 text-4xl text-white/80">by {s.crew}</p>
          {s.citation && <p className="mx-auto mt-8 max-w-4xl text-3xl text-white/70">{s.citation}</p>}
        </div>
      );
    case "end":
      return (
        <div className="text-center">
          <h2 className="text-8xl font-extrabold">Thank you</h2>
          <p className="mt-6 text-3xl text-white/60">{s.title} — on Gatecrash</p>
        </div>
      );
  }
}

function ordinal(n: number): string {
  const t = n % 100;
  if (t >= 11 && t <= 13) return "th";
  return ["th", "st", "nd", "rd"][n % 10] ?? "th";
}

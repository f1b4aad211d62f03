import { useEffect, useState } from "react";

/**
 * A live countdown to the upload cutoff, computed in the browser from the instant (so it is right across
 * daylight-saving changes), with the cutoff shown in the visitor's time zone and in the event's.
 */
const fmt = (d: Date, timeZone?: string) =>
  new Intl.DateTimeFormat("en-GB", { dateStyle: "medium", timeStyle: "long", timeZone }).format(d);

function parts(ms: number) {
  const s = Math.max(0, Math.floor(ms / 1000));
  return { d: Math.floor(s / 86400), h: Math.floor((s % 86400) / 3600), m: Math.floor((s % 3600) / 60), s: s % 60 };
}

export function UploadCountdown({ cutoffIso, eventTimeZone, graceMinutes }: { cutoffIso: string; eventTimeZone: string; graceMinutes: number }) {
  const cutoff = new Date(cutoffIso);
  const [now, setNow] = useState<number | null>(null);
  const [zone, setZone] = useState<string | null>(null);
  useEffect(() => {
    setZone(Intl.DateTimeFormat().resolvedOptions().timeZone);
    setNow(Date.now());
    const t = setInterval(() => setNow(Date.now()), 1000);
    return () => clearInterval(t);
  }, []);
  const left = now === null ? null : cutoff.getTime() - now;
  const p = left === null ? null : parts(left);
  return (
    <div className="card" data-testid="countdown">
      <p className="kicker">Uploads close</p>
      <p className="mt-1 font-mono text-3xl font-extrabold tabular-nums" aria-live="off" data-testid="countdown-value">
        {p === null ? "…" : left! <= 0 ? "Closed" : `${p.d}d ${String(p.h).padStart(2, "0")}:${String(p.m).padStart(2, "0")}:${String(p.s).padStart(2, "0")}`}
      </p>
      <dl className="mt-2 grid gap-1 text-sm text-ink-soft">
        {zone && zone !== eventTimeZone && (
          <div>
            <dt className="inline font-medium">Your time ({zone}): </dt>
            <dd className="inline">{fmt(cutoff, zone)}</dd>
          </div>
        )}
        <div>
          <dt className="inline font-medium">Event time ({eventTimeZone}): </dt>
          <dd className="inline">{fmt(cutoff, eventTimeZone)}</dd>
        </div>
      </dl>
      {graceMinutes > 0 && <p className="mt-1 text-xs text-mute">Includes {graceMinutes} minutes of grace. The server's clock decides.</p>}
    </div>
  );
}

import { useEffect, useState } from "react";
import { formatInZone } from "~/competitions/zone-format";
import { countdownText } from "~/entries/deadline";

/**
 * A live countdown to the upload cutoff (the server's `cutoffOf`, passed in as an instant), counted in real
 * elapsed time by the tested `countdownText` (so it is right across daylight-saving changes), with the cutoff
 * shown in the visitor's time zone and in the event's through the one `formatInZone`.
 */
const fmt = (d: Date, timeZone: string) => formatInZone(d, timeZone, { seconds: true });

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
  return (
    <div className="card" data-testid="countdown">
      <p className="kicker">Uploads close</p>
      <p className="mt-1 font-mono text-3xl font-extrabold tabular-nums" aria-live="off" data-testid="countdown-value">
        {now === null ? "…" : countdownText(new Date(now), cutoff)}
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

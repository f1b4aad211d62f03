/**
 * Deadlines. Times are instants (UTC); the event's time zone only matters for showing them and for turning an
 * organizer's wall-clock time into an instant. An upload is on time when the server completes it strictly before
 * deadline + grace; at that instant and after it is late.
 */
export function cutoffOf(deadlineAt: Date | null, graceMinutes: number): Date | null {
  return deadlineAt ? new Date(deadlineAt.getTime() + graceMinutes * 60_000) : null;
}

export function isOnTime(completedAt: Date, deadlineAt: Date | null, graceMinutes: number): boolean {
  const cutoff = cutoffOf(deadlineAt, graceMinutes);
  return cutoff === null || completedAt.getTime() < cutoff.getTime();
}

/** Milliseconds until the cutoff, never negative (a countdown). Independent of any time zone. */
export function remainingMs(now: Date, cutoff: Date): number {
  return Math.max(0, cutoff.getTime() - now.getTime());
}

export function splitDuration(ms: number): { days: number; hours: number; minutes: number; seconds: number } {
  const s = Math.floor(ms / 1000);
  return { days: Math.floor(s / 86400), hours: Math.floor((s % 86400) / 3600), minutes: Math.floor((s % 3600) / 60), seconds: s % 60 };
}

/** The UTC offset (minutes east) that `timeZone` has at `instant`, read through Intl (the IANA tz database). */
export function offsetMinutes(instant: Date, timeZone: string): number {
  const parts = new Intl.DateTimeFormat("en-US", {
    timeZone,
    hourCycle: "h23",
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
    minute: "2-digit",
    second: "2-digit",
  }).formatToParts(instant);
  const get = (t: string) => Number(parts.find((p) => p.type === t)?.value);
  const asUtc = Date.UTC(get("year"), get("month") - 1, get("day"), get("hour"), get("minute"), get("second"));
  return Math.round((asUtc - Math.floor(instant.getTime() / 1000) * 1000) / 60_000);
}

/**
 * The instant at which the wall clock in `timeZone` shows `wall` ("YYYY-MM-DDTHH:MM"). A wall time skipped by a
 * daylight-saving jump does not exist and is refused; a repeated one (clocks going back) takes the earlier instant.
 */
export function zonedWallTimeToInstant(wall: string, timeZone: string): Date {
  const m = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2}))?$/.exec(wall);
  if (!m) throw new Error(`not a wall-clock time: ${wall}`);
  const naive = Date.UTC(+m[1], +m[2] - 1, +m[3], +m[4], +m[5], +(m[6] ?? 0));
  const candidates = new Set<number>();
  for (const probe of [naive - 36 * 3600_000, naive, naive + 36 * 3600_000]) {
    candidates.add(naive - offsetMinutes(new Date(probe), timeZone) * 60_000);
  }
  const fits = [...candidates].filter((t) => t + offsetMinutes(new Date(t), timeZone) * 60_000 === naive).sort((a, b) => a - b);
  if (fits.length === 0) throw new Error(`${wall} does not exist in ${timeZone} (the clocks skip it)`);
  return new Date(fits[0]);
}

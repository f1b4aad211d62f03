/**
 * Deadlines. Times are instants (UTC); the event's time zone only matters for showing them and for turning an
 * organizer's wall-clock time into an instant (app/competitions/timezone.ts). An upload is on time when the server completes it strictly before
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

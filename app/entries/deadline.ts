/**
 * Deadlines. Times are instants (UTC); the event's time zone only matters for showing them and for turning an
 * organizer's wall-clock time into an instant (app/competitions/timezone.ts). An upload is on time when the server completes it strictly before
 * deadline + grace; at that instant and after it is late. `cutoffOf` is the one cut-off: the entry page, its
 * countdown, the compo pages, late exceptions and the upload state machine all take it from here.
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
  const s = Math.max(0, Math.floor(ms / 1000));
  return { days: Math.floor(s / 86400), hours: Math.floor((s % 86400) / 3600), minutes: Math.floor((s % 3600) / 60), seconds: s % 60 };
}

/** What the upload countdown shows at `now`: "1d 02:03:04" of real elapsed time, or "Closed" from the cutoff on. */
export function countdownText(now: Date, cutoff: Date): string {
  const left = remainingMs(now, cutoff);
  if (left <= 0) return "Closed";
  const p = splitDuration(left);
  const two = (n: number) => String(n).padStart(2, "0");
  return `${p.days}d ${two(p.hours)}:${two(p.minutes)}:${two(p.seconds)}`;
}

export type Timeliness = "on-time" | "exception" | "late";

/**
 * Whether an upload completed at `at` counts: before the cutoff it is on time; after it, it still counts while an
 * organizer's late exception for the entry runs (strictly before `lateUntil`); otherwise it is late.
 */
export function timelinessOf(at: Date, deadlineAt: Date | null, graceMinutes: number, lateUntil: Date | null): Timeliness {
  if (isOnTime(at, deadlineAt, graceMinutes)) return "on-time";
  return lateUntil && at.getTime() < lateUntil.getTime() ? "exception" : "late";
}

/** Competition states in which an entry's own late exception still lets it upload (judging and results never). */
export const EXCEPTION_STATES: readonly string[] = ["open", "closed"];

/** Whether the entry takes uploads (and a change of its final pick) now: open and on time, or within its exception. */
export function uploadWindowOpen(competitionState: string, entryState: string, when: Timeliness): boolean {
  if (entryState !== "active" || when === "late") return false;
  return competitionState === "open" || (when === "exception" && EXCEPTION_STATES.includes(competitionState));
}

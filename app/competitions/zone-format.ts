/**
 * Kept free of Temporal (app/competitions/timezone.ts holds the conversions): browser components that only show
 * an instant import this module and do not load the polyfill.
 */
/**
 * The one human form of an instant in a zone, for pages, mail and the countdown: "28 Mar 2027, 20:00 CEST"
 * (with `seconds`, "28 Mar 2027, 20:00:00 CEST"). The zone's abbreviation comes from the engine's Intl data.
 */
export function formatInZone(instant: Date | string, tz: string, opts: { seconds?: boolean } = {}): string {
  // dateStyle/timeStyle cannot be combined with timeZoneName, so the parts are named one by one.
  return new Intl.DateTimeFormat("en-GB", {
    day: "numeric",
    month: "short",
    year: "numeric",
    hour: "2-digit",
    minute: "2-digit",
    ...(opts.seconds ? { second: "2-digit" as const } : {}),
    hourCycle: "h23",
    timeZone: tz,
    timeZoneName: "short",
  }).format(typeof instant === "string" ? new Date(instant) : instant);
}

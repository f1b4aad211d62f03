import { Temporal } from "temporal-polyfill";

/**
 * Wall-clock times in an event's time zone <-> UTC instants, through Temporal (the temporal-polyfill package,
 * which reads the IANA time zone database as the JavaScript engine ships it in Intl). Gaps and overlaps of a
 * daylight-saving change are Temporal's `disambiguation`, not arithmetic of ours.
 */

/** True when the IANA zone name is known (e.g. "Europe/Berlin"). */
export function isValidTimeZone(tz: string): boolean {
  if (!tz || typeof tz !== "string") return false;
  try {
    Temporal.Instant.fromEpochMilliseconds(0).toZonedDateTimeISO(tz);
    return true;
  } catch (e) {
    if (e instanceof RangeError) return false;
    throw e;
  }
}

export function timeZoneNames(): string[] {
  const intl = Intl as unknown as { supportedValuesOf?: (k: string) => string[] };
  return intl.supportedValuesOf ? intl.supportedValuesOf("timeZone") : ["UTC"];
}

function zoned(instant: Date, tz: string): Temporal.ZonedDateTime {
  return Temporal.Instant.fromEpochMilliseconds(instant.getTime()).toZonedDateTimeISO(tz);
}

/** Offset of the zone from UTC at an instant, in minutes (east positive). */
export function zoneOffsetMinutes(instant: Date, tz: string): number {
  return Math.round(zoned(instant, tz).offsetNanoseconds / 60e9);
}

const LOCAL = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2}))?$/;

export type ZonedResult =
  | { ok: true; utc: Date; ambiguous: boolean }
  | { ok: false; reason: "format" | "nonexistent" };

/**
 * "2027-03-28T02:30" (seconds optional) in tz -> the UTC instant. A wall time that the clocks skip (spring forward) is refused as
 * "nonexistent"; one that happens twice (fall back) resolves to the first occurrence and says `ambiguous`.
 */
export function zonedWallTimeToUtc(local: string, tz: string): ZonedResult {
  const m = LOCAL.exec(local);
  if (!m) return { ok: false, reason: "format" };
  const fields = { year: +m[1], month: +m[2], day: +m[3], hour: +m[4], minute: +m[5], second: +(m[6] ?? 0) };
  let wall: Temporal.PlainDateTime;
  try {
    // "reject" refuses 31 February, hour 24, second 60 … instead of clamping them
    wall = Temporal.PlainDateTime.from(fields, { overflow: "reject" });
  } catch (e) {
    if (e instanceof RangeError) return { ok: false, reason: "format" };
    throw e;
  }
  const earlier = wall.toZonedDateTime(tz, { disambiguation: "earlier" });
  const later = wall.toZonedDateTime(tz, { disambiguation: "later" });
  // In a gap Temporal moves the time by the gap's length, so the wall clock no longer reads what was asked.
  if (!earlier.toPlainDateTime().equals(wall)) return { ok: false, reason: "nonexistent" };
  return { ok: true, utc: new Date(earlier.epochMilliseconds), ambiguous: earlier.epochMilliseconds !== later.epochMilliseconds };
}

/** The instant as "YYYY-MM-DDTHH:mm" on the zone's wall clock (the value a datetime-local input shows). */
export function utcToZonedWallTime(instant: Date, tz: string): string {
  return zoned(instant, tz).toPlainDateTime().toString({ smallestUnit: "minute" });
}

// The one formatInZone lives apart from Temporal, so pages that only show dates do not load the polyfill.
export { formatInZone } from "./zone-format";

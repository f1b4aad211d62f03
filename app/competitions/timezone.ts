/**
 * Wall-clock times in an event's time zone <-> UTC instants, with the IANA time zone database as shipped in Intl.
 * No offsets are hard-coded: every answer is checked by formatting the candidate instant back through Intl.
 */

/** True when Intl knows the IANA zone name (e.g. "Europe/Berlin"). */
export function isValidTimeZone(tz: string): boolean {
  if (!tz || typeof tz !== "string") return false;
  try {
    new Intl.DateTimeFormat("en-US", { timeZone: tz });
    return true;
  } catch {
    return false;
  }
}

export function timeZoneNames(): string[] {
  const intl = Intl as unknown as { supportedValuesOf?: (k: string) => string[] };
  return intl.supportedValuesOf ? intl.supportedValuesOf("timeZone") : ["UTC"];
}

const partsCache = new Map<string, Intl.DateTimeFormat>();
function formatter(tz: string): Intl.DateTimeFormat {
  let f = partsCache.get(tz);
  if (!f) {
    f = new Intl.DateTimeFormat("en-US", {
      timeZone: tz,
      hourCycle: "h23",
      year: "numeric",
      month: "2-digit",
      day: "2-digit",
      hour: "2-digit",
      minute: "2-digit",
      second: "2-digit",
    });
    partsCache.set(tz, f);
  }
  return f;
}

interface Wall {
  y: number;
  mo: number;
  d: number;
  h: number;
  mi: number;
  s: number;
}

function wallOf(instant: Date, tz: string): Wall {
  const p = Object.fromEntries(formatter(tz).formatToParts(instant).map((x) => [x.type, x.value]));
  return { y: +p.year, mo: +p.month, d: +p.day, h: +p.hour % 24, mi: +p.minute, s: +p.second };
}

/** Offset of the zone from UTC at an instant, in minutes (east positive). */
export function zoneOffsetMinutes(instant: Date, tz: string): number {
  const w = wallOf(instant, tz);
  const asUtc = Date.UTC(w.y, w.mo - 1, w.d, w.h, w.mi, w.s);
  return Math.round((asUtc - Math.floor(instant.getTime() / 1000) * 1000) / 60_000);
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
  const want: Wall = { y: +m[1], mo: +m[2], d: +m[3], h: +m[4], mi: +m[5], s: +(m[6] ?? 0) };
  if (want.mo < 1 || want.mo > 12 || want.d < 1 || want.d > 31 || want.h > 23 || want.mi > 59 || want.s > 59) return { ok: false, reason: "format" };
  const naive = Date.UTC(want.y, want.mo - 1, want.d, want.h, want.mi, want.s);
  if (new Date(naive).getUTCDate() !== want.d) return { ok: false, reason: "format" }; // 31 February etc.
  // Candidate offsets: the zone's offsets a day either side cover every transition of that day.
  const offsets = new Set<number>();
  for (const delta of [-36, -12, 0, 12, 36]) offsets.add(zoneOffsetMinutes(new Date(naive + delta * 3_600_000), tz));
  const hits: number[] = [];
  for (const off of offsets) {
    const t = naive - off * 60_000;
    const w = wallOf(new Date(t), tz);
    if (w.y === want.y && w.mo === want.mo && w.d === want.d && w.h === want.h && w.mi === want.mi && w.s === want.s) hits.push(t);
  }
  if (hits.length === 0) return { ok: false, reason: "nonexistent" };
  const unique = [...new Set(hits)].sort((a, b) => a - b);
  return { ok: true, utc: new Date(unique[0]), ambiguous: unique.length > 1 };
}

const pad = (n: number) => String(n).padStart(2, "0");

/** The instant as "YYYY-MM-DDTHH:mm" on the zone's wall clock (the value a datetime-local input shows). */
export function utcToZonedWallTime(instant: Date, tz: string): string {
  const w = wallOf(instant, tz);
  return `${w.y}-${pad(w.mo)}-${pad(w.d)}T${pad(w.h)}:${pad(w.mi)}`;
}

/** Human form in a zone, e.g. "28 Mar 2027, 20:00 CEST". */
export function formatInZone(instant: Date | string, tz: string): string {
  // dateStyle/timeStyle cannot be combined with timeZoneName, so the parts are named one by one.
  return new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric", hour: "2-digit", minute: "2-digit", hourCycle: "h23", timeZone: tz, timeZoneName: "short" }).format(
    typeof instant === "string" ? new Date(instant) : instant,
  );
}

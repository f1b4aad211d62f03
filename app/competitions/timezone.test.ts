import { describe, expect, it } from "vitest";
import { formatInZone, isValidTimeZone, utcToZonedWallTime, zonedWallTimeToUtc, zoneOffsetMinutes } from "./timezone";

/*
 * Reference: the IANA time zone database (through Intl in Node's ICU). Europe/Berlin follows the EU rule:
 * summer time from 01:00 UTC on the last Sunday of March to 01:00 UTC on the last Sunday of October.
 * In 2027 those Sundays are 28 March and 31 October.
 */
const utc = (r: ReturnType<typeof zonedWallTimeToUtc>) => (r.ok ? r.utc.toISOString() : r.reason);

describe("zonedWallTimeToUtc", () => {
  it("converts ordinary winter and summer times", () => {
    expect(utc(zonedWallTimeToUtc("2027-01-15T20:00", "Europe/Berlin"))).toBe("2027-01-15T19:00:00.000Z");
    expect(utc(zonedWallTimeToUtc("2027-07-15T20:00", "Europe/Berlin"))).toBe("2027-07-15T18:00:00.000Z");
    expect(utc(zonedWallTimeToUtc("2027-07-15T20:00", "UTC"))).toBe("2027-07-15T20:00:00.000Z");
    expect(utc(zonedWallTimeToUtc("2027-07-15T20:00", "America/New_York"))).toBe("2027-07-16T00:00:00.000Z");
  });

  it("is right on the spring-forward day in Berlin (2027-03-28)", () => {
    expect(utc(zonedWallTimeToUtc("2027-03-28T01:59", "Europe/Berlin"))).toBe("2027-03-28T00:59:00.000Z"); // still CET
    expect(utc(zonedWallTimeToUtc("2027-03-28T02:30", "Europe/Berlin"))).toBe("nonexistent"); // clocks jump 02:00 -> 03:00
    expect(utc(zonedWallTimeToUtc("2027-03-28T03:00", "Europe/Berlin"))).toBe("2027-03-28T01:00:00.000Z"); // CEST
    expect(utc(zonedWallTimeToUtc("2027-03-28T20:00", "Europe/Berlin"))).toBe("2027-03-28T18:00:00.000Z");
  });

  it("is right on the fall-back day in Berlin (2027-10-31): the repeated hour takes its first occurrence", () => {
    const r = zonedWallTimeToUtc("2027-10-31T02:30", "Europe/Berlin");
    expect(r.ok && r.ambiguous).toBe(true);
    expect(utc(r)).toBe("2027-10-31T00:30:00.000Z"); // 02:30 CEST; the second 02:30 CET would be 01:30Z
    expect(utc(zonedWallTimeToUtc("2027-10-31T01:30", "Europe/Berlin"))).toBe("2027-10-30T23:30:00.000Z");
    expect(utc(zonedWallTimeToUtc("2027-10-31T03:00", "Europe/Berlin"))).toBe("2027-10-31T02:00:00.000Z");
    expect(utc(zonedWallTimeToUtc("2027-10-31T20:00", "Europe/Berlin"))).toBe("2027-10-31T19:00:00.000Z");
  });

  it("agrees with Intl for every quarter hour of both change days (round trip)", () => {
    for (const day of ["2027-03-28", "2027-10-31"]) {
      for (let q = 0; q < 96; q++) {
        const local = `${day}T${String(Math.floor(q / 4)).padStart(2, "0")}:${String((q % 4) * 15).padStart(2, "0")}`;
        const r = zonedWallTimeToUtc(local, "Europe/Berlin");
        if (!r.ok) {
          expect(local >= `${day}T02:00` && local < `${day}T03:00`).toBe(true);
          continue;
        }
        expect(utcToZonedWallTime(r.utc, "Europe/Berlin")).toBe(local);
      }
    }
  });

  it("refuses malformed input", () => {
    expect(utc(zonedWallTimeToUtc("2027-02-31T10:00", "UTC"))).toBe("format");
    expect(utc(zonedWallTimeToUtc("tomorrow", "UTC"))).toBe("format");
  });
});

describe("time zone helpers", () => {
  it("knows IANA names through Intl", () => {
    expect(isValidTimeZone("Europe/Berlin")).toBe(true);
    expect(isValidTimeZone("Mars/Olympus_Mons")).toBe(false);
    expect(isValidTimeZone("")).toBe(false);
  });
  it("keeps seconds: 01:59:59 CET is one second before 03:00 CEST on 2027-03-28 (EU rules, IANA tz database)", () => {
    const before = zonedWallTimeToUtc("2027-03-28T01:59:59", "Europe/Berlin");
    const at = zonedWallTimeToUtc("2027-03-28T03:00", "Europe/Berlin");
    expect(before.ok && at.ok && at.utc.getTime() - before.utc.getTime()).toBe(1000);
    expect(zonedWallTimeToUtc("2027-03-28T01:59:60", "Europe/Berlin")).toEqual({ ok: false, reason: "format" });
  });
  it("reads offsets (CET +60, CEST +120)", () => {
    expect(zoneOffsetMinutes(new Date("2027-01-01T00:00:00Z"), "Europe/Berlin")).toBe(60);
    expect(zoneOffsetMinutes(new Date("2027-07-01T00:00:00Z"), "Europe/Berlin")).toBe(120);
  });
});

/*
 * 2026's changes, from the IANA tz database's `europe` file: Zone Europe/Berlin follows "Rule EU 1981 max - Mar
 * lastSun 1:00u 1:00 S" and "Rule EU 1996 max - Oct lastSun 1:00u 0 -", i.e. 01:00 UTC on the last Sundays of
 * March and October: 2026-03-29 (02:00 CET → 03:00 CEST) and 2026-10-25 (03:00 CEST → 02:00 CET).
 */
describe("Europe/Berlin on 2026's daylight-saving changes (IANA tz database, EU rule)", () => {
  const tz = "Europe/Berlin";
  it("2026-03-29: the hour 02:00–02:59 does not exist; 01:59:59 CET is one second before 03:00 CEST", () => {
    expect(utc(zonedWallTimeToUtc("2026-03-29T01:59:59", tz))).toBe("2026-03-29T00:59:59.000Z");
    expect(utc(zonedWallTimeToUtc("2026-03-29T02:00", tz))).toBe("nonexistent");
    expect(utc(zonedWallTimeToUtc("2026-03-29T02:59:59", tz))).toBe("nonexistent");
    expect(utc(zonedWallTimeToUtc("2026-03-29T03:00", tz))).toBe("2026-03-29T01:00:00.000Z");
    expect(zoneOffsetMinutes(new Date("2026-03-29T00:59:59Z"), tz)).toBe(60);
    expect(zoneOffsetMinutes(new Date("2026-03-29T01:00:00Z"), tz)).toBe(120);
    // the day before it has no gap: the rule is the last Sunday, not a fixed date
    expect(utc(zonedWallTimeToUtc("2026-03-28T02:30", tz))).toBe("2026-03-28T01:30:00.000Z");
  });
  it("2026-10-25: 02:00–02:59 happens twice; the first (CEST) is taken and flagged ambiguous", () => {
    const r = zonedWallTimeToUtc("2026-10-25T02:30", tz);
    expect(r).toEqual({ ok: true, utc: new Date("2026-10-25T00:30:00.000Z"), ambiguous: true });
    expect(utc(zonedWallTimeToUtc("2026-10-25T01:59", tz))).toBe("2026-10-24T23:59:00.000Z");
    expect(zonedWallTimeToUtc("2026-10-25T03:00", tz)).toEqual({ ok: true, utc: new Date("2026-10-25T02:00:00.000Z"), ambiguous: false });
    // both readings of 02:30 are shown with their own abbreviation
    expect(formatInZone("2026-10-25T00:30:00Z", tz)).toBe("25 Oct 2026, 02:30 CEST");
    expect(formatInZone("2026-10-25T01:30:00Z", tz)).toBe("25 Oct 2026, 02:30 CET");
    expect(utcToZonedWallTime(new Date("2026-10-25T01:30:00Z"), tz)).toBe("2026-10-25T02:30");
  });
  it("round-trips every minute of both days that exists, and refuses exactly the skipped hour", () => {
    let refused = 0;
    for (const day of ["2026-03-29", "2026-10-25"]) {
      for (let min = 0; min < 24 * 60; min++) {
        const local = `${day}T${String(Math.floor(min / 60)).padStart(2, "0")}:${String(min % 60).padStart(2, "0")}`;
        const r = zonedWallTimeToUtc(local, tz);
        if (!r.ok) {
          expect(r.reason).toBe("nonexistent");
          expect(local >= "2026-03-29T02:00" && local < "2026-03-29T03:00").toBe(true);
          refused++;
          continue;
        }
        expect(utcToZonedWallTime(r.utc, tz)).toBe(local);
        expect(r.ambiguous).toBe(local >= "2026-10-25T02:00" && local < "2026-10-25T03:00");
      }
    }
    expect(refused).toBe(60);
  });
});

describe("formatInZone", () => {
  it("names the zone's abbreviation (CET in winter, CEST in summer, per the IANA database)", async () => {
    expect(formatInZone(new Date("2027-03-28T18:00:00Z"), "Europe/Berlin")).toMatch(/28 Mar 2027.*20:00.*CEST/);
    expect(formatInZone("2027-01-10T18:00:00Z", "Europe/Berlin")).toMatch(/10 Jan 2027.*19:00.*CET/);
    expect(formatInZone("2027-01-10T18:00:05Z", "Europe/Berlin", { seconds: true })).toBe("10 Jan 2027, 19:00:05 CET");
  });
});

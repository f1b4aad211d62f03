import { describe, expect, it } from "vitest";
import { isValidTimeZone, utcToZonedWallTime, zonedWallTimeToUtc, zoneOffsetMinutes } from "./timezone";

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

describe("formatInZone", () => {
  it("names the zone's abbreviation (CET in winter, CEST in summer, per the IANA database)", async () => {
    const { formatInZone } = await import("./timezone");
    expect(formatInZone(new Date("2027-03-28T18:00:00Z"), "Europe/Berlin")).toMatch(/28 Mar 2027.*20:00.*CEST/);
    expect(formatInZone("2027-01-10T18:00:00Z", "Europe/Berlin")).toMatch(/10 Jan 2027.*19:00.*CET/);
  });
});

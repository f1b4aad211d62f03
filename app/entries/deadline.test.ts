import { describe, expect, it } from "vitest";
import { zoneOffsetMinutes as offsetMinutes } from "~/competitions/timezone";
import { countdownText, cutoffOf, isOnTime, remainingMs, splitDuration } from "./deadline";
import { wallTimeInstant } from "../../tests/support/time";

describe("deadline with grace", () => {
  const deadline = new Date("2027-06-12T20:00:00Z");
  it("is on time just before the cutoff and late at and after it", () => {
    expect(isOnTime(new Date("2027-06-12T19:59:59.999Z"), deadline, 0)).toBe(true);
    expect(isOnTime(new Date("2027-06-12T20:00:00.000Z"), deadline, 0)).toBe(false);
    expect(isOnTime(new Date("2027-06-12T20:00:00.001Z"), deadline, 0)).toBe(false);
  });
  it("adds the grace minutes", () => {
    expect(cutoffOf(deadline, 15)?.toISOString()).toBe("2027-06-12T20:15:00.000Z");
    expect(isOnTime(new Date("2027-06-12T20:14:59Z"), deadline, 15)).toBe(true);
    expect(isOnTime(new Date("2027-06-12T20:15:00Z"), deadline, 15)).toBe(false);
  });
  it("has no cutoff without a deadline", () => {
    expect(isOnTime(new Date(), null, 0)).toBe(true);
  });
});

describe("a deadline on a daylight-saving change (reference: the IANA tz database through Intl)", () => {
  // In Europe/Berlin, on 2027-03-28 the clocks jump from 02:00 CET (UTC+1) to 03:00 CEST (UTC+2) (IANA tz rules for the EU).
  const tz = "Europe/Berlin";
  const wall = (d: Date) => new Intl.DateTimeFormat("en-GB", { timeZone: tz, hourCycle: "h23", dateStyle: "short", timeStyle: "medium" }).format(d);

  it("turns the organizer's wall-clock deadline into the right instant on both sides of the jump", () => {
    const deadline = wallTimeInstant("2027-03-28T03:00", tz);
    expect(deadline.toISOString()).toBe("2027-03-28T01:00:00.000Z");
    expect(wall(deadline)).toBe("28/03/2027, 03:00:00");
    expect(offsetMinutes(deadline, tz)).toBe(120);
    const before = wallTimeInstant("2027-03-28T01:59:59", tz);
    expect(offsetMinutes(before, tz)).toBe(60);
    // 01:59:59 CET is one second before 03:00 CEST, not an hour and a second.
    expect(deadline.getTime() - before.getTime()).toBe(1000);
    expect(isOnTime(before, deadline, 0)).toBe(true);
    expect(isOnTime(deadline, deadline, 0)).toBe(false);
    expect(isOnTime(new Date(deadline.getTime() + 1000), deadline, 0)).toBe(false);
  });

  it("refuses a wall time the clocks skip and takes the first of a repeated one", () => {
    expect(() => wallTimeInstant("2027-03-28T02:30", tz)).toThrow(/does not exist/);
    // 2027-10-31 03:00 CEST → 02:00 CET: 02:30 happens twice; the first is 00:30Z.
    expect(wallTimeInstant("2027-10-31T02:30", tz).toISOString()).toBe("2027-10-31T00:30:00.000Z");
  });

  it("counts down in real elapsed time across the jump", () => {
    const deadline = wallTimeInstant("2027-03-28T03:00", tz);
    const now = wallTimeInstant("2027-03-27T03:00", tz); // the day before, same wall time, but only 23 h earlier
    expect(splitDuration(remainingMs(now, deadline))).toEqual({ days: 0, hours: 23, minutes: 0, seconds: 0 });
    expect(remainingMs(new Date(deadline.getTime() + 5), deadline)).toBe(0);
  });
});

describe("the upload countdown's text across 2026's changes in Europe/Berlin (IANA tz database, EU rule: 2026-03-29 and 2026-10-25)", () => {
  const tz = "Europe/Berlin";
  it("counts real hours: from Saturday 12:00 to Sunday 12:00 is 23 h in March and 25 h in October", () => {
    expect(countdownText(wallTimeInstant("2026-03-28T12:00", tz), wallTimeInstant("2026-03-29T12:00", tz))).toBe("0d 23:00:00");
    expect(countdownText(wallTimeInstant("2026-10-24T12:00", tz), wallTimeInstant("2026-10-25T12:00", tz))).toBe("1d 01:00:00");
  });
  it("counts the cutoff with its grace across the jump: deadline 01:50 CET + 15 min grace = 03:05 CEST", () => {
    const cutoff = cutoffOf(wallTimeInstant("2026-03-29T01:50", tz), 15)!;
    expect(cutoff.toISOString()).toBe("2026-03-29T01:05:00.000Z");
    expect(countdownText(wallTimeInstant("2026-03-29T01:49:59", tz), cutoff)).toBe("0d 00:15:01");
  });
  it("says Closed from the cutoff instant on, and a second before it one second", () => {
    const cutoff = cutoffOf(wallTimeInstant("2026-10-25T02:30", tz), 0)!; // the first 02:30, CEST = 00:30Z
    expect(countdownText(new Date(cutoff.getTime() - 1000), cutoff)).toBe("0d 00:00:01");
    expect(countdownText(cutoff, cutoff)).toBe("Closed");
    // the second 02:30 (CET) is an hour after the cutoff: still closed
    expect(countdownText(new Date("2026-10-25T01:30:00Z"), cutoff)).toBe("Closed");
  });
});

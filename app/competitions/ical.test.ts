import { describe, expect, it } from "vitest";
import { buildCalendar, escapeText, foldLine, icsDateTime } from "./ical";

// Rules from RFC 5545 (Internet Calendaring and Scheduling Core Object Specification), section numbers beside each.
const sample = () =>
  buildCalendar({
    name: "Tiny compo",
    now: new Date("2027-03-01T12:00:00Z"),
    items: [
      {
        uid: "deadline-1@gatecrash",
        summary: "Deadline: Ünïcode, semicolons; and a very long title that certainly goes past seventy-five octets",
        description: "Line one\nLine two, with comma",
        start: new Date("2027-03-28T18:00:00Z"),
      },
      { uid: "voting-1@gatecrash", summary: "Voting", start: new Date("2027-03-29T18:00:00Z"), end: new Date("2027-03-29T21:30:00Z") },
    ],
  });

describe("iCalendar output", () => {
  it("uses CRLF for every line break and ends with CRLF (3.1)", () => {
    const ics = sample();
    expect(ics.endsWith("\r\n")).toBe(true);
    expect(ics.replace(/\r\n/g, "")).not.toMatch(/[\r\n]/);
  });

  it("folds lines at 75 octets with a single leading space on continuations (3.1)", () => {
    const ics = sample();
    const physical = ics.split("\r\n").slice(0, -1);
    for (const l of physical) expect(new TextEncoder().encode(l).length).toBeLessThanOrEqual(75);
    expect(physical.some((l) => l.startsWith(" "))).toBe(true);
    // Unfolding (remove CRLF followed by one space) gives back the logical line.
    const unfolded = ics.replace(/\r\n /g, "");
    expect(unfolded).toContain("SUMMARY:Deadline: Ünïcode\\, semicolons\\; and a very long title that certainly goes past seventy-five octets");
  });

  it("never splits a multi-byte UTF-8 character when folding", () => {
    const folded = foldLine("X:" + "é".repeat(100));
    for (const l of folded.split("\r\n")) {
      const bytes = new TextEncoder().encode(l);
      expect(bytes.length).toBeLessThanOrEqual(75);
      expect(new TextDecoder("utf-8", { fatal: true }).decode(bytes)).toBe(l);
    }
  });

  it("writes UTC date-times in the form 19970714T173000Z (3.3.5)", () => {
    expect(icsDateTime(new Date("1997-07-14T17:30:00Z"))).toBe("19970714T173000Z");
    expect(sample()).toContain("DTSTART:20270328T180000Z");
    expect(sample()).toContain("DTEND:20270329T213000Z");
  });

  it("gives every VEVENT a UID and a DTSTAMP (3.6.1), and the calendar VERSION and PRODID (3.6)", () => {
    const lines = sample().replace(/\r\n /g, "").split("\r\n");
    expect(lines[0]).toBe("BEGIN:VCALENDAR");
    expect(lines).toContain("VERSION:2.0");
    expect(lines.some((l) => l.startsWith("PRODID:"))).toBe(true);
    const events = sample().replace(/\r\n /g, "").split("BEGIN:VEVENT").slice(1);
    expect(events).toHaveLength(2);
    for (const e of events) {
      expect(e).toMatch(/\r\nUID:[^\r\n]+\r\n/);
      expect(e).toMatch(/\r\nDTSTAMP:20270301T120000Z\r\n/);
    }
  });

  it("escapes backslash, semicolon, comma and newline in TEXT (3.3.11)", () => {
    expect(escapeText("a\\b;c,d\ne")).toBe("a\\\\b\\;c\\,d\\ne");
  });
});

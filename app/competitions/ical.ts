/**
 * A small iCalendar (RFC 5545) writer for a competition's dates: CRLF line ends (3.1), lines folded at 75 octets
 * with a leading space on continuation lines (3.1), TEXT escaping of \ ; , and newlines (3.3.11), UTC times in the
 * form 19970714T173000Z (3.3.5), and UID + DTSTAMP on every VEVENT (3.6.1).
 */
export interface CalendarItem {
  uid: string;
  summary: string;
  description?: string;
  location?: string;
  url?: string;
  start: Date;
  /** omitted: an instant (RFC 5545 3.6.1: no DTEND ends the event at its DTSTART) */
  end?: Date;
}

export function icsDateTime(d: Date): string {
  return d.toISOString().replace(/[-:]/g, "").replace(/\.\d{3}/, "");
}

export function escapeText(s: string): string {
  return s.replace(/\\/g, "\\\\").replace(/;/g, "\\;").replace(/,/g, "\\,").replace(/\r\n|\r|\n/g, "\\n");
}

/** Folds one content line so that no physical line exceeds 75 octets, never splitting a UTF-8 character. */
export function foldLine(line: string): string {
  const enc = new TextEncoder();
  const out: string[] = [];
  let current = "";
  let bytes = 0;
  let limit = 75;
  for (const ch of line) {
    const n = enc.encode(ch).length;
    if (bytes + n > limit) {
      out.push(current);
      current = " ";
      bytes = 1;
      limit = 75;
    }
    current += ch;
    bytes += n;
  }
  out.push(current);
  return out.join("\r\n");
}

export function buildCalendar(opts: { name: string; items: CalendarItem[]; now: Date }): string {
  const lines = ["BEGIN:VCALENDAR", "VERSION:2.0", "PRODID:-//Gatecrash//Compo calendar//EN", "CALSCALE:GREGORIAN", `X-WR-CALNAME:${escapeText(opts.name)}`];
  for (const it of opts.items) {
    lines.push("BEGIN:VEVENT", `UID:${it.uid}`, `DTSTAMP:${icsDateTime(opts.now)}`, `DTSTART:${icsDateTime(it.start)}`);
    if (it.end) lines.push(`DTEND:${icsDateTime(it.end)}`);
    lines.push(`SUMMARY:${escapeText(it.summary)}`);
    if (it.description) lines.push(`DESCRIPTION:${escapeText(it.description)}`);
    if (it.location) lines.push(`LOCATION:${escapeText(it.location)}`);
    if (it.url) lines.push(`URL:${it.url}`);
    lines.push("END:VEVENT");
  }
  lines.push("END:VCALENDAR");
  return lines.map(foldLine).join("\r\n") + "\r\n";
}

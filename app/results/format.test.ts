import { parse } from "csv-parse/sync";
import { describe, expect, it } from "vitest";
import { resultsCsv } from "./format";
import type { ResultsPayload } from "./shapes";

/**
 * Results CSV: RFC 4180 framing, read back with csv-parse (a general-purpose CSV reader from npm), and formula
 * injection neutralised as the OWASP "CSV Injection" page advises: a cell that starts with =, +, -, @, tab or
 * carriage return gets a leading single quote, so a spreadsheet shows it as text instead of running it.
 */
function payload(titles: string[]): ResultsPayload {
  return {
    standings: titles.map((title, i) => ({
      place: i + 1,
      tied: false,
      entryId: `00000000-0000-4000-8000-00000000000${i}`,
      title,
      crew: i === 0 ? "@crew" : "Beam Chasers",
      mixed: 1.5 - i,
      jury: { score: -0.25, place: i + 1 },
      audience: { score: 3, place: i + 1 },
    })),
  } as unknown as ResultsPayload;
}

describe("resultsCsv", () => {
  const hostile = ["=HYPERLINK(\"http://evil.test\",\"click\")", "+1+2", "-2+3", "@SUM(A1:A2)", "\tTabbed", "\rReturned", "Plain, with \"quotes\"\nand a line", "=1+1\nsecond line"];
  const rows = parse(resultsCsv(payload(hostile)), { columns: true, relax_quotes: false }) as Record<string, string>[];

  it("neutralises every cell that a spreadsheet would read as a formula", () => {
    expect(rows.map((r) => r.title)).toEqual(["'=HYPERLINK(\"http://evil.test\",\"click\")", "'+1+2", "'-2+3", "'@SUM(A1:A2)", "'\tTabbed", "'\rReturned", "Plain, with \"quotes\"\nand a line", "'=1+1\nsecond line"]);
    expect(rows[0].crew).toBe("'@crew");
  });

  it("keeps numbers as numbers, negative ones included", () => {
    expect(rows[0].jury_score).toBe("-0.25");
    expect(rows[2].mixed).toBe("-0.5");
  });

  it("has the header and CRLF line ends", () => {
    const text = resultsCsv(payload(["A"]));
    expect(text.startsWith("place,tied,entry_id,title,crew,mixed,jury_score,jury_place,audience_score,audience_place\r\n")).toBe(true);
    expect(text.endsWith("\r\n")).toBe(true);
  });
});

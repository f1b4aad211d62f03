import { parse } from "csv-parse/sync";
import { describe, expect, it } from "vitest";
import { toCsv } from "./csv";

describe("CSV exports", () => {
  it("is RFC 4180: CRLF records, quotes around commas, quotes and line breaks, doubled inner quotes (RFC 4180, section 2)", () => {
    const out = toCsv(["a", "b"], [["x,y", 'say "hi"'], ["two\nlines", 3]]);
    expect(out).toBe('a,b\r\n"x,y","say ""hi"""\r\n"two\nlines",3\r\n');
  });

  it("reads back cell for cell with an independent parser (csv-parse)", () => {
    const rows = [["Kelp, Logic", "1", "Ünïcode"], ["", "2.5", "x"]];
    const out = toCsv(["crew", "n", "t"], rows);
    expect(parse(out, { relax_column_count: false })).toEqual([["crew", "n", "t"], ...rows]);
  });

  it("defuses cells a spreadsheet would run as a formula (OWASP CSV injection: = + - @ tab CR)", () => {
    const out = toCsv(["t"], [["=HYPERLINK(\"x\")"], ["+1"], ["-2"], ["@SUM(A1)"], ["\tx"], ["plain"]]);
    const cells = parse(out).slice(1).map((r: string[]) => r[0]);
    expect(cells).toEqual(["'=HYPERLINK(\"x\")", "'+1", "'-2", "'@SUM(A1)", "'\tx", "plain"]);
    // Numbers stay numbers, negative ones included.
    expect(toCsv(["n"], [[-3]])).toBe("n\r\n-3\r\n");
  });

  it("defuses a formula whose cell goes on after a line break (papaparse's own default pattern misses it)", () => {
    const cells = parse(toCsv(["t"], [["=1+1\nsecond line"], ["@cmd\r\nrest"]])).slice(1).map((r: string[]) => r[0]);
    expect(cells).toEqual(["'=1+1\nsecond line", "'@cmd\r\nrest"]);
  });
});

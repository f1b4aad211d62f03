import { stringify } from "csv-stringify/sync";

/**
 * The one CSV writer of the party exports (vote codes, party results): RFC 4180 (CRLF line ends, fields quoted
 * where needed) through csv-stringify, and a text cell that starts with = + - @ or a tab/CR is prefixed with an
 * apostrophe so a spreadsheet shows it as text instead of running it as a formula (OWASP, "CSV Injection").
 * Numbers are written as numbers.
 */
const FORMULA_START = /^[=+\-@\t\r]/;

export function csvText(value: string): string {
  return FORMULA_START.test(value) ? `'${value}` : value;
}

export type CsvCell = string | number | boolean | null | undefined;

export function toCsv(header: string[], rows: CsvCell[][]): string {
  return stringify([header, ...rows], {
    record_delimiter: "\r\n",
    quoted_match: /[\r\n]/, // a bare LF or CR is a line break too
    cast: { string: csvText, boolean: (b) => (b ? "yes" : "no") },
  });
}

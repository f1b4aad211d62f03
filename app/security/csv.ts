import Papa from "papaparse";

/**
 * Not a CSV writer of our own: papaparse's `unparse` does the export, formula escaping included (`escapeFormulae`);
 * this module only fixes the options every Gatecrash CSV shares.
 * Every CSV Gatecrash hands out (results, vote codes): RFC 4180 framing with CRLF line ends by papaparse, and
 * formula injection neutralised — a text cell that starts with =, +, -, @, tab or carriage return gets a leading
 * single quote, so a spreadsheet shows it instead of evaluating it. Numbers stay numbers (a negative score is not a
 * formula). papaparse's own default pattern ends in `.*$` without the multi-line flag and so misses a formula
 * followed by a line break; the pattern below looks at the first character only.
 */
const FORMULA_START = /^[=+\-@\t\r]/;

export type CsvCell = string | number | boolean | null | undefined;

const cellText = (c: CsvCell): string | number => (c === null || c === undefined ? "" : typeof c === "boolean" ? (c ? "yes" : "no") : c);

export function toCsv(header: readonly string[], rows: readonly (readonly CsvCell[])[]): string {
  const body = Papa.unparse({ fields: [...header], data: rows.map((r) => r.map(cellText)) }, { newline: "\r\n", escapeFormulae: FORMULA_START });
  return body + "\r\n";
}

/**
 * Recount a competition from a JSON file: npx tsx scripts/recount.ts FILE
 * Prints {"method", "ranking": [{candidate, score, place, tied}], "details", "warnings"} on stdout.
 * Exit 0 on success, 2 when the file is missing, unreadable or invalid, 1 on an unexpected fault.
 */
import { readFileSync } from "node:fs";
import { resolve } from "node:path";
import { pathToFileURL } from "node:url";
import { ScoringInputError } from "../app/scoring/errors";
import { parseRecountInput, recount } from "../app/scoring/recount";

export interface CliResult {
  code: 0 | 1 | 2;
  stdout: string;
  stderr: string;
}

const USAGE = "usage: recount FILE   (FILE: JSON with method jury-raw | jury-z | points | borda | schulze)";

function fail(message: string): CliResult {
  return { code: 2, stdout: "", stderr: `recount: ${message}\n` };
}

export function runRecount(args: readonly string[], readText: (path: string) => string = (p) => readFileSync(p, "utf8")): CliResult {
  if (args.length !== 1 || args[0].startsWith("-")) return fail(`expected exactly one file\n${USAGE}`);
  const file = args[0];

  let text: string;
  try {
    text = readText(file);
  } catch (error) {
    return fail(`cannot read ${file}: ${(error as NodeJS.ErrnoException).code ?? (error as Error).message}`);
  }

  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (error) {
    return fail(`${file} is not valid JSON: ${(error as Error).message}`);
  }

  const parsed = parseRecountInput(json);
  if (!parsed.ok) return fail(`${file} is not a valid recount file:\n${parsed.message}`);

  try {
    const output = recount(parsed.input);
    const stderr = output.warnings.map((w) => `recount: warning: ${w}\n`).join("");
    return { code: 0, stdout: `${JSON.stringify(output, null, 2)}\n`, stderr };
  } catch (error) {
    if (error instanceof ScoringInputError) return fail(`${file} cannot be counted:\n- ${error.issues.join("\n- ")}`);
    return { code: 1, stdout: "", stderr: `recount: unexpected fault: ${(error as Error).stack ?? String(error)}\n` };
  }
}

/** The command line (the compiled CLI's launcher, scripts/cli.mjs, calls this). */
export function cli(argv: readonly string[]): void {
  const result = runRecount(argv);
  process.stdout.write(result.stdout);
  process.stderr.write(result.stderr);
  process.exitCode = result.code;
}

const invokedDirectly = process.argv[1] !== undefined && import.meta.url === pathToFileURL(resolve(process.argv[1])).href;
if (invokedDirectly) cli(process.argv.slice(2));

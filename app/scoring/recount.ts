import { z } from "zod";
import { tallyBorda, tallyPoints, tallySchulze } from "./ballots";
import { juryStandings } from "./jury";

/**
 * The recount file: a self-contained copy of one competition's scores or ballots, as the web app
 * offers it for download (anonymised), so anyone can recount it with the same code.
 */
const entryId = z.string().min(1, "an entry id cannot be empty");

const criterionSchema = z
  .object({
    id: z.string().min(1, "a criterion id cannot be empty"),
    weight: z.number().positive("a criterion weight must be above 0"),
    min: z.number().optional(),
    max: z.number().optional(),
  })
  .strict();

const scoreSchema = z
  .object({
    judge: z.string().min(1, "a judge id cannot be empty"),
    candidate: entryId,
    criterion: z.string().min(1),
    value: z.number(),
  }); // extra fields (a timestamp, a note) are dropped, not refused

const jurySchema = z
  .object({
    method: z.enum(["jury-raw", "jury-z"]),
    criteria: z.array(criterionSchema).min(1, "at least one criterion is needed"),
    scores: z.array(scoreSchema),
    candidates: z.array(entryId).optional(),
  })
  .strict();

// Ballot contents (range, known entries, duplicates) are checked by the tally, which sets bad ones aside with reasons.
const pointsSchema = z
  .object({
    method: z.literal("points"),
    ballots: z.array(z.object({ points: z.record(z.string(), z.number()) })),
    candidates: z.array(entryId).optional(),
  })
  .strict();

const rankedSchema = z
  .object({
    method: z.enum(["borda", "schulze"]),
    ballots: z.array(z.object({ ranking: z.array(z.string()) })),
    candidates: z.array(entryId).optional(),
  })
  .strict();

export const recountInputSchema = z.discriminatedUnion("method", [jurySchema, pointsSchema, rankedSchema], {
  error: 'method must be one of "jury-raw", "jury-z", "points", "borda", "schulze"',
});

export type RecountInput = z.infer<typeof recountInputSchema>;
export type RecountMethod = RecountInput["method"];

export interface RecountRow {
  candidate: string;
  score: number | null;
  place: number;
  tied: boolean;
}

export interface RecountOutput {
  method: RecountMethod;
  ranking: RecountRow[];
  /** Every figure of the count, as the method's own function returns it. */
  details: unknown;
  /** Things the reader must know: set-aside ballots, missing scores. */
  warnings: string[];
}

export type ParsedRecountInput = { ok: true; input: RecountInput } | { ok: false; message: string };

/** Validates a parsed JSON value as a recount file; the message lists every problem with its path. */
export function parseRecountInput(value: unknown): ParsedRecountInput {
  const parsed = recountInputSchema.safeParse(value);
  return parsed.success ? { ok: true, input: parsed.data } : { ok: false, message: z.prettifyError(parsed.error) };
}

function rowsOf(ranking: readonly RecountRow[]): RecountRow[] {
  return ranking.map(({ candidate, score, place, tied }) => ({ candidate, score, place, tied }));
}

function rejectedWarnings(rejected: readonly { index: number; problems: { message: string }[] }[]): string[] {
  return rejected.map((r) => `ballot ${r.index + 1} set aside: ${r.problems.map((p) => p.message).join("; ")}`);
}

/** Recounts a validated file. Throws ScoringInputError when the scores cannot be counted as given. */
export function recount(input: RecountInput): RecountOutput {
  switch (input.method) {
    case "jury-raw":
    case "jury-z": {
      const result = juryStandings(input, input.method);
      const warnings = result.missing.map((m) =>
        m.kind === "unscored"
          ? `entry "${m.candidate}" has no scores: ${m.treatment}`
          : m.kind === "entry"
            ? `judge "${m.judge}" did not score entry "${m.candidate}": ${m.treatment}`
            : `judge "${m.judge}" did not score "${m.criterion}" for entry "${m.candidate}": ${m.treatment}`,
      );
      return { method: input.method, ranking: rowsOf(result.ranking), details: result, warnings };
    }
    case "points": {
      const result = tallyPoints(input.ballots, input.candidates);
      return { method: input.method, ranking: rowsOf(result.ranking), details: result, warnings: rejectedWarnings(result.rejected) };
    }
    case "borda": {
      const result = tallyBorda(input.ballots, input.candidates);
      return { method: input.method, ranking: rowsOf(result.ranking), details: result, warnings: rejectedWarnings(result.rejected) };
    }
    case "schulze": {
      const result = tallySchulze(input.ballots, input.candidates);
      return { method: input.method, ranking: rowsOf(result.ranking), details: result, warnings: rejectedWarnings(result.rejected) };
    }
  }
}

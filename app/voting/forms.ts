import { z } from "zod";

/** The vote page's form (Conform + zod); the ballot's content is then checked by validateBallot. */
export const voteFormSchema = z.object({
  code: z.string().trim().max(40, "A vote code is 8 letters and digits.").optional(),
  ranking: z.array(z.string()).optional(),
  // Radio values "0".."5"; "" (not rated) arrives as undefined. Range and whole numbers are checked by validateBallot.
  points: z.record(z.string(), z.string().optional()).optional(),
});

export type VoteForm = z.infer<typeof voteFormSchema>;

/** The ballot content the form describes, for the chosen method. */
export function ballotFromForm(method: "points" | "borda" | "schulze", v: VoteForm): unknown {
  if (method === "points") {
    const points: Record<string, number> = {};
    for (const [k, raw] of Object.entries(v.points ?? {})) if (raw !== undefined && raw !== "") points[k] = /^\d+$/.test(raw) ? Number(raw) : (raw as unknown as number);
    return { points };
  }
  return { ranking: v.ranking ?? [] };
}

export const codeSheetSchema = z.object({
  count: z.number({ error: "How many codes? A whole number from 1 to 500." }).int("A whole number, please.").min(1, "At least 1 code.").max(500, "At most 500 codes at a time."),
});

export const publishSchema = z.object({
  note: z.string().trim().max(2000, "Keep the note under 2000 characters.").optional(),
  confirm: z.literal("yes", { error: "Tick the box to confirm: a published version can never change." }),
});

import { z } from "zod";

/** Form schemas of the judging pages (Conform + zod); shared by actions and the browser's validation. */
export const conflictReasonSchema = z.object({
  reason: z
    .string({ error: "Say briefly why, e.g. “I helped write it” or “a friend's crew”." })
    .trim()
    .min(3, "At least 3 characters.")
    .max(300, "At most 300 characters."),
});

export const inviteSchema = z.object({
  intent: z.literal("invite"),
  email: z.email({ error: "An e-mail address, like judge@example.org." }),
});

export const organizerConflictSchema = z.object({
  intent: z.literal("conflict"),
  judgeUserId: z.string({ error: "Choose a judge." }).min(1, "Choose a judge."),
  entryId: z.string({ error: "Choose an entry." }).min(1, "Choose an entry."),
  reason: conflictReasonSchema.shape.reason,
});

export const optionsSchema = z.object({
  intent: z.literal("options"),
  blindJudging: z.preprocess((v) => v === "on" || v === "true", z.boolean()),
  orderMode: z.enum(["shared", "per-judge"], { error: "Choose shared or per-judge order." }),
});

export const lockSchema = z.object({
  intent: z.literal("lock"),
  locked: z.enum(["true", "false"]),
  reason: z.string().trim().max(300, "At most 300 characters.").optional(),
});

export const methodSchema = z.object({
  juryMethod: z.enum(["jury-raw", "jury-z"], { error: "Choose a method." }),
});

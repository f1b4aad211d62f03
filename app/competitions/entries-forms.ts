import { z } from "zod";

export const disqualifySchema = z.object({
  intent: z.literal("disqualify"),
  entryId: z.string().uuid("Pick an entry."),
  reason: z
    .string({ error: "Say why: the crew receives this text." })
    .trim()
    .min(10, "At least 10 characters: the crew receives this text.")
    .max(2000, "At most 2000 characters."),
});

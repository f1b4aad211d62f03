import { z } from "zod";

/** The organizer's party page forms (Conform + zod), one per intent. */
export const partyCodesSchema = z.object({
  intent: z.literal("codes"),
  count: z.number({ error: "How many codes? A whole number from 1 to 500." }).int("A whole number, please.").min(1, "At least 1 code.").max(500, "At most 500 codes at a time."),
  compos: z.array(z.string().uuid(), { error: "Tick at least one compo the codes vote in." }).min(1, "Tick at least one compo the codes vote in."),
});

const winner = z.string().uuid("Choose an entry from the list.").optional();

export const awardSchema = z.object({
  intent: z.enum(["award-add", "award-save"]),
  awardId: z.string().uuid().optional(),
  title: z.string({ error: "Name the award, e.g. “Best sound”." }).trim().min(1, "Name the award, e.g. “Best sound”.").max(120, "Keep it under 120 characters."),
  citation: z.string().trim().max(600, "Keep the citation under 600 characters.").optional(),
  winnerEntryId: winner,
});

export const awardDeleteSchema = z.object({ intent: z.literal("award-delete"), awardId: z.string().uuid() });

export const partyFormSchema = z.discriminatedUnion("intent", [partyCodesSchema, awardSchema, awardDeleteSchema]);

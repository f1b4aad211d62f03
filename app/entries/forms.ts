import { z } from "zod";

export const entryFormSchema = z.object({
  crewId: z.string({ error: "Choose the crew that enters." }).uuid("Choose the crew that enters."),
  title: z.string({ error: "Give the entry a title." }).trim().min(1, "Give the entry a title.").max(100, "At most 100 characters."),
  description: z.string().trim().max(2000, "At most 2000 characters.").default(""),
});

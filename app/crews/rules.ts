import { z } from "zod";

/** Crew rules that need no database: forms, invite lifetime, and who may leave. */
export const INVITE_DAYS = 7;

export const crewFormSchema = z.object({
  handle: z
    .string({ error: "Pick a handle." })
    .trim()
    .toLowerCase()
    .min(2, "At least 2 characters.")
    .max(32, "At most 32 characters.")
    .regex(/^[a-z0-9](?:[a-z0-9-]*[a-z0-9])?$/, "Lowercase letters, digits and inner dashes only."),
  name: z.string({ error: "Give the crew a name." }).trim().min(1, "Give the crew a name.").max(80, "At most 80 characters."),
});

export const inviteFormSchema = z.object({
  intent: z.literal("invite"),
  email: z.string({ error: "Enter an e-mail address." }).trim().toLowerCase().email("That is not an e-mail address."),
});

export type LeaveDecision = { ok: true; deletesCrew: boolean } | { ok: false; message: string };

/**
 * Leaving a crew. A member can always leave. A captain can leave while another captain remains. The last captain
 * must first hand the captaincy to another member; if nobody else is in the crew, the last member may leave only
 * when the crew has no entries (the crew is then deleted) — entries always keep a crew that someone answers for.
 */
export function leaveDecision(a: { role: string; captains: number; members: number; entries: number }): LeaveDecision {
  if (a.role !== "captain" || a.captains > 1) {
    if (a.members > 1) return { ok: true, deletesCrew: false };
  }
  if (a.members === 1) {
    if (a.entries > 0) return { ok: false, message: "You are the only member of a crew with entries. Invite someone and hand over the captaincy before you leave." };
    return { ok: true, deletesCrew: true };
  }
  return { ok: false, message: "You are the last captain. Make another member captain before you leave." };
}

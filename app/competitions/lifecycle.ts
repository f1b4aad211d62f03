import { rulesetSchema } from "~/rules/ruleset";

/** The competition lifecycle draft → open → closed → judging → results, as pure rules (no database). */
export const COMPETITION_STATES = ["draft", "open", "closed", "judging", "results"] as const;
export type CompetitionState = (typeof COMPETITION_STATES)[number];

/** Moves an organizer may make. closed → open re-opens after the deadline was moved later. */
export const TRANSITIONS: Record<CompetitionState, CompetitionState[]> = {
  draft: ["open"],
  open: ["closed"],
  closed: ["open", "judging"],
  judging: ["results"],
  results: [],
};

export const TRANSITION_LABELS: Record<string, string> = {
  "draft>open": "Open for entries",
  "open>closed": "Close entries now",
  "closed>open": "Re-open entries",
  "closed>judging": "Start judging",
  "judging>results": "Mark results out",
};

export interface LifecycleFacts {
  state: CompetitionState;
  deadlineAt: Date | null;
  ruleset: unknown;
}

/** Why the move is not allowed, or null when it is. */
export function transitionProblem(c: LifecycleFacts, to: CompetitionState, now: Date): string | null {
  if (!TRANSITIONS[c.state].includes(to)) return `A competition in state "${c.state}" cannot move to "${to}".`;
  if (to === "open") {
    if (c.ruleset == null) return "Set the ruleset before opening: there is none yet.";
    const parsed = rulesetSchema.safeParse(c.ruleset);
    if (!parsed.success) return `The ruleset is not valid: ${parsed.error.issues[0]?.path.join(".")} ${parsed.error.issues[0]?.message}`.trim();
    if (!c.deadlineAt) return "Set a submission deadline before opening.";
    if (c.deadlineAt.getTime() <= now.getTime()) return "The deadline has passed: move it later before opening.";
  }
  return null;
}

/**
 * When judges may save scores and notes: once entries have closed (closed, judging) and until results are out.
 * While the compo is open the field is still changing; after results, scores are history.
 */
export type ScoringWindow = "entries-open" | "scoring" | "results-out";

export function scoringWindow(state: CompetitionState): ScoringWindow {
  if (state === "draft" || state === "open") return "entries-open";
  return state === "results" ? "results-out" : "scoring";
}

/** Entries stop at the deadline: an open competition whose deadline has come is due to close. */
export function isDue(c: { state: string; deadlineAt: Date | null }, now: Date): boolean {
  return c.state === "open" && c.deadlineAt != null && c.deadlineAt.getTime() <= now.getTime();
}

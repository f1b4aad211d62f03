import type { RecountInput } from "~/scoring/recount";
import type { BallotMethod } from "~/voting/shapes";
import type { HashScheme } from "./canonical";

/**
 * The published results as the server stores them and pages, mails and CSV/text formats read them. A leaf of the
 * results feature: results.server.ts, format.ts, mail.ts and the components import from here, never from each other
 * for their types.
 */
export const RESULTS_FORMAT = "gatecrash-results/1";

export interface SideFigures {
  score: number | null;
  normalised: number;
  place: number | null;
}

export interface StandingRow {
  place: number;
  tied: boolean;
  entryId: string;
  title: string;
  crew: string;
  mixed: number;
  jury: SideFigures;
  audience: SideFigures;
}

export interface ResultsPayload {
  format: typeof RESULTS_FORMAT;
  competition: { id: string; slug: string; title: string; eventSlug: string; eventTitle: string };
  version: number;
  note: string;
  method: { jury: "jury-raw" | "jury-z"; audience: BallotMethod; juryWeightPct: number; audienceWeightPct: number };
  counts: { entries: number; judges: number; scores: number; ballots: number; ballotsSetAside: number };
  criteria: { id: string; name: string; weight: number; min: number; max: number }[];
  standings: StandingRow[];
  rules: { jury: string[]; mix: string[] };
  recount: { jury: RecountInput | null; audience: RecountInput };
}

export type Standings = Omit<ResultsPayload, "version" | "note">;

export interface PublishedVersion {
  id: string;
  version: number;
  sha256: string;
  /** The scheme sha256 was made with (app/results/canonical.ts). */
  hashScheme: HashScheme;
  note: string;
  publishedAt: string;
  payload: ResultsPayload;
}

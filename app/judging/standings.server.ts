import { and, asc, desc, eq, inArray } from "drizzle-orm";
import { db } from "~/db/client.server";
import { criteria as criteriaTable, entries as entriesTable, juryAssignments, scoreHistory, scores, scoresheets, user } from "~/db/schema";
import { ScoringInputError } from "~/scoring/errors";
import { juryStandings, type JudgeScore, type JuryStandings } from "~/scoring/jury";
import type { JudgingCompetition } from "./access.server";
import { conflictMap, criteriaOf, judgedEntries } from "./entries.server";
import { isId } from "~/security/ids";
import type { ScaleCriterion } from "./sheet";

/**
 * Live jury standings: the scores of the assigned judges on the judged entries, conflicted scores left out,
 * counted by app/scoring/jury.ts with the competition's method. Everything the page needs to show the math.
 */
export interface StandingsView {
  method: "jury-raw" | "jury-z";
  criteria: ScaleCriterion[];
  entries: { id: string; title: string; crew: string }[];
  judges: { id: string; name: string }[];
  /** every counted score, for the distribution chart */
  scores: JudgeScore[];
  excludedConflicted: number;
  standings: JuryStandings | null;
  problem: string[] | null;
}

export async function standingsFor(c: JudgingCompetition, method: "jury-raw" | "jury-z" = c.juryMethod): Promise<StandingsView> {
  const criteria = await criteriaOf(c.id);
  const { entries } = await judgedEntries(c.id);
  const judges = await db()
    .select({ id: user.id, name: user.name })
    .from(juryAssignments)
    .innerJoin(user, eq(user.id, juryAssignments.judgeUserId))
    .where(eq(juryAssignments.competitionId, c.id))
    .orderBy(asc(user.name));
  const entryIds = entries.map((e) => e.id);
  const judgeIds = judges.map((j) => j.id);
  const rows =
    entryIds.length && judgeIds.length
      ? await db()
          .select({ judge: scoresheets.judgeUserId, candidate: scoresheets.entryId, criterion: scores.criterionId, value: scores.value })
          .from(scores)
          .innerJoin(scoresheets, eq(scoresheets.id, scores.scoresheetId))
          .where(and(inArray(scoresheets.entryId, entryIds), inArray(scoresheets.judgeUserId, judgeIds)))
      : [];
  const conflicted = await conflictMap(judgeIds, entries);
  const counted = rows.filter((r) => !conflicted.has(`${r.judge}:${r.candidate}`));
  const base = {
    method,
    criteria,
    entries: entries.map((e) => ({ id: e.id, title: e.title, crew: e.crewName })),
    judges,
    scores: counted,
    excludedConflicted: rows.length - counted.length,
  };
  if (criteria.length === 0) return { ...base, standings: null, problem: ["This compo has no criteria yet."] };
  try {
    const standings = juryStandings(
      { criteria: criteria.map((cr) => ({ id: cr.id, weight: cr.weight, min: cr.scaleMin, max: cr.scaleMax })), scores: counted, candidates: entryIds },
      method,
    );
    return { ...base, standings, problem: null };
  } catch (e) {
    if (e instanceof ScoringInputError) return { ...base, standings: null, problem: e.issues };
    throw e;
  }
}

export interface HistoryRow {
  id: string;
  judge: string;
  criterion: string;
  oldValue: string | null;
  newValue: string | null;
  changedBy: string;
  changedAt: string;
}

/** Every change to every scoresheet of one entry, newest first. */
export async function historyFor(c: JudgingCompetition, entryId: string | undefined): Promise<{ entry: { id: string; title: string; state: string }; rows: HistoryRow[] } | null> {
  if (!isId(entryId)) return null;
  const [entry] = await db()
    .select({ id: entriesTable.id, title: entriesTable.title, state: entriesTable.state })
    .from(entriesTable)
    .where(and(eq(entriesTable.id, entryId), eq(entriesTable.competitionId, c.id)));
  if (!entry) return null;
  const judgeUser = user;
  const rows = await db()
    .select({
      id: scoreHistory.id,
      judgeId: scoresheets.judgeUserId,
      criterion: criteriaTable.name,
      oldValue: scoreHistory.oldValue,
      newValue: scoreHistory.newValue,
      changedBy: scoreHistory.changedBy,
      changedAt: scoreHistory.changedAt,
    })
    .from(scoreHistory)
    .innerJoin(scoresheets, eq(scoresheets.id, scoreHistory.scoresheetId))
    .leftJoin(criteriaTable, eq(criteriaTable.id, scoreHistory.criterionId))
    .where(eq(scoresheets.entryId, entryId))
    .orderBy(desc(scoreHistory.changedAt), desc(scoreHistory.id));
  const people = new Set<string>();
  for (const r of rows) {
    people.add(r.judgeId);
    if (r.changedBy) people.add(r.changedBy);
  }
  const names = people.size
    ? new Map(
        (await db().select({ id: judgeUser.id, name: judgeUser.name }).from(judgeUser).where(inArray(judgeUser.id, [...people]))).map((u) => [u.id, u.name]),
      )
    : new Map<string, string>();
  return { entry, rows: rows.map((r) => ({
    id: r.id,
    judge: names.get(r.judgeId) ?? "a former account",
    criterion: r.criterion ?? "Note",
    oldValue: r.oldValue,
    newValue: r.newValue,
    changedBy: (r.changedBy && names.get(r.changedBy)) ?? "a former account",
    changedAt: r.changedAt.toISOString(),
  })) };
}

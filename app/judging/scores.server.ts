import { and, eq, sql } from "drizzle-orm";
import { db } from "~/db/client.server";
import { competitions, conflicts, crewMembers, criteria, entries, juryAssignments, scoreHistory, scores, scoresheets, uploads } from "~/db/schema";
import { AppError } from "~/errors/app-error";
import { isId } from "~/security/ids";
import { scaleError } from "./sheet";
import { scoringWindow } from "~/competitions/lifecycle";

/**
 * Saving one score or one note of a judge's scoresheet, in one transaction:
 *  - the competition row is read FOR SHARE, so closing judging (an UPDATE of that row) waits for saves in
 *    flight and every save after it sees the lock;
 *  - the scoresheet row is locked FOR UPDATE, so two tabs' saves of the same sheet run one after the other;
 *  - the client sends the version it saw; anything else is a 409 carrying the current value;
 *  - every change writes a score_history row (who, when, old, new) in the same transaction.
 */
export interface SaveScoreInput {
  judgeUserId: string;
  competitionId: string;
  entryId: string;
  criterionId: string;
  /** null clears the score */
  value: number | null;
  /** the version the client saw; 0 = no score yet */
  version: number;
}

export interface SavedScore {
  entryId: string;
  criterionId: string;
  value: number | null;
  version: number;
}

type Tx = Parameters<Parameters<ReturnType<typeof db>["transaction"]>[0]>[0];

async function guardSheet(tx: Tx, judgeUserId: string, competitionId: string, entryId: string): Promise<string> {
  if (!isId(competitionId) || !isId(entryId)) throw new AppError(404, "not_found", "That entry was not found.");
  const [comp] = await tx
    .select({ locked: competitions.judgingLocked, state: competitions.state })
    .from(competitions)
    .innerJoin(juryAssignments, and(eq(juryAssignments.competitionId, competitions.id), eq(juryAssignments.judgeUserId, judgeUserId)))
    .where(eq(competitions.id, competitionId))
    .for("share", { of: competitions });
  if (!comp) throw new AppError(404, "not_found", "That competition was not found among the ones you judge.");
  const window = scoringWindow(comp.state);
  if (window === "entries-open") throw new AppError(409, "entries_still_open", "This compo is still open for entries: scoring starts once entries close.");
  if (comp.locked || window === "results-out") throw new AppError(423, "judging_closed", "Judging of this compo is closed: scores can no longer change.");
  const [entry] = await tx
    .select({ id: entries.id, crewId: entries.crewId })
    .from(entries)
    .where(
      and(
        eq(entries.id, entryId),
        eq(entries.competitionId, competitionId),
        eq(entries.state, "active"),
        sql`exists (select 1 from ${uploads} where ${uploads.entryId} = ${entries.id} and ${uploads.state} = 'complete')`,
      ),
    );
  if (!entry) throw new AppError(404, "not_found", "That entry is not on your grid.");
  const [member] = await tx
    .select({ one: sql`1` })
    .from(crewMembers)
    .where(and(eq(crewMembers.crewId, entry.crewId), eq(crewMembers.userId, judgeUserId)));
  const [declared] = await tx
    .select({ id: conflicts.id })
    .from(conflicts)
    .where(and(eq(conflicts.entryId, entryId), eq(conflicts.judgeUserId, judgeUserId)));
  if (member || declared) throw new AppError(403, "conflict_of_interest", "You have a conflict with this entry and cannot score it.");

  await tx.insert(scoresheets).values({ entryId, judgeUserId }).onConflictDoNothing({ target: [scoresheets.entryId, scoresheets.judgeUserId] });
  const [sheet] = await tx
    .select({ id: scoresheets.id })
    .from(scoresheets)
    .where(and(eq(scoresheets.entryId, entryId), eq(scoresheets.judgeUserId, judgeUserId)))
    .for("update");
  return sheet.id;
}

export async function saveScore(input: SaveScoreInput): Promise<SavedScore> {
  return db().transaction(async (tx) => {
    const sheetId = await guardSheet(tx, input.judgeUserId, input.competitionId, input.entryId);
    if (!isId(input.criterionId)) throw new AppError(400, "invalid_body", "Some fields are not valid.", { fieldErrors: { criterionId: ["Not a criterion of this compo."] } });
    const [crit] = await tx
      .select({ scaleMin: criteria.scaleMin, scaleMax: criteria.scaleMax })
      .from(criteria)
      .where(and(eq(criteria.id, input.criterionId), eq(criteria.competitionId, input.competitionId)));
    if (!crit) throw new AppError(400, "invalid_body", "Some fields are not valid.", { fieldErrors: { criterionId: ["Not a criterion of this compo."] } });
    if (input.value !== null) {
      const problem = scaleError(crit, input.value);
      if (problem) throw new AppError(400, "invalid_body", "Some fields are not valid.", { fieldErrors: { value: [problem] } });
    }
    const [current] = await tx
      .select({ value: scores.value, version: scores.version })
      .from(scores)
      .where(and(eq(scores.scoresheetId, sheetId), eq(scores.criterionId, input.criterionId)));
    const currentVersion = current?.version ?? 0;
    const currentValue = current?.value ?? null;
    if (input.version !== currentVersion) {
      throw new AppError(409, "stale_version", "This score was changed elsewhere (another tab or device) since you loaded it.", {
        details: { current: { entryId: input.entryId, criterionId: input.criterionId, value: currentValue, version: currentVersion } },
      });
    }
    if (currentValue === input.value) return { entryId: input.entryId, criterionId: input.criterionId, value: currentValue, version: currentVersion };

    let version = 0;
    const now = new Date();
    if (input.value === null) {
      await tx.delete(scores).where(and(eq(scores.scoresheetId, sheetId), eq(scores.criterionId, input.criterionId)));
    } else {
      version = currentVersion + 1;
      await tx
        .insert(scores)
        .values({ scoresheetId: sheetId, criterionId: input.criterionId, value: input.value, version, updatedAt: now })
        .onConflictDoUpdate({ target: [scores.scoresheetId, scores.criterionId], set: { value: input.value, version, updatedAt: now } });
    }
    await tx.insert(scoreHistory).values({
      scoresheetId: sheetId,
      criterionId: input.criterionId,
      oldValue: currentValue === null ? null : String(currentValue),
      newValue: input.value === null ? null : String(input.value),
      changedBy: input.judgeUserId,
      changedAt: now,
    });
    await tx.update(scoresheets).set({ updatedAt: now }).where(eq(scoresheets.id, sheetId));
    return { entryId: input.entryId, criterionId: input.criterionId, value: input.value, version };
  });
}

export const NOTE_MAX = 2000;

export async function saveNote(input: { judgeUserId: string; competitionId: string; entryId: string; note: string; version: number }): Promise<{ entryId: string; note: string; version: number }> {
  return db().transaction(async (tx) => {
    const sheetId = await guardSheet(tx, input.judgeUserId, input.competitionId, input.entryId);
    const [sheet] = await tx.select({ note: scoresheets.note, version: scoresheets.version }).from(scoresheets).where(eq(scoresheets.id, sheetId));
    if (input.version !== sheet.version) {
      throw new AppError(409, "stale_version", "This note was changed elsewhere (another tab or device) since you loaded it.", {
        details: { current: { entryId: input.entryId, note: sheet.note, version: sheet.version } },
      });
    }
    if (sheet.note === input.note) return { entryId: input.entryId, note: sheet.note, version: sheet.version };
    const now = new Date();
    const version = sheet.version + 1;
    await tx.update(scoresheets).set({ note: input.note, version, updatedAt: now }).where(eq(scoresheets.id, sheetId));
    await tx.insert(scoreHistory).values({ scoresheetId: sheetId, criterionId: null, oldValue: sheet.note, newValue: input.note, changedBy: input.judgeUserId, changedAt: now });
    return { entryId: input.entryId, note: input.note, version };
  });
}

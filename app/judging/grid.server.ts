import { and, eq, inArray } from "drizzle-orm";
import { db } from "~/db/client.server";
import { entries as entriesTable, scores, scoresheets } from "~/db/schema";
import { isId } from "~/security/ids";
import type { JudgingCompetition } from "./access.server";
import { conflictMap, criteriaOf, judgedEntries } from "./entries.server";
import { orderSeedFor, seededOrder } from "./order";
import { isFullyScored } from "./sheet";
import type { GridCell, GridData, GridRow } from "./types";

export type { GridData } from "./types";

export function crewVisible(c: Pick<JudgingCompetition, "blindJudging" | "state">): boolean {
  return !c.blindJudging || c.state === "results";
}

/** The judge's ordered, conflict-free list of entry ids for a competition (also used by prev/next on the entry page). */
export async function judgeEntryOrder(judgeUserId: string, c: JudgingCompetition & { assignmentSeed: string }) {
  const { entries, withoutUpload } = await judgedEntries(c.id);
  const conflictsOf = await conflictMap([judgeUserId], entries);
  const visible = entries.filter((e) => !conflictsOf.has(`${judgeUserId}:${e.id}`));
  const order = seededOrder(
    visible.map((e) => e.id),
    orderSeedFor(c.orderMode, c.orderSeed, c.assignmentSeed),
  );
  const byId = new Map(visible.map((e) => [e.id, e]));
  return { ordered: order.map((id) => byId.get(id)!), conflicted: entries.length - visible.length, withoutUpload };
}

export async function gridFor(judgeUserId: string, c: JudgingCompetition & { assignmentSeed: string }): Promise<GridData> {
  const criteria = await criteriaOf(c.id);
  const { ordered, conflicted, withoutUpload } = await judgeEntryOrder(judgeUserId, c);
  const ids = ordered.map((e) => e.id);
  const sheets = ids.length
    ? await db()
        .select({ id: scoresheets.id, entryId: scoresheets.entryId, note: scoresheets.note, version: scoresheets.version })
        .from(scoresheets)
        .where(and(eq(scoresheets.judgeUserId, judgeUserId), inArray(scoresheets.entryId, ids)))
    : [];
  const given = sheets.length
    ? await db()
        .select({ scoresheetId: scores.scoresheetId, criterionId: scores.criterionId, value: scores.value, version: scores.version })
        .from(scores)
        .where(inArray(scores.scoresheetId, sheets.map((s) => s.id)))
    : [];
  const showCrew = crewVisible(c);
  const rows: GridRow[] = ordered.map((e, i) => {
    const sheet = sheets.find((s) => s.entryId === e.id);
    const cells: Record<string, GridCell> = {};
    for (const cr of criteria) {
      const s = sheet ? given.find((g) => g.scoresheetId === sheet.id && g.criterionId === cr.id) : undefined;
      cells[cr.id] = { value: s?.value ?? null, version: s?.version ?? 0 };
    }
    return { entryId: e.id, title: e.title, crew: showCrew ? e.crewName : null, position: i + 1, cells, note: sheet?.note ?? "", noteVersion: sheet?.version ?? 0 };
  });
  const scored = rows.filter((r) => isFullyScored(criteria, Object.fromEntries(Object.entries(r.cells).map(([k, v]) => [k, v.value])))).length;
  return { criteria, rows, conflicted, withoutUpload, scored };
}

export interface JudgeEntryView {
  id: string;
  title: string;
  description: string;
  crew: string | null;
  position: number;
  count: number;
  prevId: string | null;
  nextId: string | null;
}

/**
 * One entry as the judge sees it, with its neighbours in the judge's order. "conflict" when the judge has a
 * conflict with it (they never see it), null when it is not an entry of this competition's grid.
 */
export async function entryForJudge(judgeUserId: string, c: JudgingCompetition & { assignmentSeed: string }, entryId: string | undefined): Promise<JudgeEntryView | "conflict" | null> {
  if (!isId(entryId)) return null;
  const { ordered } = await judgeEntryOrder(judgeUserId, c);
  const i = ordered.findIndex((e) => e.id === entryId);
  if (i < 0) {
    const { entries } = await judgedEntries(c.id);
    return entries.some((e) => e.id === entryId) ? "conflict" : null;
  }
  const [row] = await db().select({ description: entriesTable.description }).from(entriesTable).where(eq(entriesTable.id, entryId));
  const e = ordered[i];
  return {
    id: e.id,
    title: e.title,
    description: row?.description ?? "",
    crew: crewVisible(c) ? e.crewName : null,
    position: i + 1,
    count: ordered.length,
    prevId: ordered[i - 1]?.id ?? null,
    nextId: ordered[i + 1]?.id ?? null,
  };
}

import { and, asc, eq, exists, inArray, sql } from "drizzle-orm";
import { db } from "~/db/client.server";
import { conflicts, crewMembers, crews, criteria, entries, uploads } from "~/db/schema";
import type { ScaleCriterion } from "./sheet";

/**
 * The entries a jury judges: the competition's active entries with a counting upload (a complete one; the
 * newest complete upload is what judges see). Entries still without a complete upload are counted, not shown.
 */
export interface JudgedEntry {
  id: string;
  title: string;
  crewId: string;
  crewName: string;
  crewHandle: string;
}

const hasCountingUpload = () =>
  exists(
    db()
      .select({ one: sql`1` })
      .from(uploads)
      .where(and(eq(uploads.entryId, entries.id), eq(uploads.state, "complete"))),
  );

export async function judgedEntries(competitionId: string): Promise<{ entries: JudgedEntry[]; withoutUpload: number }> {
  const rows = await db()
    .select({ id: entries.id, title: entries.title, crewId: entries.crewId, crewName: crews.name, crewHandle: crews.handle, counted: hasCountingUpload() })
    .from(entries)
    .innerJoin(crews, eq(crews.id, entries.crewId))
    .where(and(eq(entries.competitionId, competitionId), eq(entries.state, "active")))
    .orderBy(asc(entries.title));
  return {
    entries: rows.filter((r) => r.counted).map(({ counted: _c, ...e }) => e),
    withoutUpload: rows.filter((r) => !r.counted).length,
  };
}

export async function criteriaOf(competitionId: string): Promise<ScaleCriterion[]> {
  return db()
    .select({ id: criteria.id, name: criteria.name, weight: criteria.weight, scaleMin: criteria.scaleMin, scaleMax: criteria.scaleMax })
    .from(criteria)
    .where(eq(criteria.competitionId, competitionId))
    .orderBy(asc(criteria.position), asc(criteria.name));
}

export type ConflictKind = "crew" | "declared";

/**
 * Conflicts between the given judges and the given entries: automatic (the judge is a member of the entry's
 * crew; computed every time, never stored) and declared (the conflicts table). Key: `${judgeId}:${entryId}`.
 */
export async function conflictMap(judgeIds: string[], entryList: { id: string; crewId: string }[]): Promise<Map<string, { kind: ConflictKind; reason: string; id?: string }>> {
  const out = new Map<string, { kind: ConflictKind; reason: string; id?: string }>();
  if (judgeIds.length === 0 || entryList.length === 0) return out;
  const memberships = await db()
    .select({ crewId: crewMembers.crewId, userId: crewMembers.userId })
    .from(crewMembers)
    .where(and(inArray(crewMembers.userId, judgeIds), inArray(crewMembers.crewId, [...new Set(entryList.map((e) => e.crewId))])));
  for (const m of memberships) {
    for (const e of entryList.filter((x) => x.crewId === m.crewId)) out.set(`${m.userId}:${e.id}`, { kind: "crew", reason: "member of the entry's crew" });
  }
  const declared = await db()
    .select({ id: conflicts.id, entryId: conflicts.entryId, judgeUserId: conflicts.judgeUserId, reason: conflicts.reason })
    .from(conflicts)
    .where(and(inArray(conflicts.judgeUserId, judgeIds), inArray(conflicts.entryId, entryList.map((e) => e.id))));
  for (const d of declared) {
    const key = `${d.judgeUserId}:${d.entryId}`;
    if (!out.has(key)) out.set(key, { kind: "declared", reason: d.reason, id: d.id });
  }
  return out;
}

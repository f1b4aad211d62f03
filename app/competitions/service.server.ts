import { and, asc, count, eq, inArray, lte, ne, notInArray } from "drizzle-orm";
import { audit } from "~/audit/log.server";
import { DEMO_RULESET, rulesetSchema, type Ruleset } from "~/rules/ruleset";
import { signalSummary } from "~/rules/monitor";
import { VIDEO_MODES } from "~/rules/video-modes";
import { db } from "~/db/client.server";
import { competitions, criteria, entries, eventRoles, events } from "~/db/schema";
import { slugify, type CompetitionValues, type EventForm } from "./forms";
import { transitionProblem, type CompetitionState } from "./lifecycle";
import { zonedWallTimeToUtc } from "./timezone";
import { AppError, conflict, type FieldErrors } from "~/errors/app-error";

/** Events and competitions: create, edit, ruleset import, lifecycle moves and the deadline sweep. Refusals are AppErrors. */
type CompetitionRow = typeof competitions.$inferSelect;

/** A refusal of one or more form fields (a taken address, a frozen rule). */
const fieldsRefused = (code: string, fieldErrors: FieldErrors, formErrors?: string[]) =>
  new AppError(409, code, formErrors?.[0] ?? Object.values(fieldErrors)[0]?.[0] ?? "Some fields cannot be saved.", { fieldErrors, formErrors });

const wallToUtc = (v: string | undefined, tz: string): Date | null => {
  if (!v) return null;
  const r = zonedWallTimeToUtc(v, tz);
  return r.ok ? r.utc : null;
};

function eventColumns(v: EventForm) {
  return {
    title: v.title,
    description: v.description ?? "",
    venue: v.venue ?? "",
    timeZone: v.timeZone,
    startsAt: wallToUtc(v.startsAt, v.timeZone),
    endsAt: wallToUtc(v.endsAt, v.timeZone),
  };
}

/** Creates the event and makes its creator its organizer. */
export async function createEvent(userId: string, v: EventForm): Promise<{ id: string; slug: string }> {
  const slug = v.slug || slugify(v.title);
  const created = await db().transaction(async (tx) => {
    const [e] = await tx
      .insert(events)
      .values({ slug, createdBy: userId, ...eventColumns(v) })
      .onConflictDoNothing({ target: events.slug })
      .returning({ id: events.id, slug: events.slug });
    if (!e) return null;
    await tx.insert(eventRoles).values({ eventId: e.id, userId, role: "organizer" });
    return e;
  });
  if (!created) throw fieldsRefused("slug_taken", { slug: [`The address “${slug}” is taken by another event; choose another.`] });
  await audit({ actorUserId: userId, eventId: created.id, action: "event.created", subjectType: "event", subjectId: created.id, details: { slug } });
  return created;
}

export async function updateEvent(userId: string, eventId: string, v: EventForm): Promise<{ id: string; slug: string }> {
  const [current] = await db().select().from(events).where(eq(events.id, eventId));
  const slug = v.slug || current.slug;
  if (slug !== current.slug) {
    const [clash] = await db().select({ id: events.id }).from(events).where(and(eq(events.slug, slug), ne(events.id, eventId)));
    if (clash) throw fieldsRefused("slug_taken", { slug: [`The address “${slug}” is taken by another event; choose another.`] });
  }
  await db().update(events).set({ slug, ...eventColumns(v) }).where(eq(events.id, eventId));
  await audit({ actorUserId: userId, eventId, action: "event.updated", subjectType: "event", subjectId: eventId, details: { slug } });
  return { id: eventId, slug };
}

export async function competitionsOfEvent(eventId: string) {
  return db().select().from(competitions).where(eq(competitions.eventId, eventId)).orderBy(asc(competitions.title));
}

export async function criteriaOf(competitionId: string) {
  return db().select().from(criteria).where(eq(criteria.competitionId, competitionId)).orderBy(asc(criteria.position));
}

/** The stored ruleset, defaults filled in; the demo ruleset for a competition that has none yet. */
export function storedRuleset(c: Pick<CompetitionRow, "ruleset">): { ruleset: Ruleset; valid: boolean } {
  if (c.ruleset == null) return { ruleset: DEMO_RULESET, valid: false };
  const r = rulesetSchema.safeParse(c.ruleset);
  return r.success ? { ruleset: r.data, valid: true } : { ruleset: DEMO_RULESET, valid: false };
}

/** The stored ruleset's board clock and monitor window in one line, or undefined when the ruleset is not valid. */
export function storedSignal(c: Pick<CompetitionRow, "ruleset">): string | undefined {
  const { ruleset, valid } = storedRuleset(c);
  return valid && ruleset.videoMode in VIDEO_MODES ? signalSummary(ruleset) : undefined;
}

async function slugTaken(eventId: string, slug: string, exceptId?: string): Promise<boolean> {
  const where = exceptId
    ? and(eq(competitions.eventId, eventId), eq(competitions.slug, slug), ne(competitions.id, exceptId))
    : and(eq(competitions.eventId, eventId), eq(competitions.slug, slug));
  const [row] = await db().select({ id: competitions.id }).from(competitions).where(where);
  return !!row;
}

async function writeCriteria(tx: Parameters<Parameters<ReturnType<typeof db>["transaction"]>[0]>[0], competitionId: string, rows: CompetitionValues["criteria"]) {
  const keepIds = rows.map((r) => r.id).filter((id): id is string => !!id);
  // Criteria keep their ids so judges' scores stay attached; removed rows (and their scores) go.
  await tx
    .delete(criteria)
    .where(keepIds.length ? and(eq(criteria.competitionId, competitionId), notInArray(criteria.id, keepIds)) : eq(criteria.competitionId, competitionId));
  for (const [position, r] of rows.entries()) {
    const fields = { name: r.name, weight: r.weight, scaleMin: r.scaleMin, scaleMax: r.scaleMax, position };
    if (r.id) {
      const updated = await tx.update(criteria).set(fields).where(and(eq(criteria.id, r.id), eq(criteria.competitionId, competitionId))).returning({ id: criteria.id });
      if (updated.length) continue;
    }
    await tx.insert(criteria).values({ competitionId, ...fields });
  }
}

/** The columns an organizer's form sets, the same on create and on edit. */
function editableColumns(v: CompetitionValues) {
  return {
    slug: v.slug,
    title: v.title,
    description: v.description,
    deadlineAt: v.deadlineAt,
    graceMinutes: v.graceMinutes,
    votingOpensAt: v.votingOpensAt,
    votingClosesAt: v.votingClosesAt,
    showStartsAt: v.showStartsAt,
    showMinutes: v.showMinutes,
    feeAmount: v.feeAmount,
    feeCurrency: v.feeCurrency,
    ruleset: v.ruleset,
  };
}

export async function createCompetition(userId: string, eventId: string, v: CompetitionValues): Promise<{ id: string }> {
  if (await slugTaken(eventId, v.slug)) throw fieldsRefused("slug_taken", { slug: [`This event already has a compo at “${v.slug}”.`] });
  const id = await db().transaction(async (tx) => {
    const [c] = await tx
      .insert(competitions)
      .values({
        eventId,
        ...editableColumns(v),
        rulesetVersion: 1,
      })
      .onConflictDoNothing({ target: [competitions.eventId, competitions.slug] })
      .returning({ id: competitions.id });
    if (!c) return null;
    await writeCriteria(tx, c.id, v.criteria);
    return c.id;
  });
  if (!id) throw fieldsRefused("slug_taken", { slug: [`This event already has a compo at “${v.slug}”.`] });
  await audit({ actorUserId: userId, eventId, action: "competition.created", subjectType: "competition", subjectId: id, details: { slug: v.slug } });
  return { id };
}

/** States in which the rules entrants built against may no longer change. */
export const FROZEN_STATES: CompetitionState[] = ["closed", "judging", "results"];

export async function updateCompetition(userId: string, current: CompetitionRow, v: CompetitionValues): Promise<{ id: string }> {
  if (await slugTaken(current.eventId, v.slug, current.id)) throw fieldsRefused("slug_taken", { slug: [`This event already has a compo at “${v.slug}”.`] });
  const before = storedRuleset(current).ruleset;
  const rulesetChanged = JSON.stringify(before) !== JSON.stringify(v.ruleset) || current.ruleset == null;
  if (FROZEN_STATES.includes(current.state)) {
    const fieldErrors: FieldErrors = {};
    if (current.deadlineAt?.getTime() !== v.deadlineAt?.getTime()) fieldErrors.deadline = ["The deadline has passed: it can no longer move. Re-open the compo first."];
    if (current.graceMinutes !== v.graceMinutes) fieldErrors.graceMinutes = ["Entries are closed: the grace period is fixed."];
    if (current.feeAmount !== v.feeAmount || current.feeCurrency !== v.feeCurrency) fieldErrors.feeAmount = ["Entries are closed: the fee is fixed."];
    if (rulesetChanged && current.ruleset != null) fieldErrors["ruleset.topModule"] = ["Entries are closed: the ruleset is frozen."];
    const oldCriteria = await criteriaOf(current.id);
    const sameCriteria =
      oldCriteria.length === v.criteria.length &&
      oldCriteria.every((o, i) => {
        const n = v.criteria[i];
        return n.id === o.id && n.weight === o.weight && n.scaleMin === o.scaleMin && n.scaleMax === o.scaleMax;
      });
    if (current.state !== "closed" && !sameCriteria) fieldErrors.criteria = ["Judging has started: criteria can be renamed but not added, removed or re-weighted."];
    if (Object.keys(fieldErrors).length) throw fieldsRefused("frozen", fieldErrors, ["Some changes are not allowed in this state; nothing was saved."]);
  }
  await db().transaction(async (tx) => {
    await tx
      .update(competitions)
      .set({
        ...editableColumns(v),
        rulesetVersion: rulesetChanged && current.ruleset != null ? current.rulesetVersion + 1 : current.rulesetVersion,
        updatedAt: new Date(),
      })
      .where(eq(competitions.id, current.id));
    await writeCriteria(tx, current.id, v.criteria);
  });
  await audit({
    actorUserId: userId,
    eventId: current.eventId,
    action: "competition.updated",
    subjectType: "competition",
    subjectId: current.id,
    details: { rulesetChanged, deadlineAt: v.deadlineAt?.toISOString() ?? null },
  });
  return { id: current.id };
}

/** Replaces the ruleset with an imported one (already validated). */
export async function importRuleset(userId: string, current: CompetitionRow, ruleset: Ruleset): Promise<{ version: number }> {
  if (FROZEN_STATES.includes(current.state)) throw fieldsRefused("frozen", { rulesetJson: ["Entries are closed: the ruleset is frozen."] });
  const version = current.ruleset == null ? current.rulesetVersion : current.rulesetVersion + 1;
  await db().update(competitions).set({ ruleset, rulesetVersion: version, updatedAt: new Date() }).where(eq(competitions.id, current.id));
  await audit({ actorUserId: userId, eventId: current.eventId, action: "competition.ruleset-imported", subjectType: "competition", subjectId: current.id, details: { version } });
  return { version };
}

/** The organizer's move along the lifecycle, guarded and audited. */
export async function moveCompetition(userId: string, current: CompetitionRow, to: CompetitionState, now = new Date()): Promise<void> {
  const problem = transitionProblem(current, to, now);
  if (problem) throw conflict("transition_refused", problem);
  const moved = await db()
    .update(competitions)
    .set({ state: to, updatedAt: now })
    .where(and(eq(competitions.id, current.id), eq(competitions.state, current.state)))
    .returning({ id: competitions.id });
  if (!moved.length) throw conflict("state_changed", "Someone changed this compo's state a moment ago; look again.");
  await audit({ actorUserId: userId, eventId: current.eventId, action: `competition.${to}`, subjectType: "competition", subjectId: current.id, details: { from: current.state, to } });
}

async function closeWhere(where: ReturnType<typeof and>, now: Date): Promise<CompetitionRow[]> {
  const closed = await db().update(competitions).set({ state: "closed", updatedAt: now }).where(where).returning();
  for (const c of closed)
    await audit({
      actorUserId: null,
      eventId: c.eventId,
      action: "competition.closed-by-deadline",
      subjectType: "competition",
      subjectId: c.id,
      details: { deadlineAt: c.deadlineAt?.toISOString() ?? null, at: now.toISOString() },
    });
  return closed;
}

/** Closes every open competition whose deadline has come (the minute sweep; also safe to call from anywhere). */
export async function closeDueCompetitions(now = new Date()): Promise<string[]> {
  const closed = await closeWhere(and(eq(competitions.state, "open"), lte(competitions.deadlineAt, now)), now);
  return closed.map((c) => c.id);
}

/** Closes one competition if its deadline has come; returns the updated row when it did. Call from loaders. */
export async function closeIfDue(competitionId: string, now = new Date()): Promise<CompetitionRow | null> {
  const [closed] = await closeWhere(and(eq(competitions.id, competitionId), eq(competitions.state, "open"), lte(competitions.deadlineAt, now)), now);
  return closed ?? null;
}

/** Brings the state of several competitions up to date (for listings). */
export async function closeDueAmong(ids: string[], now = new Date()): Promise<void> {
  if (ids.length === 0) return;
  await closeWhere(and(inArray(competitions.id, ids), eq(competitions.state, "open"), lte(competitions.deadlineAt, now)), now);
}

export async function entryCounts(competitionId: string): Promise<{ active: number; disqualified: number; withdrawn: number }> {
  const rows = await db().select({ state: entries.state, n: count() }).from(entries).where(eq(entries.competitionId, competitionId)).groupBy(entries.state);
  const get = (s: string) => rows.find((r) => r.state === s)?.n ?? 0;
  return { active: get("active"), disqualified: get("disqualified"), withdrawn: get("withdrawn") };
}

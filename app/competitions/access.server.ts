import { and, eq } from "drizzle-orm";
import { isAdmin, notFound, requireUser, type EventRole, type RequestContext, type SessionUser } from "~/auth/guards.server";
export { notFound };
import { db } from "~/db/client.server";
import { competitions, eventRoles, events, juryAssignments } from "~/db/schema";
import { closeIfDue } from "./service.server";
import { isId } from "~/security/ids";

/**
 * The permission guards for events and competitions: the object is looked up together with the caller's role in
 * one step, so an id that is not theirs — someone else's, made up, or not a UUID — is answered 404 exactly like
 * one that does not exist. Anonymous callers are sent to sign in (for every id, real or not). A platform admin
 * holds the organizer role everywhere. A judge of a competition holds the judge role in its event and sits on its
 * jury.
 */
export type EventRow = typeof events.$inferSelect;
export type CompetitionRow = typeof competitions.$inferSelect;

async function holdsRole(user: SessionUser, eventId: string, role: EventRole): Promise<boolean> {
  if (role === "organizer" && isAdmin(user)) return true;
  const [r] = await db()
    .select({ id: eventRoles.id })
    .from(eventRoles)
    .where(and(eq(eventRoles.eventId, eventId), eq(eventRoles.userId, user.id), eq(eventRoles.role, role)));
  return !!r;
}

async function onJury(userId: string, competitionId: string): Promise<boolean> {
  const [r] = await db()
    .select({ judge: juryAssignments.judgeUserId })
    .from(juryAssignments)
    .where(and(eq(juryAssignments.competitionId, competitionId), eq(juryAssignments.judgeUserId, userId)));
  return !!r;
}

export async function findEventFor(user: SessionUser, eventId: string | undefined, role: EventRole): Promise<EventRow | null> {
  if (!isId(eventId)) return null;
  const [e] = await db().select().from(events).where(eq(events.id, eventId));
  if (!e || !(await holdsRole(user, e.id, role))) return null;
  return e;
}

/** The event, for a holder of `role` in it; 404 for anyone else. */
export async function requireEventRole(request: Request, context: RequestContext, eventId: string | undefined, role: EventRole): Promise<{ user: SessionUser; event: EventRow }> {
  const user = await requireUser(request, context);
  const event = await findEventFor(user, eventId, role);
  if (!event) notFound();
  return { user, event };
}

/** The competition with its event for a holder of `role`, its state brought up to date; null for anyone else. */
export async function findCompetitionFor(
  user: SessionUser,
  competitionId: string | undefined,
  role: EventRole,
  now = new Date(),
): Promise<{ competition: CompetitionRow; event: EventRow } | null> {
  if (!isId(competitionId)) return null;
  const [row] = await db().select({ c: competitions, e: events }).from(competitions).innerJoin(events, eq(events.id, competitions.eventId)).where(eq(competitions.id, competitionId));
  if (!row || !(await holdsRole(user, row.e.id, role))) return null;
  if (role === "judge" && !(await onJury(user.id, row.c.id))) return null;
  const closed = await closeIfDue(row.c.id, now);
  return { competition: closed ?? row.c, event: row.e };
}

/** The one competition guard of every page: 404 for anyone without `role`, before anything else is looked up. */
export async function requireCompetitionRole(
  request: Request,
  context: RequestContext,
  competitionId: string | undefined,
  role: EventRole,
): Promise<{ user: SessionUser; competition: CompetitionRow; event: EventRow }> {
  const user = await requireUser(request, context);
  const found = await findCompetitionFor(user, competitionId, role);
  if (!found) notFound();
  return { user, ...found };
}

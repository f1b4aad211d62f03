import { and, eq } from "drizzle-orm";
import { data } from "react-router";
import { isAdmin, requireUser, type SessionUser } from "~/auth/guards.server";
import { db } from "~/db/client.server";
import { competitions, eventRoles, events } from "~/db/schema";
import { closeIfDue } from "./service.server";
import { isId } from "~/security/ids";

/**
 * Organizer access: an event or competition is looked up together with the caller's organizer role, so an id
 * that is not theirs is answered with 404 — the page does not even confirm that it exists.
 */
export type EventRow = typeof events.$inferSelect;
export type CompetitionRow = typeof competitions.$inferSelect;


export function notFound(message = "This page does not exist, or it is not yours to see."): never {
  throw data({ message }, { status: 404 });
}

async function organizerOf(userId: string, eventId: string): Promise<boolean> {
  const [r] = await db()
    .select({ id: eventRoles.id })
    .from(eventRoles)
    .where(and(eq(eventRoles.eventId, eventId), eq(eventRoles.userId, userId), eq(eventRoles.role, "organizer")));
  return !!r;
}

export async function findOrganizerEvent(user: SessionUser, eventId: string | undefined): Promise<EventRow | null> {
  if (!isId(eventId)) return null;
  const [e] = await db().select().from(events).where(eq(events.id, eventId));
  if (!e) return null;
  if (!isAdmin(user) && !(await organizerOf(user.id, e.id))) return null;
  return e;
}

export async function requireOrganizerEvent(request: Request, eventId: string | undefined): Promise<{ user: SessionUser; event: EventRow }> {
  const user = await requireUser(request);
  const event = await findOrganizerEvent(user, eventId);
  if (!event) notFound();
  return { user, event };
}

/** The competition with its event, for an organizer of that event (or an admin); its state brought up to date. */
export async function findOrganizerCompetition(
  user: SessionUser,
  competitionId: string | undefined,
  now = new Date(),
): Promise<{ competition: CompetitionRow; event: EventRow } | null> {
  if (!isId(competitionId)) return null;
  const [row] = await db().select({ c: competitions, e: events }).from(competitions).innerJoin(events, eq(events.id, competitions.eventId)).where(eq(competitions.id, competitionId));
  if (!row) return null;
  if (!isAdmin(user) && !(await organizerOf(user.id, row.e.id))) return null;
  const closed = await closeIfDue(row.c.id, now);
  return { competition: closed ?? row.c, event: row.e };
}

export async function requireOrganizerCompetition(
  request: Request,
  competitionId: string | undefined,
): Promise<{ user: SessionUser; competition: CompetitionRow; event: EventRow }> {
  const user = await requireUser(request);
  const found = await findOrganizerCompetition(user, competitionId);
  if (!found) notFound();
  return { user, ...found };
}

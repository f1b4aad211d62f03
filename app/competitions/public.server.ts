import { and, eq } from "drizzle-orm";
import { getSession, isAdmin, type RequestContext } from "~/auth/guards.server";
import { db } from "~/db/client.server";
import { competitions, eventRoles, events } from "~/db/schema";
import { compoSlots, slotsCalendar, type TimetableCompo } from "~/party/timetable";
import { closeIfDue, criteriaOf, storedRuleset, storedSignal } from "./service.server";

/**
 * The public face of a competition: everything past draft is public; a draft is shown only to its organizers
 * (as a preview). Anything else is a 404.
 */
export async function publicCompetition(context: RequestContext, eventSlug: string | undefined, competitionSlug: string | undefined, now = new Date()) {
  if (!eventSlug || !competitionSlug) return null;
  const [row] = await db()
    .select({ c: competitions, e: events })
    .from(competitions)
    .innerJoin(events, eq(events.id, competitions.eventId))
    .where(and(eq(events.slug, eventSlug), eq(competitions.slug, competitionSlug)));
  if (!row) return null;
  let preview = false;
  if (row.c.state === "draft") {
    const session = getSession(context);
    if (!session) return null;
    const [role] = await db()
      .select({ id: eventRoles.id })
      .from(eventRoles)
      .where(and(eq(eventRoles.eventId, row.e.id), eq(eventRoles.userId, session.user.id), eq(eventRoles.role, "organizer")));
    if (!role && !isAdmin(session.user)) return null;
    preview = true;
  }
  const competition = (await closeIfDue(row.c.id, now)) ?? row.c;
  const { ruleset } = storedRuleset(competition);
  return { competition, event: row.e, ruleset, criteria: await criteriaOf(competition.id), preview };
}

/** The compo's deadline, vote window and show as an iCalendar file (the same slots as the party timetable). */
export function competitionCalendar(c: TimetableCompo & Pick<typeof competitions.$inferSelect, "ruleset">, e: { title: string; slug: string; venue: string; timeZone: string }, pageUrl: string, now: Date): string {
  const compo = { ...c, signal: storedSignal(c) };
  return slotsCalendar({ name: `${c.title} — ${e.title}`, party: e, compos: [compo], slots: compoSlots(compo), pageUrl: () => pageUrl, now });
}

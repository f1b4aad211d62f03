import { and, eq } from "drizzle-orm";
import { getSession, isAdmin, type RequestContext } from "~/auth/guards.server";
import { db } from "~/db/client.server";
import { competitions, eventRoles, events } from "~/db/schema";
import { buildCalendar, type CalendarItem } from "./ical";
import { closeIfDue, criteriaOf, storedRuleset } from "./service.server";

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

export function competitionCalendar(
  c: { id: string; title: string; deadlineAt: Date | null; graceMinutes: number; votingOpensAt: Date | null; votingClosesAt: Date | null },
  e: { title: string; venue: string; timeZone: string },
  pageUrl: string,
  now: Date,
): string {
  const items: CalendarItem[] = [];
  if (c.deadlineAt)
    items.push({
      uid: `deadline-${c.id}@gatecrash`,
      summary: `Entry deadline: ${c.title}`,
      description: `Uploads must be complete by this time${c.graceMinutes ? ` (uploads finishing within ${c.graceMinutes} minutes after it still count)` : ""}. Event: ${e.title}. Times are in UTC; the event runs on ${e.timeZone}.`,
      location: e.venue || undefined,
      url: pageUrl,
      start: c.deadlineAt,
    });
  if (c.votingOpensAt && c.votingClosesAt)
    items.push({
      uid: `voting-${c.id}@gatecrash`,
      summary: `Audience voting: ${c.title}`,
      description: `One ballot per person during this window. Event: ${e.title}.`,
      location: e.venue || undefined,
      url: pageUrl,
      start: c.votingOpensAt,
      end: c.votingClosesAt,
    });
  return buildCalendar({ name: `${c.title} — ${e.title}`, items, now });
}

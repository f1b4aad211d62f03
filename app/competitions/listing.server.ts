import type { CompetitionCard } from "./shapes";
import { asc, desc, eq, inArray, ne } from "drizzle-orm";
import { db } from "~/db/client.server";
import { competitions, events } from "~/db/schema";


const cardFields = {
  id: competitions.id,
  slug: competitions.slug,
  title: competitions.title,
  state: competitions.state,
  deadlineAt: competitions.deadlineAt,
  eventSlug: events.slug,
  eventTitle: events.title,
  timeZone: events.timeZone,
};

function toCard(r: { deadlineAt: Date | null } & Omit<CompetitionCard, "deadlineAt">): CompetitionCard {
  return { ...r, deadlineAt: r.deadlineAt?.toISOString() ?? null };
}

/** Everything the public may see: every competition past draft. */
export async function publicCompetitions(): Promise<CompetitionCard[]> {
  const rows = await db()
    .select(cardFields)
    .from(competitions)
    .innerJoin(events, eq(events.id, competitions.eventId))
    .where(ne(competitions.state, "draft"))
    .orderBy(desc(events.startsAt), asc(competitions.title));
  return rows.map(toCard);
}

export async function competitionsOfEvents(eventIds: string[]): Promise<CompetitionCard[]> {
  if (eventIds.length === 0) return [];
  const rows = await db()
    .select(cardFields)
    .from(competitions)
    .innerJoin(events, eq(events.id, competitions.eventId))
    .where(inArray(competitions.eventId, eventIds))
    .orderBy(asc(competitions.title));
  return rows.map(toCard);
}

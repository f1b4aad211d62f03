import { and, asc, eq, ne } from "drizzle-orm";
import { db } from "~/db/client.server";
import { competitions, events } from "~/db/schema";
import { publicAwards } from "~/results/awards.server";
import { storedSignal } from "~/competitions/service.server";
import { timetable, type TimetableCompo } from "./timetable";

/** The public face of a party: its compos past draft and their timetable. null when there is no such party or nothing public yet. */
export async function publicParty(eventSlug: string | undefined) {
  if (!eventSlug) return null;
  const [e] = await db().select().from(events).where(eq(events.slug, eventSlug));
  if (!e) return null;
  const rows = await db()
    .select()
    .from(competitions)
    .where(and(eq(competitions.eventId, e.id), ne(competitions.state, "draft")))
    .orderBy(asc(competitions.createdAt), asc(competitions.title));
  if (rows.length === 0) return null;
  const compos: (TimetableCompo & { state: (typeof rows)[number]["state"]; description: string })[] = rows.map((c) => ({
    id: c.id,
    slug: c.slug,
    title: c.title,
    description: c.description,
    state: c.state,
    deadlineAt: c.deadlineAt,
    graceMinutes: c.graceMinutes,
    votingOpensAt: c.votingOpensAt,
    votingClosesAt: c.votingClosesAt,
    showStartsAt: c.showStartsAt,
    showMinutes: c.showMinutes,
    signal: storedSignal(c),
  }));
  return { event: e, compos, slots: timetable(compos), awards: await publicAwards(e.id) };
}

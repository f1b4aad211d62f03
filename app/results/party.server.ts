import { asc, eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { competitions, events } from "~/db/schema";
import { publicAwards, type AwardView } from "./awards.server";
import { publishedResults } from "./results.server";
import type { StandingRow } from "./shapes";

/**
 * The party-wide results: every compo of the party whose results are published (its newest version), in the
 * party's order, and the public awards. What the party sheet (text and CSV) prints.
 */
export interface PartyResults {
  event: { id: string; slug: string; title: string; timeZone: string };
  compos: { id: string; slug: string; title: string; version: number; sha256: string; publishedAt: string; standings: StandingRow[] }[];
  pending: { slug: string; title: string }[];
  awards: AwardView[];
}

export async function partyResults(eventId: string): Promise<PartyResults | null> {
  const [e] = await db().select().from(events).where(eq(events.id, eventId));
  if (!e) return null;
  const list = await db().select().from(competitions).where(eq(competitions.eventId, e.id)).orderBy(asc(competitions.createdAt), asc(competitions.title));
  const compos: PartyResults["compos"] = [];
  const pending: PartyResults["pending"] = [];
  for (const c of list) {
    if (c.state === "draft") continue;
    const p = await publishedResults(c.id);
    if (!p) pending.push({ slug: c.slug, title: c.title });
    else compos.push({ id: c.id, slug: c.slug, title: c.title, version: p.version, sha256: p.sha256, publishedAt: p.publishedAt, standings: p.payload.standings });
  }
  return { event: { id: e.id, slug: e.slug, title: e.title, timeZone: e.timeZone }, compos, pending, awards: await publicAwards(e.id) };
}

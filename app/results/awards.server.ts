import { and, asc, eq, inArray } from "drizzle-orm";
import { AppError } from "~/errors/app-error";
import { audit } from "~/audit/log.server";
import { db } from "~/db/client.server";
import { awards, competitions, crews, entries } from "~/db/schema";

/**
 * A party's special awards (jury's choice, best sound, smallest design …), given by the organizers on top of the
 * compo places. An award names at most one winning entry of the party. It becomes public with the winner's
 * results: once that compo is in the results state, the award shows on the results pages, the party results
 * sheet and in stage mode; before that only the organizers see it.
 */
export const MAX_AWARDS = 40;

/** A refused award change (an AppError): about one form field, or (`award`) about the award as a whole. */
export class AwardError extends AppError {
  constructor(
    readonly field: "title" | "citation" | "winnerEntryId" | "award",
    message: string,
  ) {
    super(field === "award" ? 409 : 400, field === "award" ? "award_refused" : "invalid_body", message, field === "award" ? { formErrors: [message] } : { fieldErrors: { [field]: [message] }, formErrors: [] });
    this.name = "AwardError";
  }
}

export interface AwardView {
  id: string;
  title: string;
  citation: string;
  position: number;
  winner: { entryId: string; title: string; crew: string; competitionId: string; competitionTitle: string; competitionSlug: string; public: boolean } | null;
}

async function rows(eventId: string): Promise<AwardView[]> {
  const list = await db().select().from(awards).where(eq(awards.eventId, eventId)).orderBy(asc(awards.position), asc(awards.createdAt));
  const winnerIds = list.map((a) => a.winnerEntryId).filter((x): x is string => !!x);
  const winners = winnerIds.length
    ? await db()
        .select({ id: entries.id, title: entries.title, crew: crews.name, competitionId: competitions.id, competitionTitle: competitions.title, competitionSlug: competitions.slug, state: competitions.state })
        .from(entries)
        .innerJoin(crews, eq(crews.id, entries.crewId))
        .innerJoin(competitions, eq(competitions.id, entries.competitionId))
        .where(inArray(entries.id, winnerIds))
    : [];
  const byId = new Map(winners.map((w) => [w.id, w]));
  return list.map((a) => {
    const w = a.winnerEntryId ? byId.get(a.winnerEntryId) : undefined;
    return {
      id: a.id,
      title: a.title,
      citation: a.citation,
      position: a.position,
      winner: w ? { entryId: w.id, title: w.title, crew: w.crew, competitionId: w.competitionId, competitionTitle: w.competitionTitle, competitionSlug: w.competitionSlug, public: w.state === "results" } : null,
    };
  });
}

/** Every award of the party, for its organizers. */
export async function awardsOfEvent(eventId: string): Promise<AwardView[]> {
  return rows(eventId);
}

/** The public awards of the party: a winner whose compo's results are out. */
export async function publicAwards(eventId: string): Promise<AwardView[]> {
  return (await rows(eventId)).filter((a) => a.winner?.public);
}

/** The public awards won by entries of one compo. */
export async function publicAwardsOfCompetition(eventId: string, competitionId: string): Promise<AwardView[]> {
  return (await publicAwards(eventId)).filter((a) => a.winner?.competitionId === competitionId);
}

/** The entries an award may go to: active entries of the party's compos past draft. */
export async function awardCandidates(eventId: string) {
  return db()
    .select({ id: entries.id, title: entries.title, crew: crews.name, competitionTitle: competitions.title })
    .from(entries)
    .innerJoin(crews, eq(crews.id, entries.crewId))
    .innerJoin(competitions, eq(competitions.id, entries.competitionId))
    .where(and(eq(competitions.eventId, eventId), eq(entries.state, "active")))
    .orderBy(asc(competitions.createdAt), asc(entries.title));
}

export interface AwardInput {
  title: string;
  citation?: string;
  winnerEntryId?: string | null;
}

async function checkWinner(eventId: string, winnerEntryId: string | null | undefined): Promise<string | null> {
  if (!winnerEntryId) return null;
  const [ok] = await db()
    .select({ id: entries.id })
    .from(entries)
    .innerJoin(competitions, eq(competitions.id, entries.competitionId))
    .where(and(eq(entries.id, winnerEntryId), eq(competitions.eventId, eventId), eq(entries.state, "active")));
  if (!ok) throw new AwardError("winnerEntryId", "The winner must be an active entry of one of this party's compos.");
  return winnerEntryId;
}

function cleanTitle(title: string): string {
  const t = title.trim();
  if (!t) throw new AwardError("title", "Name the award, e.g. “Best sound”.");
  if (t.length > 120) throw new AwardError("title", "Keep the award's name under 120 characters.");
  return t;
}

export async function createAward(actorUserId: string, eventId: string, input: AwardInput): Promise<string> {
  const title = cleanTitle(input.title);
  const winnerEntryId = await checkWinner(eventId, input.winnerEntryId);
  const existing = await db().select({ position: awards.position }).from(awards).where(eq(awards.eventId, eventId));
  if (existing.length >= MAX_AWARDS) throw new AwardError("award", `A party can have at most ${MAX_AWARDS} awards.`);
  const position = Math.max(0, ...existing.map((e) => e.position + 1));
  const [row] = await db().insert(awards).values({ eventId, title, citation: (input.citation ?? "").trim(), winnerEntryId, position }).returning({ id: awards.id });
  await audit({ actorUserId, eventId, action: "award.created", subjectType: "award", subjectId: row.id, details: { title, winnerEntryId } });
  return row.id;
}

export async function updateAward(actorUserId: string, eventId: string, awardId: string, input: AwardInput): Promise<void> {
  const title = cleanTitle(input.title);
  const winnerEntryId = await checkWinner(eventId, input.winnerEntryId);
  const [row] = await db()
    .update(awards)
    .set({ title, citation: (input.citation ?? "").trim(), winnerEntryId, updatedAt: new Date() })
    .where(and(eq(awards.id, awardId), eq(awards.eventId, eventId)))
    .returning({ id: awards.id });
  if (!row) throw new AwardError("award", "There is no such award at this party.");
  await audit({ actorUserId, eventId, action: "award.updated", subjectType: "award", subjectId: awardId, details: { title, winnerEntryId } });
}

export async function deleteAward(actorUserId: string, eventId: string, awardId: string): Promise<void> {
  const [row] = await db().delete(awards).where(and(eq(awards.id, awardId), eq(awards.eventId, eventId))).returning({ id: awards.id, title: awards.title });
  if (!row) throw new AwardError("award", "There is no such award at this party.");
  await audit({ actorUserId, eventId, action: "award.deleted", subjectType: "award", subjectId: awardId, details: { title: row.title } });
}

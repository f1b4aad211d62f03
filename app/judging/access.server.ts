import { and, eq, exists, sql } from "drizzle-orm";
import { db } from "~/db/client.server";
import { competitions, eventRoles, events, juryAssignments } from "~/db/schema";
import { isId } from "~/security/ids";

/**
 * Who may see which competition for judging. Every lookup takes the caller with it, so an id from another
 * event simply is not found (404) rather than loaded and then refused.
 */
export interface JudgingCompetition {
  id: string;
  eventId: string;
  title: string;
  state: "draft" | "open" | "closed" | "judging" | "results";
  judgingLocked: boolean;
  blindJudging: boolean;
  orderMode: string;
  orderSeed: string;
  juryMethod: "jury-raw" | "jury-z";
  eventTitle: string;
  timeZone: string;
}

const fields = {
  id: competitions.id,
  eventId: competitions.eventId,
  title: competitions.title,
  state: competitions.state,
  judgingLocked: competitions.judgingLocked,
  blindJudging: competitions.blindJudging,
  orderMode: competitions.orderMode,
  orderSeed: competitions.orderSeed,
  juryMethod: competitions.juryMethod,
  eventTitle: events.title,
  timeZone: events.timeZone,
};

/** The competition if `userId` is a judge of its event and assigned to its jury; with the judge's own order seed. */
export async function competitionForJudge(userId: string, competitionId: string | undefined): Promise<(JudgingCompetition & { assignmentSeed: string }) | null> {
  if (!isId(competitionId)) return null;
  const [row] = await db()
    .select({ ...fields, assignmentSeed: juryAssignments.orderSeed })
    .from(competitions)
    .innerJoin(events, eq(events.id, competitions.eventId))
    .innerJoin(juryAssignments, and(eq(juryAssignments.competitionId, competitions.id), eq(juryAssignments.judgeUserId, userId)))
    .where(
      and(
        eq(competitions.id, competitionId),
        exists(
          db()
            .select({ one: sql`1` })
            .from(eventRoles)
            .where(and(eq(eventRoles.eventId, competitions.eventId), eq(eventRoles.userId, userId), eq(eventRoles.role, "judge"))),
        ),
      ),
    );
  return row ?? null;
}

/** The judging shape of a competition row and its event (after requireCompetitionRole has let the caller in). */
export function judgingView(c: typeof competitions.$inferSelect, e: typeof events.$inferSelect): JudgingCompetition {
  return {
    id: c.id,
    eventId: c.eventId,
    title: c.title,
    state: c.state,
    judgingLocked: c.judgingLocked,
    blindJudging: c.blindJudging,
    orderMode: c.orderMode,
    orderSeed: c.orderSeed,
    juryMethod: c.juryMethod,
    eventTitle: e.title,
    timeZone: e.timeZone,
  };
}

import { eq } from "drizzle-orm";
import { auth } from "~/auth/auth.server";
import type { Db } from "~/db/client.server";
import { account, awards, competitions, crewMembers, crews, criteria, entries, eventRoles, events, juryAssignments, user, voteCodes, voteCodeScopes } from "~/db/schema";
import { generateCode } from "~/voting/codes";
import { DEMO_RULESET } from "~/rules/ruleset";
import { DEMO_DESIGNS } from "../../demo/designs/index";
import { DEMO_AWARDS, DEMO_COMPETITIONS, DEMO_CRITERIA, DEMO_EVENT, DEMO_PARTY_CODES, DEMO_PASSWORD, DEMO_PEOPLE } from "./scenario";

const DAY = 24 * 3600 * 1000;

/**
 * Seeds the demo scenario once: a second run finds the event and changes nothing.
 * Returns what it created so the caller can queue the demo check runs.
 */
export async function seedDemo(db: Db, now = new Date()): Promise<{ seeded: boolean; entryIds: string[] }> {
  const existing = await db.select({ id: events.id }).from(events).where(eq(events.slug, DEMO_EVENT.slug));
  if (existing.length > 0) return { seeded: false, entryIds: [] };

  const ctx = await auth().$context;
  const hash = await ctx.password.hash(DEMO_PASSWORD);
  const ids: Record<string, string> = {};
  return db.transaction(async (tx) => {
    for (const p of DEMO_PEOPLE) {
      const id = crypto.randomUUID();
      ids[p.key] = id;
      await tx.insert(user).values({ id, name: p.name, email: p.email, emailVerified: true, role: p.admin ? "admin" : "user" });
      await tx.insert(account).values({ id: crypto.randomUUID(), accountId: id, providerId: "credential", userId: id, password: hash });
    }
    const [event] = await tx
      .insert(events)
      .values({ ...DEMO_EVENT, startsAt: new Date(now.getTime() + 20 * DAY), endsAt: new Date(now.getTime() + 23 * DAY), createdBy: ids.organizer })
      .returning();
    await tx.insert(eventRoles).values([
      { eventId: event.id, userId: ids.organizer, role: "organizer" },
      ...["judge1", "judge2", "judge3"].map((k) => ({ eventId: event.id, userId: ids[k], role: "judge" as const })),
    ]);
    const compIds: Record<"open" | "judging", string> = { open: "", judging: "" };
    for (const key of ["open", "judging"] as const) {
      const c = DEMO_COMPETITIONS[key];
      const deadline = new Date(now.getTime() + c.deadlineInDays * DAY);
      const [row] = await tx
        .insert(competitions)
        .values({
          eventId: event.id,
          slug: c.slug,
          title: c.title,
          description: c.description,
          state: c.state,
          deadlineAt: deadline,
          votingOpensAt: key === "judging" ? new Date(now.getTime() - DAY) : new Date(deadline.getTime() + 2 * DAY),
          votingClosesAt: key === "judging" ? new Date(now.getTime() + 5 * DAY) : new Date(deadline.getTime() + 3 * DAY),
          showStartsAt: new Date(now.getTime() + c.showInDays * DAY),
          showMinutes: key === "judging" ? 45 : 90,
          feeAmount: c.feeAmount,
          feeCurrency: c.feeCurrency,
          // the open compo's party board runs at 25 MHz, as most boards in this trade do (common practice)
          ruleset: key === "open" ? { ...DEMO_RULESET, clock: { ...DEMO_RULESET.clock, frequencyHz: 25_000_000 } } : DEMO_RULESET,
          rulesetVersion: DEMO_RULESET.version,
          ballotMethod: key === "judging" ? "schulze" : "points",
        })
        .returning();
      compIds[key] = row.id;
      await tx.insert(criteria).values(DEMO_CRITERIA.map((cr, i) => ({ ...cr, competitionId: row.id, position: i })));
      await tx.insert(juryAssignments).values(["judge1", "judge2", "judge3"].map((k) => ({ competitionId: row.id, judgeUserId: ids[k] })));
    }
    // One shared vote-code sheet for the whole party: every slip votes once in each compo.
    const codes = await tx
      .insert(voteCodes)
      .values([...new Set(Array.from({ length: DEMO_PARTY_CODES }, generateCode))].map((code) => ({ eventId: event.id, code, partyWide: true })))
      .returning({ id: voteCodes.id });
    await tx.insert(voteCodeScopes).values(codes.flatMap((v) => Object.values(compIds).map((competitionId) => ({ voteCodeId: v.id, competitionId }))));
    const entryIds: string[] = [];
    const entryBySlug: Record<string, string> = {};
    for (const [i, d] of DEMO_DESIGNS.entries()) {
      const captain = ids[`entrant${i + 1}`];
      const [crew] = await tx
        .insert(crews)
        .values({ handle: d.crew.toLowerCase().replace(/[^a-z0-9]+/g, "-").replace(/^-|-$/g, ""), name: d.crew, createdBy: captain })
        .returning();
      await tx.insert(crewMembers).values({ crewId: crew.id, userId: captain, role: "captain" });
      const comp = DEMO_COMPETITIONS[d.competition];
      const [entry] = await tx
        .insert(entries)
        .values({
          competitionId: compIds[d.competition],
          crewId: crew.id,
          title: d.title,
          description: d.description,
          feeState: comp.feeAmount === 0 ? "not_required" : i % 2 === 0 ? "paid" : "unpaid",
        })
        .returning();
      entryIds.push(entry.id);
      entryBySlug[d.slug] = entry.id;
    }
    await tx.insert(awards).values(
      DEMO_AWARDS.map((a, position) => ({ eventId: event.id, title: a.title, citation: a.citation, winnerEntryId: a.winnerSlug ? entryBySlug[a.winnerSlug] : null, position })),
    );
    return { seeded: true, entryIds };
  });
}

import { and, eq, inArray } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { DEMO_AWARDS, DEMO_EVENT, DEMO_PARTY_CODES, DEMO_PEOPLE } from "~/demo/scenario";
import { seedDemo } from "~/demo/seed.server";
import { closeDb, db } from "~/db/client.server";
import { awards, competitions, events, voteCodes, voteCodeScopes } from "~/db/schema";
import { stopQueue } from "~/jobs/queue.server";
import * as partyPage from "~/routes/party";
import { callRoute } from "../support/routes";
import { request } from "../support/users";

afterAll(async () => {
  await stopQueue();
  await closeDb();
});

describe("the demo scenario's party", () => {
  it("seeds two compos of one party with a shared vote-code sheet, awards, shows on the timetable and invented people", async () => {
    const first = await seedDemo(db());
    expect(first.seeded).toBe(true);
    expect((await seedDemo(db())).seeded).toBe(false);
    const [e] = await db().select().from(events).where(eq(events.slug, DEMO_EVENT.slug));
    const compos = await db().select().from(competitions).where(eq(competitions.eventId, e.id));
    expect(compos).toHaveLength(2);
    expect(compos.every((c) => c.showStartsAt !== null)).toBe(true);

    const codes = await db().select().from(voteCodes).where(and(eq(voteCodes.eventId, e.id), eq(voteCodes.partyWide, true)));
    expect(codes).toHaveLength(DEMO_PARTY_CODES);
    const scopes = await db().select().from(voteCodeScopes).where(inArray(voteCodeScopes.voteCodeId, codes.map((c) => c.id)));
    expect(scopes).toHaveLength(DEMO_PARTY_CODES * 2);
    expect(new Set(scopes.map((s) => s.competitionId))).toEqual(new Set(compos.map((c) => c.id)));

    const given = await db().select().from(awards).where(eq(awards.eventId, e.id));
    expect(given.map((a) => a.title)).toEqual(DEMO_AWARDS.map((a) => a.title));
    expect(given.filter((a) => a.winnerEntryId)).toHaveLength(1);

    const page = await callRoute<any>(partyPage.loader, request(`/e/${DEMO_EVENT.slug}`), { eventSlug: DEMO_EVENT.slug });
    expect(page.status).toBe(200);
    expect(page.data.slots.filter((s: any) => s.kind === "show")).toHaveLength(2);

    // Handles are unique; names carry no "Entrant N" placeholders.
    expect(new Set(DEMO_PEOPLE.map((p) => p.handle)).size).toBe(DEMO_PEOPLE.length);
    expect(DEMO_PEOPLE.some((p) => /^Entrant \d/.test(p.name))).toBe(false);
  });
});

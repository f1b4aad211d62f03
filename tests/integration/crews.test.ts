import { and, eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "~/db/client.server";
import { crewInvites, crewMembers, crews, outbox } from "~/db/schema";
import { hashToken } from "~/crews/service.server";
import { stopQueue } from "~/jobs/queue.server";
import * as crewPage from "~/routes/crews.$crewId";
import * as newCrew from "~/routes/crews.new";
import * as invitePage from "~/routes/invites.$token";
import * as enter from "~/routes/e.$eventSlug.$competitionSlug.enter";
import * as dashboard from "~/routes/entries.$entryId";
import { callRoute } from "../support/routes";
import { grantEventRole, makeUser, request, sessionCookie, unique } from "../support/users";
import { makeCompetition, makeEntrySetup } from "./entries-support";

afterAll(async () => {
  await stopQueue();
  await closeDb();
});

describe("crews", () => {
  it("creates a crew with a unique handle, keeping the values on error", async () => {
    const u = await makeUser();
    const cookie = await sessionCookie(u);
    const handle = unique("crew").toLowerCase();
    const ok = await callRoute(newCrew.action, request("/crews/new", { cookie, form: { name: "Beam Chasers", handle } }));
    expect(ok.status).toBe(302);
    const taken = await callRoute<{ error: Record<string, string[]>; initialValue: Record<string, string> }>(newCrew.action, request("/crews/new", { cookie, form: { name: "Other", handle } }));
    expect(taken.data?.error.handle[0]).toMatch(/is taken/);
    expect(taken.data?.initialValue.name).toBe("Other");
  });

  it("invites by e-mail with a hashed, expiring token; any signed-in account accepts once", async () => {
    const captain = await makeUser();
    const cc = await sessionCookie(captain);
    const out = await callRoute(newCrew.action, request("/crews/new", { cookie: cc, form: { name: "Crew", handle: unique("c").toLowerCase() } }));
    const crewId = out.location!.split("/").pop()!;
    const email = `${unique("friend")}@example.test`;
    await callRoute(crewPage.action, request(`/crews/${crewId}`, { cookie: cc, form: { intent: "invite", email } }), { crewId });
    const [mail] = await db().select().from(outbox).where(eq(outbox.toAddress, email));
    const token = /\/invites\/([A-Za-z0-9_-]+)/.exec(mail.textBody)![1];
    const [inv] = await db().select().from(crewInvites).where(eq(crewInvites.crewId, crewId));
    expect(inv.tokenHash).toBe(hashToken(token));
    expect(inv.tokenHash).not.toContain(token);
    const joiner = await makeUser(); // a different address than invited: still fine
    const jc = await sessionCookie(joiner);
    expect((await callRoute(invitePage.action, request(`/invites/${token}`, { cookie: jc, form: {} }), { token })).status).toBe(302);
    const used = await callRoute<{ error: string }>(invitePage.action, request(`/invites/${token}`, { cookie: jc, form: {} }), { token });
    expect(used.data?.error).toMatch(/already used/);
    expect(await db().select().from(crewMembers).where(and(eq(crewMembers.crewId, crewId), eq(crewMembers.userId, joiner.id)))).toHaveLength(1);
    // Expired tokens are refused.
    await callRoute(crewPage.action, request(`/crews/${crewId}`, { cookie: cc, form: { intent: "invite", email: `${unique("late")}@example.test` } }), { crewId });
    await db().update(crewInvites).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(crewInvites.crewId, crewId));
    const lateMail = (await db().select().from(outbox)).find((m) => m.subject.includes("Join the crew") && m.textBody.includes("/invites/") && m.toAddress.startsWith("late-"));
    const lateToken = /\/invites\/([A-Za-z0-9_-]+)/.exec(lateMail!.textBody)![1];
    const expired = await callRoute<{ problem: string }>(invitePage.loader, request(`/invites/${lateToken}`, { cookie: jc }), { token: lateToken });
    expect(expired.data?.problem).toMatch(/expired/);
    // Strangers cannot see the crew.
    const stranger = await sessionCookie(await makeUser());
    expect((await callRoute(crewPage.loader, request(`/crews/${crewId}`, { cookie: stranger }), { crewId })).status).toBe(404);
  });

  it("the last captain cannot leave a crew with entries; after a hand-over they can", async () => {
    const s = await makeEntrySetup();
    const member = await makeUser();
    await db().insert(crewMembers).values({ crewId: s.crew.id, userId: member.id, role: "member" });
    const crewId = s.crew.id;
    const refused = await callRoute<{ notice: string }>(crewPage.action, request(`/crews/${crewId}`, { cookie: s.cookie, form: { intent: "leave" } }), { crewId });
    expect(refused.data?.notice).toMatch(/last captain/);
    await callRoute(crewPage.action, request(`/crews/${crewId}`, { cookie: s.cookie, form: { intent: "captain", memberId: member.id } }), { crewId });
    expect((await callRoute(crewPage.action, request(`/crews/${crewId}`, { cookie: s.cookie, form: { intent: "leave" } }), { crewId })).status).toBe(302);
    expect(await db().select().from(crews).where(eq(crews.id, crewId))).toHaveLength(1);
  });
});

describe("entries", () => {
  it("a crew member enters an open competition once; a closed one refuses", async () => {
    const { event, competition } = await makeCompetition({ feeAmount: 1200 });
    const u = await makeUser();
    const cookie = await sessionCookie(u);
    const c = await callRoute(newCrew.action, request("/crews/new", { cookie, form: { name: "Crew", handle: unique("c").toLowerCase() } }));
    const crewId = c.location!.split("/").pop()!;
    const params = { eventSlug: event.slug, competitionSlug: competition.slug };
    const bad = await callRoute<{ error: Record<string, string[]>; initialValue: Record<string, string> }>(enter.action, request("/x", { cookie, form: { crewId, title: "", description: "kept" } }), params);
    expect(bad.data?.error.title).toBeDefined();
    expect(bad.data?.initialValue.description).toBe("kept");
    const ok = await callRoute(enter.action, request("/x", { cookie, form: { crewId, title: "Racer", description: "" } }), params);
    expect(ok.status).toBe(302);
    const twice = await callRoute<{ error: Record<string, string[]> }>(enter.action, request("/x", { cookie, form: { crewId, title: "Again", description: "" } }), params);
    expect(twice.data?.error.crewId[0]).toMatch(/already has an entry/);
    const closed = await makeCompetition({ state: "closed" });
    const no = await callRoute<{ error: Record<string, string[]> }>(enter.action, request("/x", { cookie, form: { crewId, title: "Late", description: "" } }), { eventSlug: closed.event.slug, competitionSlug: closed.competition.slug });
    expect(JSON.stringify(no.data?.error)).toMatch(/not open/);
  });

  it("shows the dashboard to the crew and the event's organizers, 404 to everyone else", async () => {
    const s = await makeEntrySetup();
    const [organizer, otherOrganizer, stranger] = [await makeUser(), await makeUser(), await makeUser()];
    await grantEventRole(s.event.id, organizer.id, "organizer");
    const other = await makeCompetition();
    await grantEventRole(other.event.id, otherOrganizer.id, "organizer");
    const go = async (cookie: string) => callRoute<{ viewer: string }>(dashboard.loader, request(`/entries/${s.entry.id}`, { cookie }), { entryId: s.entry.id });
    expect((await go(s.cookie)).data?.viewer).toBe("crew");
    expect((await go(await sessionCookie(organizer))).data?.viewer).toBe("organizer");
    expect((await go(await sessionCookie(otherOrganizer))).status).toBe(404);
    expect((await go(await sessionCookie(stranger))).status).toBe(404);
    // Organizers read only: they cannot start the crew's checkout.
    const pay = await callRoute(dashboard.action, request(`/entries/${s.entry.id}`, { cookie: await sessionCookie(organizer), form: { intent: "pay" } }), { entryId: s.entry.id });
    expect(pay.status).toBe(403);
  });
});

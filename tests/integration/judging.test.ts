import { and, eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "~/db/client.server";
import { auditLog, competitions, crewMembers, eventRoles, judgeInvites, juryAssignments, outbox, scoreHistory, scoresheets, uploads } from "~/db/schema";
import { stopQueue } from "~/jobs/queue.server";
import { hashToken } from "~/judging/jury.server";
import { seededOrder } from "~/judging/order";
import * as notesApi from "~/routes/api.judging.$competitionId.notes";
import * as scoresApi from "~/routes/api.judging.$competitionId.scores";
import * as inviteRoute from "~/routes/judge-invites.$token";
import * as gridRoute from "~/routes/judging.$competitionId";
import * as entryRoute from "~/routes/judging.$competitionId.entries.$entryId";
import * as historyRoute from "~/routes/organize.$competitionId.entries.$entryId.history";
import * as juryRoute from "~/routes/organize.$competitionId.jury";
import * as standingsRoute from "~/routes/organize.$competitionId.standings";
import { callRoute } from "../support/routes";
import { grantEventRole, makeUser, request, sessionCookie } from "../support/users";
import { callApi, makeCompo } from "./judging-fixtures";

afterAll(async () => {
  await stopQueue();
  await closeDb();
});

type GridOut = { grid: { rows: { entryId: string; crew: string | null; position: number }[]; conflicted: number; withoutUpload: number; scored: number } };
type ApiErr = { error: { status: number; code: string; message: string; fieldErrors?: Record<string, string[]> }; current?: { value: number | null; version: number } };

const post = (cid: string, cookie: string, json: unknown) => request(`/api/judging/${cid}/scores`, { cookie, json });

describe("the scoring grid and who sees it", () => {
  it("shows an assigned judge the judged entries in the stored seeded order, crews hidden while blind", async () => {
    const compo = await makeCompo({ entries: 4 });
    // One more active entry without a complete upload: counted, not shown.
    await db().delete(uploads).where(eq(uploads.entryId, compo.entries[3].id));
    const cookie = await sessionCookie(compo.judges[0]);
    const out = await callRoute<GridOut>(gridRoute.loader, request(`/judging/${compo.competitionId}`, { cookie }), { competitionId: compo.competitionId });
    expect(out.status).toBe(200);
    const [comp] = await db().select({ seed: competitions.orderSeed }).from(competitions).where(eq(competitions.id, compo.competitionId));
    // a new compo's seed is versioned (migration 0008), so its order is FNV-1a over UTF-8
    expect(comp.seed).toMatch(/^v2:[0-9a-f]{32}$/);
    const expected = seededOrder(compo.entries.slice(0, 3).map((e) => e.id), comp.seed);
    expect(out.data!.grid.rows.map((r) => r.entryId)).toEqual(expected);
    expect(out.data!.grid.rows.map((r) => r.position)).toEqual([1, 2, 3]);
    expect(out.data!.grid.rows.every((r) => r.crew === null)).toBe(true);
    expect(out.data!.grid.withoutUpload).toBe(1);
    // Reloading gives the very same order.
    const again = await callRoute<GridOut>(gridRoute.loader, request(`/judging/${compo.competitionId}`, { cookie }), { competitionId: compo.competitionId });
    expect(again.data!.grid.rows.map((r) => r.entryId)).toEqual(expected);
  });

  it("answers 404 to people who are not on this jury, including judges and organizers of other events", async () => {
    const compo = await makeCompo();
    const other = await makeCompo();
    const unassigned = await makeUser();
    await grantEventRole(compo.event.id, unassigned.id, "judge");
    const params = { competitionId: compo.competitionId };
    for (const u of [unassigned, compo.organizer, other.judges[0], other.organizer, compo.entries[0].entrant]) {
      const cookie = await sessionCookie(u);
      expect((await callRoute(gridRoute.loader, request(`/judging/${compo.competitionId}`, { cookie }), params)).status).toBe(404);
      const api = await callApi<ApiErr>(scoresApi.action, post(compo.competitionId, cookie, { entryId: compo.entries[0].id, criterionId: compo.criteria[0].id, value: 5, version: 0 }), params);
      expect(api.status).toBe(404);
    }
    const judge = await sessionCookie(compo.judges[0]);
    expect((await callRoute(gridRoute.loader, request("/judging/not-a-uuid", { cookie: judge }), { competitionId: "not-a-uuid" })).status).toBe(404);
    // An entry and a criterion of another event's compo, sent to this compo's API.
    const cross = await callApi<ApiErr>(scoresApi.action, post(compo.competitionId, judge, { entryId: other.entries[0].id, criterionId: compo.criteria[0].id, value: 5, version: 0 }), params);
    expect(cross.status).toBe(404);
    const crossCrit = await callApi<ApiErr>(scoresApi.action, post(compo.competitionId, judge, { entryId: compo.entries[0].id, criterionId: other.criteria[0].id, value: 5, version: 0 }), params);
    expect(crossCrit.status).toBe(400);
    expect(crossCrit.body.error.fieldErrors?.criterionId).toBeDefined();
    // And the entry page refuses another compo's entry.
    const page = await callRoute(entryRoute.loader, request("/x", { cookie: judge }), { competitionId: compo.competitionId, entryId: other.entries[0].id });
    expect(page.status).toBe(404);
  });
});

describe("conflicts", () => {
  it("leaves a crew member's own entry off their grid and refuses their score with 403", async () => {
    const compo = await makeCompo();
    const judge = compo.judges[0];
    await db().insert(crewMembers).values({ crewId: compo.entries[1].crewId, userId: judge.id });
    const cookie = await sessionCookie(judge);
    const params = { competitionId: compo.competitionId };
    const out = await callRoute<GridOut>(gridRoute.loader, request(`/judging/${compo.competitionId}`, { cookie }), params);
    expect(out.data!.grid.rows.map((r) => r.entryId)).not.toContain(compo.entries[1].id);
    expect(out.data!.grid.rows).toHaveLength(2);
    expect(out.data!.grid.conflicted).toBe(1);
    const api = await callApi<ApiErr>(scoresApi.action, post(compo.competitionId, cookie, { entryId: compo.entries[1].id, criterionId: compo.criteria[0].id, value: 7, version: 0 }), params);
    expect(api.status).toBe(403);
    expect(api.body.error.code).toBe("conflict_of_interest");
    const page = await callRoute(entryRoute.loader, request("/x", { cookie }), { ...params, entryId: compo.entries[1].id });
    // Not on their grid: the page answers 404 like any entry that is not theirs to judge (never confirming it).
    expect(page.status).toBe(404);
  });

  it("lets a judge declare a conflict on the entry page (reason required, kept on error); the row goes and the API refuses", async () => {
    const compo = await makeCompo();
    const cookie = await sessionCookie(compo.judges[0]);
    const params = { competitionId: compo.competitionId, entryId: compo.entries[0].id };
    const bad = await callRoute<{ error: Record<string, string[]>; initialValue: Record<string, string> }>(entryRoute.action, request("/x", { cookie, form: { reason: "x" } }), params);
    expect(bad.status).toBe(200);
    expect(bad.data!.error.reason).toBeDefined();
    expect(bad.data!.initialValue.reason).toBe("x");
    const ok = await callRoute(entryRoute.action, request("/x", { cookie, form: { reason: "I taught the crew Verilog" } }), params);
    expect(ok.status).toBe(302);
    const out = await callRoute<GridOut>(gridRoute.loader, request("/x", { cookie }), { competitionId: compo.competitionId });
    expect(out.data!.grid.rows.map((r) => r.entryId)).not.toContain(compo.entries[0].id);
    const api = await callApi<ApiErr>(scoresApi.action, post(compo.competitionId, cookie, { entryId: compo.entries[0].id, criterionId: compo.criteria[0].id, value: 7, version: 0 }), { competitionId: compo.competitionId });
    expect(api.status).toBe(403);
    // The organizer sees both kinds on the jury page.
    const org = await sessionCookie(compo.organizer);
    const jury = await callRoute<{ jury: { conflicts: { kind: string; reason: string }[] } }>(juryRoute.loader, request("/x", { cookie: org }), { competitionId: compo.competitionId });
    expect(jury.data!.jury.conflicts).toEqual([expect.objectContaining({ kind: "declared", reason: "I taught the crew Verilog" })]);
  });
});

describe("saving scores", () => {
  it("saves with versions, refuses a stale version with 409 and the current value, and writes history in the same step", async () => {
    const compo = await makeCompo();
    const params = { competitionId: compo.competitionId };
    const tab1 = await sessionCookie(compo.judges[0]);
    const tab2 = await sessionCookie(compo.judges[0]);
    const cell = { entryId: compo.entries[0].id, criterionId: compo.criteria[0].id };
    const first = await callApi<{ saved: { value: number; version: number } }>(scoresApi.action, post(compo.competitionId, tab1, { ...cell, value: 5, version: 0 }), params);
    expect(first.status).toBe(200);
    expect(first.body.saved).toEqual({ ...cell, value: 5, version: 1 });
    // The second tab still believes there is no score (version 0).
    const stale = await callApi<ApiErr>(scoresApi.action, post(compo.competitionId, tab2, { ...cell, value: 9, version: 0 }), params);
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe("stale_version");
    expect(stale.body.current).toEqual({ ...cell, value: 5, version: 1 });
    // Having seen version 1, it may change it.
    const second = await callApi<{ saved: { version: number } }>(scoresApi.action, post(compo.competitionId, tab2, { ...cell, value: 7.5, version: 1 }), params);
    expect(second.body.saved.version).toBe(2);
    const cleared = await callApi<{ saved: { value: null; version: number } }>(scoresApi.action, post(compo.competitionId, tab1, { ...cell, value: null, version: 2 }), params);
    expect(cleared.body.saved).toEqual({ ...cell, value: null, version: 0 });

    const [sheet] = await db().select().from(scoresheets).where(and(eq(scoresheets.entryId, cell.entryId), eq(scoresheets.judgeUserId, compo.judges[0].id)));
    const history = await db().select().from(scoreHistory).where(eq(scoreHistory.scoresheetId, sheet.id)).orderBy(scoreHistory.changedAt);
    expect(history.map((h) => [h.oldValue, h.newValue, h.changedBy])).toEqual([
      [null, "5", compo.judges[0].id],
      ["5", "7.5", compo.judges[0].id],
      ["7.5", null, compo.judges[0].id],
    ]);

    // The organizer reads it per entry; another event's organizer cannot.
    const org = await sessionCookie(compo.organizer);
    const h = await callRoute<{ rows: { criterion: string; oldValue: string | null; newValue: string | null; judge: string }[] }>(historyRoute.loader, request("/x", { cookie: org }), { ...params, entryId: cell.entryId });
    expect(h.status).toBe(200);
    expect(h.data!.rows).toHaveLength(3);
    expect(h.data!.rows[0]).toMatchObject({ criterion: "Visuals", oldValue: "7.5", newValue: null, judge: "Judge A" });
    const other = await makeCompo();
    const foreign = await callRoute(historyRoute.loader, request("/x", { cookie: await sessionCookie(other.organizer) }), { ...params, entryId: cell.entryId });
    expect(foreign.status).toBe(404);
    const wrongCompo = await callRoute(historyRoute.loader, request("/x", { cookie: org }), { ...params, entryId: other.entries[0].id });
    expect(wrongCompo.status).toBe(404);
  });

  it("refuses a score off the criterion's scale with 400 and a field error, and a body that is not a score", async () => {
    const compo = await makeCompo({ criteria: [{ name: "Craft", weight: 1, scaleMin: 1, scaleMax: 5 }] });
    const cookie = await sessionCookie(compo.judges[0]);
    const params = { competitionId: compo.competitionId };
    const cell = { entryId: compo.entries[0].id, criterionId: compo.criteria[0].id };
    for (const value of [6, 0, 2.25]) {
      const r = await callApi<ApiErr>(scoresApi.action, post(compo.competitionId, cookie, { ...cell, value, version: 0 }), params);
      expect(r.status, String(value)).toBe(400);
      expect(r.body.error.fieldErrors?.value?.[0]).toMatch(value === 2.25 ? /half point/ : /between 1 and 5/);
    }
    const notNumber = await callApi<ApiErr>(scoresApi.action, post(compo.competitionId, cookie, { ...cell, value: "7", version: 0 }), params);
    expect(notNumber.status).toBe(400);
    expect(notNumber.body.error.fieldErrors?.value).toBeDefined();
    const ok = await callApi(scoresApi.action, post(compo.competitionId, cookie, { ...cell, value: 4.5, version: 0 }), params);
    expect(ok.status).toBe(200);
  });

  it("refuses every score and note change while judging is closed; reopening is logged", async () => {
    const compo = await makeCompo();
    const params = { competitionId: compo.competitionId };
    const judge = await sessionCookie(compo.judges[0]);
    const org = await sessionCookie(compo.organizer);
    const cell = { entryId: compo.entries[0].id, criterionId: compo.criteria[0].id };
    await callApi(scoresApi.action, post(compo.competitionId, judge, { ...cell, value: 6, version: 0 }), params);

    const close = await callRoute(juryRoute.action, request("/x", { cookie: org, form: { intent: "lock", locked: "true", reason: "all in" } }), params);
    expect(close.status).toBe(200);
    const refused = await callApi<ApiErr>(scoresApi.action, post(compo.competitionId, judge, { ...cell, value: 8, version: 1 }), params);
    expect(refused.status).toBe(423);
    expect(refused.body.error.code).toBe("judging_closed");
    const note = await callApi<ApiErr>(notesApi.action, request(`/api/judging/${compo.competitionId}/notes`, { cookie: judge, json: { entryId: cell.entryId, note: "late", version: 0 } }), params);
    expect(note.status).toBe(423);
    // A judge cannot reopen: the jury page is the organizer's.
    expect((await callRoute(juryRoute.action, request("/x", { cookie: judge, form: { intent: "lock", locked: "false" } }), params)).status).toBe(404);

    await callRoute(juryRoute.action, request("/x", { cookie: org, form: { intent: "lock", locked: "false", reason: "wrong entry scored" } }), params);
    const again = await callApi(scoresApi.action, post(compo.competitionId, judge, { ...cell, value: 8, version: 1 }), params);
    expect(again.status).toBe(200);
    const log = await db().select().from(auditLog).where(eq(auditLog.subjectId, compo.competitionId)).orderBy(auditLog.at);
    expect(log.map((l) => l.action)).toEqual(["judging.closed", "judging.reopened"]);
    expect(log[1]).toMatchObject({ actorUserId: compo.organizer.id, details: { reason: "wrong entry scored" } });
  });

  it("saves notes with their own version check", async () => {
    const compo = await makeCompo();
    const params = { competitionId: compo.competitionId };
    const cookie = await sessionCookie(compo.judges[0]);
    const url = `/api/judging/${compo.competitionId}/notes`;
    const a = await callApi<{ saved: { version: number } }>(notesApi.action, request(url, { cookie, json: { entryId: compo.entries[0].id, note: "lovely copper bars", version: 0 } }), params);
    expect(a.body.saved.version).toBe(1);
    const stale = await callApi<ApiErr & { current: { note: string } }>(notesApi.action, request(url, { cookie, json: { entryId: compo.entries[0].id, note: "other", version: 0 } }), params);
    expect(stale.status).toBe(409);
    expect(stale.body.current.note).toBe("lovely copper bars");
  });
});

describe("standings", () => {
  it("counts a small hand-worked case with raw means and with z-scores", async () => {
    /*
     * One criterion (weight 1, scale 0–10), three entries, two judges, all worked out by hand:
     *   judge A (lenient): Entry A 9, Entry B 8, Entry C 7  → mean 8, population SD √((1+0+1)/3) = √(2/3) ≈ 0.8165
     *   judge B (harsh):   Entry A 2, Entry B 6, Entry C 4  → mean 4, population SD √((4+4+0)/3) = √(8/3) ≈ 1.6330
     * raw:  A (9+2)/2 = 5.5, B (8+6)/2 = 7, C (7+4)/2 = 5.5 → B first; A and C equal on score, on median (5.5)
     *       and on top-three placements (2 each) → they share 2nd place.
     * z:    judge A: A +1/0.8165 = +1.2247, B 0, C −1.2247; judge B: A −2/1.633 = −1.2247, B +1.2247, C 0
     *       → A (1.2247 − 1.2247)/2 = 0, B (0 + 1.2247)/2 = 0.6124, C (−1.2247 + 0)/2 = −0.6124 → B, A, C.
     * A third, unassigned judge's and a conflicted judge's scores must not count.
     */
    const compo = await makeCompo({ judges: 3, entries: 3, criteria: [{ name: "Overall", weight: 1 }] });
    const params = { competitionId: compo.competitionId };
    const [ja, jb, jc] = await Promise.all(compo.judges.map(sessionCookie));
    const [A, B, C] = compo.entries;
    const crit = compo.criteria[0].id;
    const give = async (cookie: string, entryId: string, value: number) => {
      const r = await callApi(scoresApi.action, post(compo.competitionId, cookie, { entryId, criterionId: crit, value, version: 0 }), params);
      expect(r.status).toBe(200);
    };
    await give(ja, A.id, 9);
    await give(ja, B.id, 8);
    await give(ja, C.id, 7);
    await give(jb, A.id, 2);
    await give(jb, B.id, 6);
    await give(jb, C.id, 4);
    await give(jc, A.id, 10);
    // Judge C then declares a conflict with Entry A: that score is left out, and judge C has nothing else.
    await callRoute(entryRoute.action, request("/x", { cookie: jc, form: { reason: "my flatmate's crew" } }), { ...params, entryId: A.id });

    const org = await sessionCookie(compo.organizer);
    type View = { view: { method: string; excludedConflicted: number; standings: { ranking: { candidate: string; place: number; score: number; tied: boolean }[]; judges: { judge: string; mean: number; sd: number; count: number }[]; entries: { candidate: string; raw: number; normalised: number }[] } } };
    const setMethod = (m: string) => callRoute(standingsRoute.action, request("/x", { cookie: org, form: { juryMethod: m } }), params);

    expect((await setMethod("jury-raw")).status).toBe(200);
    const raw = (await callRoute<View>(standingsRoute.loader, request("/x", { cookie: org }), params)).data!.view;
    expect(raw.method).toBe("jury-raw");
    expect(raw.excludedConflicted).toBe(1);
    expect(raw.standings.ranking.map((r) => [r.candidate, r.place, r.tied])).toEqual([
      [B.id, 1, false],
      ...[A.id, C.id].sort().map((id) => [id, 2, true]),
    ]);
    expect(raw.standings.ranking[0].score).toBeCloseTo(7, 10);
    const judgeA = raw.standings.judges.find((j) => j.judge === compo.judges[0].id)!;
    expect(judgeA).toMatchObject({ count: 3, mean: 8 });
    expect(judgeA.sd).toBeCloseTo(Math.sqrt(2 / 3), 10);
    expect(raw.standings.judges.map((j) => j.judge)).not.toContain(compo.judges[2].id);

    await setMethod("jury-z");
    const z = (await callRoute<View>(standingsRoute.loader, request("/x", { cookie: org }), params)).data!.view;
    expect(z.standings.ranking.map((r) => [r.candidate, r.place])).toEqual([
      [B.id, 1],
      [A.id, 2],
      [C.id, 3],
    ]);
    const fig = new Map(z.standings.entries.map((e) => [e.candidate, e.normalised]));
    expect(fig.get(A.id)).toBeCloseTo(0, 10);
    expect(fig.get(B.id)).toBeCloseTo(0.6124, 4);
    expect(fig.get(C.id)).toBeCloseTo(-0.6124, 4);
    const changed = await db().select().from(auditLog).where(and(eq(auditLog.subjectId, compo.competitionId), eq(auditLog.action, "standings.jury-method")));
    expect(changed).toHaveLength(2);

    // A bad method keeps the form and says why; a judge and another event's organizer are refused.
    const bad = await callRoute<{ error: Record<string, string[]> }>(standingsRoute.action, request("/x", { cookie: org, form: { juryMethod: "coin-toss" } }), params);
    expect(bad.data!.error.juryMethod).toBeDefined();
    expect((await callRoute(standingsRoute.loader, request("/x", { cookie: ja }), params)).status).toBe(404);
    const other = await makeCompo();
    expect((await callRoute(standingsRoute.loader, request("/x", { cookie: await sessionCookie(other.organizer) }), params)).status).toBe(404);
  });
});

describe("the jury page: invitations and assignments", () => {
  it("invites by e-mail through the outbox, stores only the token's hash, and accepting signed in makes a judge", async () => {
    const compo = await makeCompo({ judges: 0 });
    const params = { competitionId: compo.competitionId };
    const org = await sessionCookie(compo.organizer);
    const invitee = await makeUser({ name: "Ivy Invited" });

    const bad = await callRoute<{ result: { error: Record<string, string[]>; initialValue: Record<string, string> } }>(juryRoute.action, request("/x", { cookie: org, form: { intent: "invite", email: "not-mail" } }), params);
    expect(bad.data!.result.error.email).toBeDefined();
    expect(bad.data!.result.initialValue.email).toBe("not-mail");

    const sent = await callRoute(juryRoute.action, request("/x", { cookie: org, form: { intent: "invite", email: invitee.email.toUpperCase() } }), params);
    expect(sent.status).toBe(200);
    const [mail] = await db().select().from(outbox).where(eq(outbox.toAddress, invitee.email));
    expect(mail.subject).toMatch(/invited to judge/);
    const token = /\/judge-invites\/([A-Za-z0-9_-]+)/.exec(mail.textBody)![1];
    const [invite] = await db().select().from(judgeInvites).where(eq(judgeInvites.eventId, compo.event.id));
    expect(invite.tokenHash).toBe(hashToken(token));
    expect(invite.tokenHash).not.toContain(token);
    expect(invite.expiresAt.getTime()).toBeGreaterThan(Date.now() + 13 * 24 * 3600 * 1000);

    // Someone else signed in cannot accept it.
    const stranger = await sessionCookie(await makeUser());
    const view = await callRoute<{ matches: boolean }>(inviteRoute.loader, request("/x", { cookie: stranger }), { token });
    expect(view.data!.matches).toBe(false);
    expect((await callRoute(inviteRoute.action, request("/x", { cookie: stranger, method: "POST" }), { token })).status).toBe(403);
    // Anonymous visitors are sent to sign in first.
    const anon = await callRoute(inviteRoute.loader, request(`/judge-invites/${token}`), { token });
    expect(anon.status).toBe(302);
    expect(anon.location).toContain("/sign-in?next=");

    const mine = await sessionCookie(invitee);
    const accepted = await callRoute(inviteRoute.action, request("/x", { cookie: mine, method: "POST" }), { token });
    expect(accepted.status).toBe(302);
    const roles = await db().select().from(eventRoles).where(and(eq(eventRoles.eventId, compo.event.id), eq(eventRoles.userId, invitee.id)));
    expect(roles.map((r) => r.role)).toEqual(["judge"]);
    expect((await callRoute(inviteRoute.action, request("/x", { cookie: mine, method: "POST" }), { token })).status).toBe(409);
    expect((await callRoute(inviteRoute.loader, request("/x", { cookie: mine }), { token: "nope" })).status).toBe(404);

    // Not on the jury until assigned.
    expect((await callRoute(gridRoute.loader, request("/x", { cookie: mine }), params)).status).toBe(404);
    await callRoute(juryRoute.action, request("/x", { cookie: org, form: { intent: "assign", judgeUserId: invitee.id, assigned: "true" } }), params);
    expect((await callRoute(gridRoute.loader, request("/x", { cookie: mine }), params)).status).toBe(200);
    // Inviting an existing judge is refused beside the field.
    const dup = await callRoute<{ result: { error: Record<string, string[]> } }>(juryRoute.action, request("/x", { cookie: org, form: { intent: "invite", email: invitee.email } }), params);
    expect(dup.data!.result.error.email).toEqual(["Already a judge of this event."]);
  });

  it("refuses an expired invitation, and assignments of people who are not judges of the event", async () => {
    const compo = await makeCompo({ judges: 0 });
    const u = await makeUser();
    const token = "expired-token-for-test";
    await db().insert(judgeInvites).values({ eventId: compo.event.id, email: u.email, tokenHash: hashToken(token), expiresAt: new Date(Date.now() - 1000) });
    expect((await callRoute(inviteRoute.action, request("/x", { cookie: await sessionCookie(u), method: "POST" }), { token })).status).toBe(410);
    const org = await sessionCookie(compo.organizer);
    const other = await makeCompo();
    const out = await callRoute(juryRoute.action, request("/x", { cookie: org, form: { intent: "assign", judgeUserId: other.judges[0].id, assigned: "true" } }), { competitionId: compo.competitionId });
    expect(out.status).toBe(404);
  });

  it("switches to a per-judge order from each judge's stored seed, and shows crews when not blind", async () => {
    const compo = await makeCompo({ entries: 5, judges: 2 });
    const params = { competitionId: compo.competitionId };
    const org = await sessionCookie(compo.organizer);
    await callRoute(juryRoute.action, request("/x", { cookie: org, form: { intent: "options", orderMode: "per-judge" } }), params);
    const orders = [];
    for (const j of compo.judges) {
      const out = await callRoute<GridOut>(gridRoute.loader, request("/x", { cookie: await sessionCookie(j) }), params);
      orders.push(out.data!.grid.rows.map((r) => r.entryId));
      expect(out.data!.grid.rows.every((r) => r.crew !== null)).toBe(true);
    }
    const seeds = await db().select().from(juryAssignments).where(eq(juryAssignments.competitionId, compo.competitionId));
    for (const [i, j] of compo.judges.entries()) {
      const seed = seeds.find((s) => s.judgeUserId === j.id)!.orderSeed;
      expect(orders[i]).toEqual(seededOrder(compo.entries.map((e) => e.id), seed));
    }
  });
});

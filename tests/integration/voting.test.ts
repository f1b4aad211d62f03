import { and, count, eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "~/db/client.server";
import { ballotHistory, ballots, voteCodes, voteCodeScopes } from "~/db/schema";
import { stopQueue } from "~/jobs/queue.server";
import * as apiBallots from "~/routes/api.ballots";
import * as audienceRoute from "~/routes/organize.audience";
import * as codesCsv from "~/routes/organize.audience.codes-csv";
import * as codesSheet from "~/routes/organize.audience.codes";
import * as voteRoute from "~/routes/vote";
import { hitRateLimit } from "~/voting/rate-limit.server";
import { CAST_LIMIT, castBallot, codeCookieName, generateVoteCodes, VoteError } from "~/voting/voting.server";
import { callRoute, routeArgs } from "../support/routes";
import { makeUser, request, sessionCookie, unique } from "../support/users";
import { makeCompo } from "./showcase.fixtures";

afterAll(async () => {
  await stopQueue();
  await closeDb();
});

async function put(competitionId: string, body: unknown, cookie?: string): Promise<{ status: number; json: any; setCookie: string | null }> {
  // A resource route's thrown Response is its answer, as React Router serves it.
  const res = (await apiBallots.action((await routeArgs(request(`/api/ballots/${competitionId}`, { method: "PUT", json: body, cookie }), { competitionId })) as never).catch((thrown: unknown) => {
    if (thrown instanceof Response) return thrown;
    throw thrown;
  })) as Response;
  return { status: res.status, json: await res.json(), setCookie: res.headers.get("set-cookie") };
}

async function ballotRows(competitionId: string) {
  return db().select().from(ballots).where(eq(ballots.competitionId, competitionId));
}

describe("casting a ballot", () => {
  it("a second ballot replaces the first and both are in the history", async () => {
    const f = await makeCompo({ method: "points" });
    const voter = await makeUser();
    const cookie = await sessionCookie(voter);
    const [a, b] = f.entries;
    const first = await put(f.competitionId, { ballot: { points: { [a.id]: 5, [b.id]: 1 } } }, cookie);
    expect(first.status).toBe(200);
    expect(first.json.replaced).toBe(false);
    const second = await put(f.competitionId, { ballot: { points: { [a.id]: 0, [b.id]: 4 } } }, cookie);
    expect(second.status).toBe(200);
    expect(second.json.replaced).toBe(true);
    const rows = await ballotRows(f.competitionId);
    expect(rows).toHaveLength(1);
    expect(rows[0].content).toEqual({ points: { [a.id]: 0, [b.id]: 4 } });
    const history = await db().select().from(ballotHistory).where(eq(ballotHistory.ballotId, rows[0].id)).orderBy(ballotHistory.changedAt);
    expect(history.map((h) => h.content)).toEqual([{ points: { [a.id]: 5, [b.id]: 1 } }, { points: { [a.id]: 0, [b.id]: 4 } }]);
    // The voter reads back their own ballot.
    const mine = (await apiBallots.loader((await routeArgs(request(`/api/ballots/${f.competitionId}`, { cookie }), { competitionId: f.competitionId })) as never)) as Response;
    expect(((await mine.json()) as any).ballot.content).toEqual({ points: { [a.id]: 0, [b.id]: 4 } });
  });

  it("refuses ballots before the window opens and after it closes, storing nothing", async () => {
    const early = await makeCompo({ votingOpensAt: new Date(Date.now() + 3600_000), votingClosesAt: new Date(Date.now() + 7200_000) });
    const late = await makeCompo({ votingOpensAt: new Date(Date.now() - 7200_000), votingClosesAt: new Date(Date.now() - 1000) });
    const cookie = await sessionCookie(await makeUser());
    const e1 = await put(early.competitionId, { ballot: { points: { [early.entries[0].id]: 3 } } }, cookie);
    expect(e1.status).toBe(409);
    expect(e1.json.error.code).toBe("voting_not_open");
    const e2 = await put(late.competitionId, { ballot: { points: { [late.entries[0].id]: 3 } } }, cookie);
    expect(e2.status).toBe(409);
    expect(e2.json.error.code).toBe("voting_closed");
    expect(await ballotRows(early.competitionId)).toHaveLength(0);
    expect(await ballotRows(late.competitionId)).toHaveLength(0);
    // The window edge is exclusive at close, inclusive at open (server time).
    const at = new Date("2030-01-01T20:00:00Z");
    const edge = await makeCompo({ votingOpensAt: at, votingClosesAt: new Date(at.getTime() + 60_000) });
    const v = { kind: "user" as const, userId: (await makeUser()).id, emailVerified: true };
    await expect(castBallot({ competitionId: edge.competitionId, voter: v, content: { points: { [edge.entries[0].id]: 1 } }, now: at })).resolves.toMatchObject({ replaced: false });
    await expect(castBallot({ competitionId: edge.competitionId, voter: v, content: { points: { [edge.entries[0].id]: 2 } }, now: new Date(at.getTime() + 60_000) })).rejects.toMatchObject({ code: "voting_closed" });
  });

  it("gives an invalid ballot a clear error and stores nothing; a disqualified entry is not a candidate", async () => {
    const f = await makeCompo({ method: "schulze" });
    const cookie = await sessionCookie(await makeUser());
    const bad = await put(f.competitionId, { ballot: { ranking: [f.entries[0].id, f.entries[0].id, f.disqualified.id] } }, cookie);
    expect(bad.status).toBe(400);
    expect(bad.json.error.code).toBe("invalid_ballot");
    expect(bad.json.error.fieldErrors.ballot.join(" ")).toMatch(/ranked more than once/);
    expect(bad.json.error.fieldErrors.ballot.join(" ")).toMatch(/is not an entry of this competition/);
    const wrongShape = await put(f.competitionId, { ballot: { points: { [f.entries[0].id]: 3 } } }, cookie);
    expect(wrongShape.status).toBe(400);
    expect(wrongShape.json.error.message).toMatch(/ranked ballot/);
    expect(await ballotRows(f.competitionId)).toHaveLength(0);
    const notJson = await callRoute(apiBallots.action, request(`/api/ballots/${f.competitionId}`, { method: "PUT", cookie, headers: { "content-type": "application/json" } }), { competitionId: f.competitionId });
    expect(notJson.status).toBe(400);
  });

  it("refuses unverified accounts and anonymous callers without a code", async () => {
    const f = await makeCompo();
    const unverified = await makeUser({ verified: false });
    const u = await castBallot({ competitionId: f.competitionId, voter: { kind: "user", userId: unverified.id, emailVerified: false }, content: { points: { [f.entries[0].id]: 3 } } }).catch((e: unknown) => e);
    expect(u).toBeInstanceOf(VoteError);
    expect((u as VoteError).code).toBe("email_unverified");
    const anon = await put(f.competitionId, { ballot: { points: { [f.entries[0].id]: 3 } } });
    expect(anon.status).toBe(401);
    expect(await ballotRows(f.competitionId)).toHaveLength(0);
  });

  it("redeems a vote code once; its holder may change the ballot; anyone typing it again is refused", async () => {
    const f = await makeCompo({ method: "borda" });
    const [code] = await generateVoteCodes(f.competitionId, 1);
    const ranking = f.entries.map((e) => e.id);
    const first = await put(f.competitionId, { code: code.toLowerCase().replace("-", " "), ballot: { ranking } });
    expect(first.status).toBe(200);
    expect(first.setCookie).toContain(codeCookieName(f.competitionId));
    const holder = first.setCookie!.split(";")[0];
    const [row] = await db().select().from(voteCodes).where(eq(voteCodes.code, code));
    const [scope] = await db().select().from(voteCodeScopes).where(eq(voteCodeScopes.voteCodeId, row.id));
    expect(scope.redeemedAt).not.toBeNull();

    const again = await put(f.competitionId, { code, ballot: { ranking: [...ranking].reverse() } });
    expect(again.status).toBe(409);
    expect(again.json.error.code).toBe("code_used");

    const change = await put(f.competitionId, { ballot: { ranking: [...ranking].reverse() } }, holder);
    expect(change.status).toBe(200);
    expect(change.json.replaced).toBe(true);
    const rows = await ballotRows(f.competitionId);
    expect(rows).toHaveLength(1);
    expect(rows[0].voteCodeId).toBe(row.id);
    expect(rows[0].content).toEqual({ ranking: [...ranking].reverse() });

    // A forged holder cookie does not count.
    const forged = `${codeCookieName(f.competitionId)}=${row.id}.AAAA`;
    expect((await put(f.competitionId, { ballot: { ranking } }, forged)).status).toBe(401);
    // An unknown code, and one of another competition.
    const other = await makeCompo({ method: "borda" });
    const [otherCode] = await generateVoteCodes(other.competitionId, 1);
    expect((await put(f.competitionId, { code: "ABCD-EFGH", ballot: { ranking } })).json.error.code).toBe("code_unknown");
    expect((await put(f.competitionId, { code: otherCode, ballot: { ranking } })).json.error.code).toBe("code_unknown");
    expect((await put(f.competitionId, { code: "nope", ballot: { ranking } })).json.error.code).toBe("code_invalid");
    // An invalid ballot does not use up a fresh code.
    const [fresh] = await generateVoteCodes(f.competitionId, 1);
    expect((await put(f.competitionId, { code: fresh, ballot: { ranking: [] } })).status).toBe(400);
    const [freshRow] = await db().select({ redeemedAt: voteCodeScopes.redeemedAt }).from(voteCodes).innerJoin(voteCodeScopes, eq(voteCodeScopes.voteCodeId, voteCodes.id)).where(eq(voteCodes.code, fresh));
    expect(freshRow.redeemedAt).toBeNull();
  });

  it("rate-limits casting per voter", async () => {
    const f = await makeCompo();
    const cookie = await sessionCookie(await makeUser());
    const statuses: number[] = [];
    for (let i = 0; i <= CAST_LIMIT; i++) statuses.push((await put(f.competitionId, { ballot: { points: { [f.entries[0].id]: i % 6 } } }, cookie)).status);
    expect(statuses.slice(0, CAST_LIMIT).every((s) => s === 200)).toBe(true);
    expect(statuses[CAST_LIMIT]).toBe(429);
    const [b] = await ballotRows(f.competitionId);
    expect(b.content).toEqual({ points: { [f.entries[0].id]: (CAST_LIMIT - 1) % 6 } }); // the last accepted ballot stands
    const [h] = await db().select({ n: count() }).from(ballotHistory).where(eq(ballotHistory.ballotId, b.id));
    expect(h.n).toBe(CAST_LIMIT);
    // Another voter is not affected.
    expect((await put(f.competitionId, { ballot: { points: { [f.entries[0].id]: 1 } } }, await sessionCookie(await makeUser()))).status).toBe(200);
  });

  it("the counter starts a new window once the old one has passed", async () => {
    const key = unique("rl");
    const t0 = new Date("2030-05-01T10:00:00Z");
    expect((await hitRateLimit(key, 2, 60, t0)).allowed).toBe(true);
    expect((await hitRateLimit(key, 2, 60, new Date(t0.getTime() + 1000))).allowed).toBe(true);
    const third = await hitRateLimit(key, 2, 60, new Date(t0.getTime() + 2000));
    expect(third).toMatchObject({ allowed: false, count: 3, retryAfterSeconds: 58 });
    expect(await hitRateLimit(key, 2, 60, new Date(t0.getTime() + 61_000))).toMatchObject({ allowed: true, count: 1 });
  });
});

describe("the vote page", () => {
  it("casts through the form and keeps the input on a wrong code", async () => {
    const f = await makeCompo({ method: "points" });
    const params = { eventSlug: f.event.slug, competitionSlug: f.slug };
    const page = await callRoute<{ window: { status: string }; entries: { id: string }[]; voter: { kind: string } }>(voteRoute.loader, request(`/e/${f.event.slug}/${f.slug}/vote`), params);
    expect(page.data!.window.status).toBe("open");
    expect(page.data!.voter.kind).toBe("anonymous");
    expect(page.data!.entries.map((e) => e.id).sort()).toEqual(f.entries.map((e) => e.id).sort());
    const form = { code: "ZZZZ-ZZZZ", [`points.${f.entries[0].id}`]: "4" };
    const wrong = await callRoute<{ result: { error: Record<string, string[]>; initialValue: Record<string, unknown> } }>(voteRoute.action, request(`/e/${f.event.slug}/${f.slug}/vote`, { form }), params);
    expect(wrong.data!.result.error.code.join(" ")).toMatch(/does not vote in this compo/);
    expect(JSON.stringify(wrong.data!.result.initialValue)).toContain('"4"');
    const signedIn = await sessionCookie(await makeUser());
    const ok = await callRoute<{ saved: { replaced: boolean } | null }>(voteRoute.action, request(`/e/${f.event.slug}/${f.slug}/vote`, { form: { [`points.${f.entries[0].id}`]: "4", [`points.${f.entries[1].id}`]: "" }, cookie: signedIn }), params);
    // A successful cast returns data(…, {headers}); unwrap it as React Router does.
    const okData = (ok.data as unknown as { type?: string; data?: { saved: unknown } }).type === "DataWithResponseInit" ? (ok.data as unknown as { data: { saved: unknown } }).data : ok.data!;
    expect(okData.saved).toMatchObject({ replaced: false });
    const [b] = await ballotRows(f.competitionId);
    expect(b.content).toEqual({ points: { [f.entries[0].id]: 4 } });
  });
});

describe("the organizer's audience page", () => {
  it("shows the live count to the organizer only, and makes printable codes", async () => {
    const f = await makeCompo({ method: "points" });
    const params = { competitionId: f.competitionId };
    const voterCookie = await sessionCookie(await makeUser());
    // A stranger is told nothing exists here (404), as for a made-up id; anonymous callers are sent to sign in.
    expect((await callRoute(audienceRoute.loader, request(`/organize/${f.competitionId}/audience`, { cookie: voterCookie }), params)).status).toBe(404);
    expect((await callRoute(audienceRoute.loader, request(`/organize/${f.competitionId}/audience`), params)).status).toBe(302);
    expect((await callRoute(codesCsv.loader, request("/x", { cookie: voterCookie }), params)).status).toBe(404);

    await put(f.competitionId, { ballot: { points: { [f.entries[0].id]: 5 } } }, voterCookie);
    await put(f.competitionId, { ballot: { points: { [f.entries[0].id]: 4 } } }, voterCookie);
    const made = await callRoute<{ made: number }>(audienceRoute.action, request(`/organize/${f.competitionId}/audience`, { form: { count: "12" }, cookie: f.organizerCookie }), params);
    expect(made.data!.made).toBe(12);
    const tooMany = await callRoute<{ made: number; result: { error: Record<string, string[]> } }>(audienceRoute.action, request("/x", { form: { count: "5000" }, cookie: f.organizerCookie }), params);
    expect(tooMany.data!.made).toBe(0);
    expect(tooMany.data!.result.error.count.join(" ")).toMatch(/At most 500/);

    const page = await callRoute<{ count: { ballots: number; changes: number; codesIssued: number; standings: { candidate: string; score: number | null }[] } }>(
      audienceRoute.loader,
      request(`/organize/${f.competitionId}/audience`, { cookie: f.organizerCookie }),
      params,
    );
    expect(page.data!.count).toMatchObject({ ballots: 1, changes: 1, codesIssued: 12 });
    expect(page.data!.count.standings.find((r) => r.candidate === f.entries[0].id)?.score).toBe(4);

    const csv = (await codesCsv.loader((await routeArgs(request("/x", { cookie: f.organizerCookie }), params)) as never)) as Response;
    const lines = (await csv.text()).trim().split("\r\n");
    expect(lines[0]).toBe("code,party_wide,votes_in,created_at,used_in");
    expect(lines).toHaveLength(13);
    const sheet = (await codesSheet.loader((await routeArgs(request("/x", { cookie: f.organizerCookie }), params)) as never)) as Response;
    const html = await sheet.text();
    expect(sheet.headers.get("content-type")).toContain("text/html");
    expect(html.match(/class="slip"/g)).toHaveLength(12);
    const [one] = await db().select({ code: voteCodes.code }).from(voteCodes).innerJoin(voteCodeScopes, eq(voteCodeScopes.voteCodeId, voteCodes.id)).where(and(eq(voteCodeScopes.competitionId, f.competitionId))).limit(1);
    expect(html).toContain(one.code);
  });
});

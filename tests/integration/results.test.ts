import { spawnSync } from "node:child_process";
import { resolve } from "node:path";
import { and, eq, like } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "~/db/client.server";
import { ballots, competitions, outbox, resultsSnapshots, scores, scoresheets } from "~/db/schema";
import { stopQueue } from "~/jobs/queue.server";
import { legacyCanonicalJson, payloadHash, sha256Hex } from "~/results/canonical";
import { computeStandings, publishedResults, verifySnapshot } from "~/results/results.server";
import type { ResultsPayload } from "~/results/shapes";
import * as organizeResults from "~/routes/organize.results";
import * as recountJson from "~/routes/recount.json";
import * as resultsCsv from "~/routes/results.csv";
import * as resultsPage from "~/routes/results";
import * as resultsTxt from "~/routes/results.txt";
import * as resultsJson from "~/routes/results.json";
import * as stageRoute from "~/routes/stage";
import type { JuryStandings } from "~/scoring/jury";
import { mixStandings } from "~/scoring/mix";
import { parseRecountInput, recount } from "~/scoring/recount";
import type { StageScreen } from "~/stage/screens";
import { castBallot } from "~/voting/voting.server";
import { runRecount } from "../../scripts/recount";
import { callRoute, routeArgs } from "../support/routes";
import { makeUser, request, sessionCookie } from "../support/users";
import { addScores, makeCompo, type CompoFixture } from "./showcase.fixtures";

afterAll(async () => {
  await stopQueue();
  await closeDb();
});

/** Three entries, two judges, four audience ballots: jury and audience disagree, so the weight matters. */
async function scoredCompo(): Promise<CompoFixture> {
  const f = await makeCompo({ state: "judging", method: "points", juryWeightPct: 60, entryCount: 3 });
  // [judge][entry] = [visuals, sound]
  await addScores(f, [
    [[9, 7], [6, 5], [3, 4]],
    [[8, 6], [7, 7], [2, 3]],
  ]);
  const [a, b, c] = f.entries.map((e) => e.id);
  const votes = [
    { [a]: 1, [b]: 5, [c]: 3 },
    { [a]: 2, [b]: 4, [c]: 5 },
    { [a]: 0, [b]: 5, [c]: 4 },
    { [b]: 3 },
  ];
  for (const points of votes) {
    const u = await makeUser();
    await castBallot({ competitionId: f.competitionId, voter: { kind: "user", userId: u.id, emailVerified: true }, content: { points } });
  }
  return f;
}

const rowsOf = (p: ResultsPayload) => p.standings.map((r) => ({ entryId: r.entryId, place: r.place }));

async function publish(f: CompoFixture, note = "") {
  return callRoute<{ published: { version: number; sha256: string } | null; result: { error?: Record<string, string[]> } }>(
    organizeResults.action,
    request(`/organize/${f.competitionId}/results`, { form: { note, confirm: "yes" }, cookie: f.organizerCookie }),
    { competitionId: f.competitionId },
  );
}

async function text(loader: unknown, f: CompoFixture, query = ""): Promise<{ status: number; body: string; type: string | null }> {
  const out = await callRoute<Response>(loader, request(`/e/${f.event.slug}/${f.slug}/x${query}`), { eventSlug: f.event.slug, competitionSlug: f.slug });
  if (out.status !== 200) return { status: out.status, body: "", type: null };
  const res = (await (loader as (a: unknown) => Promise<Response>)((await routeArgs(request(`/e/${f.event.slug}/${f.slug}/x${query}`), { eventSlug: f.event.slug, competitionSlug: f.slug })))) as Response;
  return { status: res.status, body: await res.text(), type: res.headers.get("content-type") };
}

describe("previewing and publishing results", () => {
  it("lets only the organizer preview and publish; publishing freezes a hashed snapshot and moves to results", async () => {
    const f = await scoredCompo();
    const params = { competitionId: f.competitionId };
    const stranger = await sessionCookie(await makeUser());
    expect((await callRoute(organizeResults.loader, request("/x", { cookie: stranger }), params)).status).toBe(404);
    expect((await callRoute(organizeResults.action, request("/x", { form: { confirm: "yes" }, cookie: stranger }), params)).status).toBe(404);

    const before = await callRoute<{ competition: { id: string } }>(resultsPage.loader, request(`/e/${f.event.slug}/${f.slug}/results`), { eventSlug: f.event.slug, competitionSlug: f.slug });
    expect((before.data as unknown as { shown: unknown }).shown).toBeNull();
    expect((await text(resultsCsv.loader, f)).status).toBe(404);

    const preview = await callRoute<{ preview: { standings: ResultsPayload["standings"] } }>(organizeResults.loader, request("/x", { cookie: f.organizerCookie }), params);
    expect(preview.data!.preview.standings).toHaveLength(3);

    const unconfirmed = await callRoute<{ result: { error: Record<string, string[]> } }>(organizeResults.action, request("/x", { form: { note: "" }, cookie: f.organizerCookie }), params);
    expect(unconfirmed.data!.result.error.confirm.join(" ")).toMatch(/can never change/);
    expect(await db().select().from(resultsSnapshots).where(eq(resultsSnapshots.competitionId, f.competitionId))).toHaveLength(0);

    const out = await publish(f);
    expect(out.data!.published!.version).toBe(1);
    const [comp] = await db().select({ state: competitions.state }).from(competitions).where(eq(competitions.id, f.competitionId));
    expect(comp.state).toBe("results");

    const v1 = (await publishedResults(f.competitionId, 1))!;
    expect(v1.sha256).toBe(out.data!.published!.sha256);
    expect(payloadHash(v1.payload)).toBe(v1.sha256);
    expect(v1.payload.standings.map((r) => r.entryId)).toEqual(preview.data!.preview.standings.map((r) => r.entryId));
    // Disqualified and upload-less entries are not ranked.
    expect(v1.payload.standings.map((r) => r.entryId)).not.toContain(f.disqualified.id);
    expect(v1.payload.standings.map((r) => r.entryId)).not.toContain(f.noUpload.id);
    // Jury raw scores, by hand: weights 2 (visuals) and 1 (sound); judges' weighted means averaged.
    // Entry A: ((2·9+7)/3 + (2·8+6)/3) / 2 = (8.333… + 7.333…) / 2 = 7.8333…
    const rowA = v1.payload.standings.find((r) => r.entryId === f.entries[0].id)!;
    expect(rowA.jury.score).toBeCloseTo(47 / 6, 10);
    // Audience points, by hand: A 1+2+0 = 3, B 5+4+5+3 = 17, C 3+5+4 = 12.
    expect(v1.payload.standings.find((r) => r.entryId === f.entries[1].id)!.audience.score).toBe(17);
    expect(rowA.audience.score).toBe(3);
    // Mixed 60 % jury / 40 % audience on min–max scales; B wins: jury (6.1667−3)/(7.8333−3)=0.655…, audience 1.
    expect(v1.payload.standings[0].entryId).toBe(f.entries[1].id);
    expect(v1.payload.standings.map((r) => r.place)).toEqual([1, 2, 3]);

    // Anonymised: no judge or voter ids or names, no notes.
    const json = JSON.stringify(v1.payload);
    for (const j of f.judges) expect(json).not.toContain(j.id);
    expect(json).not.toContain("private note");
    expect(json).not.toContain("@example.test");
  });

  it("keeps a published snapshot unchanged when scores and ballots change later; a correction is a new version with a note", async () => {
    const f = await scoredCompo();
    await publish(f);
    const v1 = (await publishedResults(f.competitionId, 1))!;
    const frozen = JSON.stringify(v1.payload);

    // Later changes: a judge flips a score, a ballot is rewritten behind the scenes.
    const [sheet] = await db().select().from(scoresheets).where(eq(scoresheets.entryId, f.entries[2].id)).limit(1);
    await db().update(scores).set({ value: 10 }).where(eq(scores.scoresheetId, sheet.id));
    const [ballot] = await db().select().from(ballots).where(eq(ballots.competitionId, f.competitionId)).limit(1);
    await db().update(ballots).set({ content: { points: { [f.entries[2].id]: 5 } } }).where(eq(ballots.id, ballot.id));

    const again = (await publishedResults(f.competitionId, 1))!;
    expect(JSON.stringify(again.payload)).toBe(frozen);
    expect(verifySnapshot(again)).toBe(true);
    const live = await computeStandings(f.competitionId);
    expect(JSON.stringify(live.standings)).not.toBe(JSON.stringify(v1.payload.standings));

    const noNote = await publish(f, "   ");
    expect(noNote.data!.published).toBeNull();
    expect(noNote.data!.result.error!.note.join(" ")).toMatch(/needs a note/);
    const fixed = await publish(f, "A judge's score for Entry C was entered on the wrong line.");
    expect(fixed.data!.published!.version).toBe(2);

    const page = await callRoute<{ shown: { version: number; note: string }; versions: { version: number }[] }>(resultsPage.loader, request(`/e/${f.event.slug}/${f.slug}/results`), { eventSlug: f.event.slug, competitionSlug: f.slug });
    expect(page.data!.shown.version).toBe(2);
    expect(page.data!.shown.note).toMatch(/wrong line/);
    expect(page.data!.versions.map((v) => v.version)).toEqual([2, 1]);
    const old = await callRoute<{ shown: { version: number; payload: { standings: unknown } } }>(resultsPage.loader, request(`/e/${f.event.slug}/${f.slug}/results?version=1`), { eventSlug: f.event.slug, competitionSlug: f.slug });
    expect(old.data!.shown.version).toBe(1);
    expect(JSON.stringify(old.data!.shown.payload.standings)).toBe(JSON.stringify(v1.payload.standings));
    expect((await callRoute(resultsPage.loader, request(`/e/${f.event.slug}/${f.slug}/results?version=9`), { eventSlug: f.event.slug, competitionSlug: f.slug })).status).toBe(404);
    expect((await callRoute(resultsPage.loader, request(`/e/${f.event.slug}/${f.slug}/results?version=abc`), { eventSlug: f.event.slug, competitionSlug: f.slug })).status).toBe(400);

    // Every entrant got one mail per version: place, jury figures and the link.
    for (const version of [1, 2]) {
      const mails = await db().select().from(outbox).where(like(outbox.dedupeKey, `results:${f.competitionId}:v${version}:%`));
      expect(mails.map((m) => m.toAddress).sort()).toEqual(f.entries.map((e) => e.member.email).sort());
    }
    const [mailA] = await db().select().from(outbox).where(and(like(outbox.dedupeKey, `results:${f.competitionId}:v1:%`), eq(outbox.toAddress, f.entries[1].member.email)));
    expect(mailA.subject).toMatch(/placed 1 in Fixture Compo/);
    expect(mailA.textBody).toMatch(/Jury \(jury, mean of raw scores\): score \d+\.\d{3}, jury place \d/);
    expect(mailA.textBody).toContain(`/e/${f.event.slug}/${f.slug}/results?version=1`);
  });

  it("offers recount files that recount to the published ranking, a CSV and a text sheet", async () => {
    const f = await scoredCompo();
    await publish(f);
    const v1 = (await publishedResults(f.competitionId))!;

    const juryFile = await text(recountJson.loader, f, "?side=jury");
    const audienceFile = await text(recountJson.loader, f, "?side=audience");
    expect(juryFile.type).toContain("application/json");
    for (const file of [juryFile.body, audienceFile.body]) {
      for (const j of f.judges) expect(file).not.toContain(j.id);
      expect(file).not.toContain("@example.test");
    }
    const jury = parseRecountInput(JSON.parse(juryFile.body));
    const audience = parseRecountInput(JSON.parse(audienceFile.body));
    if (!jury.ok || !audience.ok) throw new Error("the downloads are not valid recount files");
    const juryOut = recount(jury.input);
    const audienceOut = recount(audience.input);
    const juryPlaces = Object.fromEntries(juryOut.ranking.map((r) => [r.candidate, r.place]));
    const audiencePlaces = Object.fromEntries(audienceOut.ranking.map((r) => [r.candidate, r.place]));
    for (const r of v1.payload.standings) {
      expect(juryPlaces[r.entryId]).toBe(r.jury.place);
      expect(audiencePlaces[r.entryId]).toBe(r.audience.place);
    }
    // Mixing the two recounted sides with the published weight gives the published final ranking.
    const mixed = mixStandings({
      jury: juryOut.details as JuryStandings,
      audience: audienceOut.ranking.map((r) => ({ candidate: r.candidate, score: r.score })),
      audienceWeightPercent: v1.payload.method.audienceWeightPct,
    });
    expect(mixed.ranking.map((r) => ({ entryId: r.candidate, place: r.place }))).toEqual(rowsOf(v1.payload));
    // The CLI reads the same file.
    const cli = runRecount(["download.json"], () => audienceFile.body);
    expect(cli.code).toBe(0);
    expect(JSON.parse(cli.stdout).ranking.map((r: { candidate: string }) => r.candidate)).toEqual(audienceOut.ranking.map((r) => r.candidate));

    const csv = await text(resultsCsv.loader, f);
    const lines = csv.body.trim().split("\r\n");
    expect(lines[0]).toBe("place,tied,entry_id,title,crew,mixed,jury_score,jury_place,audience_score,audience_place");
    expect(lines).toHaveLength(4);
    expect(lines[1]).toContain(v1.payload.standings[0].entryId);
    const txt = await text(resultsTxt.loader, f);
    // the sheet names how the hash was made, so a reader can recompute it (RFC 8785, JSON Canonicalization Scheme)
    expect(txt.body).toContain(`SHA-256 of the RFC 8785 (JCS) canonical JSON: ${v1.sha256}`);
    expect(txt.body).toContain("follow local law");
    for (const e of f.entries) expect(txt.body).toContain(e.title);

    // Stage mode now reveals from last place to first.
    const stage = await callRoute<{ screens: StageScreen[] }>(stageRoute.loader, request(`/stage/${f.competitionId}`, { cookie: f.organizerCookie }), { competitionId: f.competitionId });
    const reveal = stage.data!.screens.filter((s): s is Extract<StageScreen, { kind: "reveal" }> => s.kind === "reveal");
    expect(reveal.map((s) => s.place)).toEqual([3, 2, 1]);
    expect(reveal[2].title).toBe(v1.payload.standings[0].title);
  });
});

describe("the published hash, checked with a standard tool", () => {
  // The canonicalize package's own command-line tool (an RFC 8785 implementation), run as a separate process
  // on the served file: what anyone would do with `canonicalize < results.json | sha256sum`.
  // (its package exports no subpaths, so the tool is found where npm installs its bin)
  const cli = resolve("node_modules", "canonicalize", "bin", "canonicalize.js");
  const jcs = (text: string) => {
    const run = spawnSync(process.execPath, [cli], { input: text, encoding: "utf8" });
    expect(run.status, run.stderr).toBe(0);
    return run.stdout;
  };

  it("serves the payload whose RFC 8785 form hashes to the published SHA-256, with the scheme named", async () => {
    const f = await scoredCompo();
    const published = (await publish(f)).data!.published!;
    const res = await (resultsJson.loader as (a: unknown) => Promise<Response>)(await routeArgs(request(`/e/${f.event.slug}/${f.slug}/results.json`), { eventSlug: f.event.slug, competitionSlug: f.slug }));
    expect(res.headers.get("X-Results-Hash-Scheme")).toBe("rfc8785-sha256");
    expect(res.headers.get("X-Results-SHA256")).toBe(published.sha256);
    const body = await res.text();
    expect(body).toContain("\n  "); // pretty-printed: the hash is over the canonical form, not over these bytes
    expect(sha256Hex(jcs(body))).toBe(published.sha256);
    const [row] = await db().select().from(resultsSnapshots).where(eq(resultsSnapshots.competitionId, f.competitionId));
    expect(row.hashScheme).toBe("rfc8785-sha256");
    // before publication there is nothing to serve
    const g = await scoredCompo();
    expect((await text(resultsJson.loader, g)).status).toBe(404);
  });

  it("keeps a version published under the earlier scheme verifiable by that scheme", async () => {
    const f = await scoredCompo();
    await publish(f);
    const v1 = (await publishedResults(f.competitionId, 1))!;
    // A version as the earlier code stored it: no scheme column written, its hash over gatecrash-json/1.
    const payload = { ...v1.payload, version: 2, note: "stored before hash schemes were tagged" };
    await db().insert(resultsSnapshots).values({ competitionId: f.competitionId, version: 2, payload, sha256: sha256Hex(legacyCanonicalJson(payload)), note: payload.note });
    const old = (await publishedResults(f.competitionId, 2))!;
    expect(old.hashScheme).toBe("gatecrash-json/1");
    expect(verifySnapshot(old)).toBe(true);
    expect(verifySnapshot({ ...old, sha256: "0".repeat(64) })).toBe(false);
    const res = await (resultsJson.loader as (a: unknown) => Promise<Response>)(await routeArgs(request(`/e/${f.event.slug}/${f.slug}/results.json?version=2`), { eventSlug: f.event.slug, competitionSlug: f.slug }));
    expect(res.headers.get("X-Results-Hash-Scheme")).toBe("gatecrash-json/1");
    expect(verifySnapshot(v1)).toBe(true);
    expect(v1.hashScheme).toBe("rfc8785-sha256");
  });
});

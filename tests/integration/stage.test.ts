import { and, desc, eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "~/db/client.server";
import { auditLog, checkRuns, uploadFiles, uploads } from "~/db/schema";
import { stopQueue } from "~/jobs/queue.server";
import * as orderRoute from "~/routes/organize.$competitionId.stage";
import * as stageRoute from "~/routes/stage";
import type { StageScreen } from "~/stage/screens";
import { callRoute } from "../support/routes";
import { makeUser, request, sessionCookie, unique } from "../support/users";
import { addCheckRun, makeCompo, type CompoFixture } from "./showcase.fixtures";

/**
 * Stage mode against the real database: flagged entries (a flash verdict that is not a measured pass) are held
 * back by default; an organizer's sign-off puts one back behind a warning slide, with who and when in the audit
 * log; the crew's own video plays only where its own flash verdict passed.
 */
afterAll(async () => {
  await stopQueue();
  await closeDb();
});

type EntryScreen = Extract<StageScreen, { kind: "entry" }>;

async function screens(f: CompoFixture): Promise<StageScreen[]> {
  const out = await callRoute<{ screens: StageScreen[] }>(stageRoute.loader, request(`/stage/${f.competitionId}`, { cookie: f.organizerCookie }), { competitionId: f.competitionId });
  expect(out.status).toBe(200);
  return out.data!.screens;
}
const entryTitles = (s: StageScreen[]) => s.filter((x): x is EntryScreen => x.kind === "entry").map((x) => x.title);

async function post(f: CompoFixture, form: Record<string, string>, cookie = f.organizerCookie) {
  return callRoute<{ ok: boolean; message: string }>(orderRoute.action, request(`/organize/${f.competitionId}/stage`, { cookie, form }), { competitionId: f.competitionId });
}

async function auditOf(entryId: string, action: string) {
  return db().select().from(auditLog).where(and(eq(auditLog.subjectId, entryId), eq(auditLog.action, action))).orderBy(desc(auditLog.at));
}

/** Three entries: A passes the flash check, B is flagged (warn), C was never measured. */
async function compo() {
  const f = await makeCompo({ state: "judging", entryCount: 3 });
  await addCheckRun(f.entries[0].uploadId, "pass");
  await addCheckRun(f.entries[1].uploadId, "warn");
  await addCheckRun(f.entries[2].uploadId, null);
  return f;
}

describe("stage mode: flagged entries are skipped unless an organizer signs off", () => {
  it("is for the compo's organizers only, the stage and the running order alike", async () => {
    const f = await compo();
    const params = { competitionId: f.competitionId };
    const stranger = await sessionCookie(await makeUser());
    expect((await callRoute(stageRoute.loader, request(`/stage/${f.competitionId}`, { cookie: stranger }), params)).status).toBe(404);
    expect((await callRoute(stageRoute.loader, request(`/stage/${f.competitionId}`), params)).status).toBe(302);
    expect((await callRoute(orderRoute.loader, request(`/organize/${f.competitionId}/stage`, { cookie: stranger }), params)).status).toBe(404);
    // another event's organizer cannot sign off here, and nothing is written
    const other = await makeCompo({ state: "judging", entryCount: 1 });
    expect((await post(f, { intent: "sign-off", entryId: f.entries[1].id, understood: "yes" }, other.organizerCookie)).status).toBe(404);
    expect(await auditOf(f.entries[1].id, "stage.flash-signoff")).toHaveLength(0);
  });

  it("skips the flagged and the unmeasured entry by default, and never dims", async () => {
    const f = await compo();
    const s = await screens(f);
    expect(s.map((x) => x.kind)).toEqual(["intro", "entry", "vote", "end"]);
    expect(entryTitles(s)).toEqual([f.entries[0].title]);
    expect(s[0]).toMatchObject({ kind: "intro", entryCount: 1, heldBack: 2 });
    expect(s[1]).toMatchObject({ kind: "entry", position: 1, total: 1, flagged: false, video: { source: "reference", type: "video/webm" } });
    expect(s[1]).not.toHaveProperty("dimmed");
    const vote = s.find((x): x is Extract<StageScreen, { kind: "vote" }> => x.kind === "vote")!;
    expect(vote.url).toMatch(new RegExp(`/e/${f.event.slug}/${f.slug}/vote$`));
    expect(vote.qrSvg).toMatch(/^<svg[\s\S]*<\/svg>\s*$/);
    const order = await callRoute<Awaited<ReturnType<typeof orderRoute.loader>>>(orderRoute.loader, request(`/organize/${f.competitionId}/stage`, { cookie: f.organizerCookie }), { competitionId: f.competitionId });
    const onStage = Object.fromEntries(order.data!.order.map((r) => [r.title, r.onStage]));
    expect(onStage).toEqual({ [f.entries[0].title]: true, [f.entries[1].title]: false, [f.entries[2].title]: false });
  });

  it("shows a flagged entry after its warning slide once signed off, with who and when in the audit log", async () => {
    const f = await compo();
    const b = f.entries[1];
    // Without ticking the warning box nothing happens.
    const unticked = await post(f, { intent: "sign-off", entryId: b.id });
    expect(unticked.data).toMatchObject({ ok: false });
    expect(await auditOf(b.id, "stage.flash-signoff")).toHaveLength(0);
    // A passing entry needs no sign-off, and gets none.
    expect((await post(f, { intent: "sign-off", entryId: f.entries[0].id, understood: "yes" })).data).toMatchObject({ ok: false });
    expect(await auditOf(f.entries[0].id, "stage.flash-signoff")).toHaveLength(0);

    const signed = await post(f, { intent: "sign-off", entryId: b.id, understood: "yes" });
    expect(signed).toMatchObject({ status: 200, data: { ok: true } });
    const [line] = await auditOf(b.id, "stage.flash-signoff");
    expect(line).toMatchObject({ actorUserId: f.organizer.id, eventId: f.event.id, subjectType: "entry", subjectId: b.id });
    expect(line.at).toBeInstanceOf(Date);
    expect(line.details).toMatchObject({ competitionId: f.competitionId, uploadId: b.uploadId, source: "reference", verdict: "warn", worstSecondFlashes: 9 });

    const s = await screens(f);
    const at = s.findIndex((x) => x.kind === "entry" && x.title === b.title);
    expect(at).toBeGreaterThan(0);
    // the warning slide comes right before the entry, and names the organizer and the time of the audit line
    expect(s[at - 1]).toEqual({ kind: "flash-warning", title: b.title, flash: expect.objectContaining({ verdict: "warn" }), signOff: { by: f.organizer.name, at: line.at.toISOString() }, timeZone: expect.any(String) });
    expect(s[at]).toMatchObject({ flagged: true });
    expect(s.filter((x) => x.kind === "flash-warning")).toHaveLength(1); // A needs none, C is still held back
    expect(s[0]).toMatchObject({ kind: "intro", entryCount: 2, heldBack: 1 });
    expect(entryTitles(s).sort()).toEqual([f.entries[0].title, b.title].sort());

    // Withdrawn: held back again, and that is on record too.
    expect((await post(f, { intent: "withdraw", entryId: b.id })).data).toMatchObject({ ok: true });
    expect(entryTitles(await screens(f))).toEqual([f.entries[0].title]);
    expect(await auditOf(b.id, "stage.flash-signoff.withdraw")).toHaveLength(1);
  });

  it("binds the sign-off to the upload it was given for: a new counting upload is held back again", async () => {
    const f = await compo();
    const b = f.entries[1];
    await post(f, { intent: "sign-off", entryId: b.id, understood: "yes" });
    expect(entryTitles(await screens(f))).toContain(b.title);
    const [u2] = await db().insert(uploads).values({ entryId: b.id, number: 2, state: "complete", submittedBy: b.member.id, completedAt: new Date() }).returning();
    await addCheckRun(u2.id, "warn");
    expect(entryTitles(await screens(f))).not.toContain(b.title);
  });

  it("plays the crew's own video only where its own flash verdict passed", async () => {
    const f = await compo();
    const [a, b] = f.entries;
    const addVideo = async (uploadId: string, verdict: "pass" | "warn") => {
      await db().insert(uploadFiles).values({ uploadId, kind: "video", s3Key: `private/${unique("video")}.webm`, filename: "capture.webm", mediaType: "video/webm", claimedBytes: 10, sizeBytes: 10, sha256: "e".repeat(64), state: "confirmed" });
      const [run] = await db().select().from(checkRuns).where(eq(checkRuns.uploadId, uploadId));
      await db().update(checkRuns).set({ figures: { ...(run.figures as object), captureFlash: { verdict, worstSecondFlashes: verdict === "pass" ? 0 : 8 } } }).where(eq(checkRuns.id, run.id));
    };
    // B's reference capture is flagged and so is its crew's video: the crew's video cannot be chosen.
    await addVideo(b.uploadId, "warn");
    const refused = await post(f, { intent: "source", entryId: b.id, source: "crew" });
    expect(refused.data).toMatchObject({ ok: false });
    expect(await auditOf(b.id, "stage.source")).toHaveLength(0);
    // A's crew video passed its own check: it plays instead of the reference, from the showcase's media path.
    await addVideo(a.uploadId, "pass");
    expect((await post(f, { intent: "source", entryId: a.id, source: "crew" })).data).toMatchObject({ ok: true });
    const shown = (await screens(f)).find((x): x is EntryScreen => x.kind === "entry" && x.title === a.title)!;
    expect(shown.video).toEqual({ src: `/e/${f.event.slug}/${f.slug}/entries/${a.id}/media/video`, type: "video/webm", source: "crew" });
    const [line] = await auditOf(a.id, "stage.source");
    expect(line).toMatchObject({ actorUserId: f.organizer.id, details: expect.objectContaining({ from: "reference", to: "crew" }) });
  });

  it("falls back to the reference capture when a later check run flags the crew's video", async () => {
    const f = await compo();
    const a = f.entries[0];
    await db().insert(uploadFiles).values({ uploadId: a.uploadId, kind: "video", s3Key: `private/${unique("video")}.webm`, filename: "capture.webm", mediaType: "video/webm", claimedBytes: 10, sizeBytes: 10, sha256: "e".repeat(64), state: "confirmed" });
    const [run] = await db().select().from(checkRuns).where(eq(checkRuns.uploadId, a.uploadId));
    await db().update(checkRuns).set({ figures: { ...(run.figures as object), captureFlash: { verdict: "pass", worstSecondFlashes: 0 } } }).where(eq(checkRuns.id, run.id));
    await post(f, { intent: "source", entryId: a.id, source: "crew" });
    // A later check run finds the crew's video flagged: stage falls back to the reference capture, which passed.
    await addCheckRun(a.uploadId, "pass");
    const [later] = await db().select().from(checkRuns).where(eq(checkRuns.uploadId, a.uploadId)).orderBy(desc(checkRuns.queuedAt));
    await db().update(checkRuns).set({ figures: { ...(later.figures as object), captureFlash: { verdict: "warn", worstSecondFlashes: 7 } } }).where(eq(checkRuns.id, later.id));
    const shown = (await screens(f)).find((x): x is EntryScreen => x.kind === "entry" && x.title === a.title)!;
    expect(shown.video).toMatchObject({ source: "reference" });
    expect(shown.flagged).toBe(false);
  });
});

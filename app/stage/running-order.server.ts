import { desc, eq, inArray, sql } from "drizzle-orm";
import { audit } from "~/audit/log.server";
import { db } from "~/db/client.server";
import { checkRuns, stagePlays, user } from "~/db/schema";
import { flashSummary, isFlashFlagged, type FlashSummary } from "~/showcase/figures";
import { eligibleEntries, showcaseEntries, type PublicCompetition, type ShowcaseEntry } from "~/showcase/showcase.server";
import type { StageSignOff, StageSource, StageVideo } from "./screens";

/**
 * The running order of stage mode: every eligible entry in presentation order, which file the big screen plays
 * and whether it may be shown at all. An entry is on stage when the file it plays has a measured flash pass, or
 * when an organizer signed off on it for the counting upload it has now. Everything else (a fail or warn
 * verdict, or nothing measured) is held back: skipped by default. Sign-offs and source choices go into the
 * audit log (who, when, for which upload and verdict). The caller has checked that the user organizes `c`.
 */
export interface RunningOrderEntry {
  entryId: string;
  uploadId: string;
  position: number;
  entry: ShowcaseEntry;
  /** what the organizer chose */
  chosenSource: StageSource;
  /** what will play: the crew's video only while its own flash verdict is a measured pass */
  source: StageSource;
  reference: { available: boolean; flash: FlashSummary };
  crewVideo: { available: boolean; flash: FlashSummary };
  /** the verdict of the file that plays */
  flash: FlashSummary;
  flagged: boolean;
  /** a sign-off for the current counting upload, if there is one */
  signOff: StageSignOff | null;
  onStage: boolean;
  video: StageVideo | null;
}

export type StageOutcome = { ok: true; message: string } | { ok: false; message: string };

async function captureFlashByUpload(uploadIds: string[]): Promise<Map<string, FlashSummary>> {
  if (uploadIds.length === 0) return new Map();
  const runs = await db()
    .selectDistinctOn([checkRuns.uploadId], { uploadId: checkRuns.uploadId, figures: checkRuns.figures })
    .from(checkRuns)
    .where(inArray(checkRuns.uploadId, uploadIds))
    .orderBy(checkRuns.uploadId, desc(checkRuns.queuedAt));
  // The uploaded capture video's own verdict (pipeline step "capture", figures.captureFlash).
  return new Map(runs.map((r) => [r.uploadId, flashSummary({ flash: (r.figures as Record<string, unknown> | null)?.captureFlash })]));
}

export async function runningOrder(c: PublicCompetition): Promise<RunningOrderEntry[]> {
  const [eligible, shown] = await Promise.all([eligibleEntries(c.id), showcaseEntries(c)]);
  const byId = new Map(shown.map((e) => [e.id, e]));
  const ids = eligible.map((e) => e.id);
  const plays = ids.length
    ? await db()
        .select({ play: stagePlays, by: user.name })
        .from(stagePlays)
        .leftJoin(user, eq(user.id, stagePlays.signedOffBy))
        .where(inArray(stagePlays.entryId, ids))
    : [];
  const playOf = new Map(plays.map((p) => [p.play.entryId, p]));
  const crewFlash = await captureFlashByUpload(eligible.map((e) => e.uploadId));

  return eligible.map((e, i) => {
    const entry = byId.get(e.id)!;
    const p = playOf.get(e.id);
    const chosenSource: StageSource = p?.play.source === "crew" ? "crew" : "reference";
    const refSrc = entry.media.referenceWebm ?? entry.media.referenceMp4;
    const reference = { available: Boolean(refSrc), flash: entry.flash };
    const crewVideo = { available: Boolean(entry.media.captureVideo), flash: crewFlash.get(e.uploadId) ?? flashSummary(null) };
    const crewPlayable = crewVideo.available && !isFlashFlagged(crewVideo.flash);
    const source: StageSource = chosenSource === "crew" && crewPlayable ? "crew" : "reference";
    const flash = source === "crew" ? crewVideo.flash : reference.flash;
    const flagged = isFlashFlagged(flash);
    const signOff =
      p && p.play.signedOffAt && p.play.signedOffUploadId === e.uploadId ? { by: p.by ?? "a former organizer", at: p.play.signedOffAt.toISOString() } : null;
    const video: StageVideo | null =
      source === "crew"
        ? { src: entry.media.captureVideo!, type: entry.media.captureMediaType ?? "video/webm", source }
        : refSrc
          ? { src: refSrc, type: entry.media.referenceWebm ? "video/webm" : "video/mp4", source }
          : null;
    return { entryId: e.id, uploadId: e.uploadId, position: i + 1, entry, chosenSource, source, reference, crewVideo, flash, flagged, signOff, onStage: !flagged || signOff !== null, video };
  });
}

async function findInOrder(c: PublicCompetition, entryId: string): Promise<RunningOrderEntry | null> {
  return (await runningOrder(c)).find((r) => r.entryId === entryId) ?? null;
}

/**
 * The organizer's sign-off to show a flagged entry, after the warning; bound to the entry's counting upload. Its
 * time is the database's transaction time, the same instant as the audit line's.
 */
export async function signOffFlagged(c: PublicCompetition, entryId: string, organizerId: string): Promise<StageOutcome> {
  const r = await findInOrder(c, entryId);
  if (!r) return { ok: false, message: "That entry is not in this compo's running order." };
  if (!r.flagged) return { ok: false, message: `“${r.entry.title}” is not flagged: it is on stage without a sign-off.` };
  await db().transaction(async (tx) => {
    await tx
      .insert(stagePlays)
      .values({ entryId, source: r.chosenSource, signedOffUploadId: r.uploadId, signedOffBy: organizerId, signedOffAt: sql`now()`, updatedAt: sql`now()` })
      .onConflictDoUpdate({ target: stagePlays.entryId, set: { signedOffUploadId: r.uploadId, signedOffBy: organizerId, signedOffAt: sql`now()`, updatedAt: sql`now()` } });
    await audit(
      {
        actorUserId: organizerId,
        eventId: c.eventId,
        action: "stage.flash-signoff",
        subjectType: "entry",
        subjectId: entryId,
        details: { competitionId: c.id, uploadId: r.uploadId, source: r.source, verdict: r.flash.verdict, worstSecondFlashes: r.flash.worstSecondFlashes, statement: r.flash.statement },
      },
      tx,
    );
  });
  return { ok: true, message: `Signed off: “${r.entry.title}” will be shown after the flash warning slide.` };
}

export async function withdrawSignOff(c: PublicCompetition, entryId: string, organizerId: string, now = new Date()): Promise<StageOutcome> {
  const r = await findInOrder(c, entryId);
  if (!r) return { ok: false, message: "That entry is not in this compo's running order." };
  if (!r.signOff) return { ok: false, message: `“${r.entry.title}” has no sign-off to withdraw.` };
  await db().transaction(async (tx) => {
    await tx.update(stagePlays).set({ signedOffUploadId: null, signedOffBy: null, signedOffAt: null, updatedAt: now }).where(eq(stagePlays.entryId, entryId));
    await audit({ actorUserId: organizerId, eventId: c.eventId, action: "stage.flash-signoff.withdraw", subjectType: "entry", subjectId: entryId, details: { competitionId: c.id, uploadId: r.uploadId, signedOffBy: r.signOff!.by, signedOffAt: r.signOff!.at } }, tx);
  });
  return { ok: true, message: `Sign-off withdrawn: “${r.entry.title}” is held back again.` };
}

/**
 * Which file the big screen plays. The crew's own video only where its own flash verdict is a measured pass;
 * a change of file drops an earlier sign-off (it was given for what was on screen then).
 */
export async function chooseStageSource(c: PublicCompetition, entryId: string, source: StageSource, organizerId: string, now = new Date()): Promise<StageOutcome> {
  const r = await findInOrder(c, entryId);
  if (!r) return { ok: false, message: "That entry is not in this compo's running order." };
  if (source === "crew") {
    if (!r.crewVideo.available) return { ok: false, message: `“${r.entry.title}” has no capture video of the crew's own.` };
    if (isFlashFlagged(r.crewVideo.flash)) return { ok: false, message: `The crew's video cannot be chosen: ${r.crewVideo.flash.statement}` };
  }
  if (source === r.chosenSource) return { ok: true, message: "Nothing changed." };
  await db().transaction(async (tx) => {
    await tx
      .insert(stagePlays)
      .values({ entryId, source, updatedAt: now })
      .onConflictDoUpdate({ target: stagePlays.entryId, set: { source, signedOffUploadId: null, signedOffBy: null, signedOffAt: null, updatedAt: now } });
    await audit({ actorUserId: organizerId, eventId: c.eventId, action: "stage.source", subjectType: "entry", subjectId: entryId, details: { competitionId: c.id, uploadId: r.uploadId, from: r.chosenSource, to: source, droppedSignOff: r.signOff } }, tx);
  });
  return { ok: true, message: source === "crew" ? `“${r.entry.title}” plays the crew's own video.` : `“${r.entry.title}” plays the reference capture.` };
}

import { createHash } from "node:crypto";
import { and, desc, eq, inArray } from "drizzle-orm";
import { db } from "~/db/client.server";
import { countingUploads } from "~/entries/counting.server";
import { artifacts, checkRuns, competitions, crews, entries, events, uploadFiles } from "~/db/schema";
import { captureFlashSummary, flashSummary, loopSummary, publicStats, type FlashSummary, type LoopSummary } from "./figures";
import type { PublicStats } from "./shapes";
import { isId } from "~/security/ids";

/**
 * The public showcase: what anyone may see of a competition's entries once entries have closed.
 * Only public fields leave this module — never files' storage keys, e-mails, scores or notes.
 */

export const SHOWCASE_STATES = ["closed", "judging", "results"] as const;
type CompetitionState = (typeof competitions.$inferSelect)["state"];

export interface PublicCompetition {
  id: string;
  eventId: string;
  eventSlug: string;
  eventTitle: string;
  timeZone: string;
  slug: string;
  title: string;
  description: string;
  state: CompetitionState;
  ballotMethod: "points" | "borda" | "schulze";
  votingOpensAt: string | null;
  votingClosesAt: string | null;
  /** Crews are hidden while judging is blind and results are not out. */
  crewsHidden: boolean;
}

export interface ShowcaseMedia {
  still: string | null;
  firstFrame: string | null;
  contactSheet: string | null;
  referenceWebm: string | null;
  referenceMp4: string | null;
  referenceAudio: string | null;
  waveform: string | null;
  layoutPicture: string | null;
  /** The entrant's own capture video, streamed through the showcase. */
  captureVideo: string | null;
  captureMediaType: string | null;
}

export interface ShowcaseEntry {
  id: string;
  title: string;
  description: string;
  crew: string | null;
  /** 1-based place in the shared presentation order. */
  position: number;
  check: { state: "none" | "queued" | "running" | "done" | "error" | "superseded"; verdict: "pass" | "warn" | "fail" | null };
  flash: FlashSummary;
  /** the crew's own capture video has its own verdict, which gates its own player */
  captureFlash: FlashSummary;
  /** where the reference capture loops, for the player's mark */
  loop: LoopSummary | null;
  stats: PublicStats;
  media: ShowcaseMedia;
  /** True once the reference capture video exists. */
  referenceReady: boolean;
}

type CompetitionRow = typeof competitions.$inferSelect;

export function publicView(c: CompetitionRow, e: typeof events.$inferSelect): PublicCompetition {
  return {
    id: c.id,
    eventId: e.id,
    eventSlug: e.slug,
    eventTitle: e.title,
    timeZone: e.timeZone,
    slug: c.slug,
    title: c.title,
    description: c.description,
    state: c.state,
    ballotMethod: c.ballotMethod,
    votingOpensAt: c.votingOpensAt?.toISOString() ?? null,
    votingClosesAt: c.votingClosesAt?.toISOString() ?? null,
    crewsHidden: c.blindJudging && c.state !== "results",
  };
}

/** A competition by its public address, in any state past draft; null when there is none. */
export async function competitionBySlugs(eventSlug: string, competitionSlug: string): Promise<PublicCompetition | null> {
  const [row] = await db()
    .select({ c: competitions, e: events })
    .from(competitions)
    .innerJoin(events, eq(events.id, competitions.eventId))
    .where(and(eq(events.slug, eventSlug), eq(competitions.slug, competitionSlug)));
  if (!row || row.c.state === "draft") return null;
  return publicView(row.c, row.e);
}

export async function competitionById(competitionId: string): Promise<PublicCompetition | null> {
  if (!isId(competitionId)) return null;
  const [row] = await db()
    .select({ c: competitions, e: events })
    .from(competitions)
    .innerJoin(events, eq(events.id, competitions.eventId))
    .where(eq(competitions.id, competitionId));
  return row ? publicView(row.c, row.e) : null;
}

export { isId as isUuid };

export function showcaseIsOpen(c: Pick<PublicCompetition, "state">): boolean {
  return (SHOWCASE_STATES as readonly string[]).includes(c.state);
}

/** Shared presentation order: a stable shuffle by the competition's order seed (same for everyone). */
export function presentationKey(seed: string, entryId: string): string {
  return createHash("sha256").update(`${seed}:${entryId}`).digest("hex");
}

interface EligibleEntry {
  id: string;
  title: string;
  description: string;
  crewName: string;
  uploadId: string;
  uploadNumber: number;
}

/**
 * The entries that count: active (never disqualified or withdrawn) with a counting upload, in presentation order.
 * Used by the showcase, the vote, the results and stage mode alike.
 */
export async function eligibleEntries(competitionId: string): Promise<EligibleEntry[]> {
  const [comp] = await db().select({ seed: competitions.orderSeed }).from(competitions).where(eq(competitions.id, competitionId));
  if (!comp) return [];
  const rows = await db()
    .select({ id: entries.id, title: entries.title, description: entries.description, crewName: crews.name })
    .from(entries)
    .innerJoin(crews, eq(crews.id, entries.crewId))
    .where(and(eq(entries.competitionId, competitionId), eq(entries.state, "active")));
  if (rows.length === 0) return [];
  // the crew's final pick, else the newest counting upload
  const counting = await countingUploads(rows.map((r) => r.id));
  // Each entry's key hashed once, not once per comparison.
  return rows
    .filter((r) => counting.has(r.id))
    .map((r) => ({ e: { ...r, uploadId: counting.get(r.id)!.id, uploadNumber: counting.get(r.id)!.number }, key: presentationKey(comp.seed, r.id) }))
    .sort((a, b) => a.key.localeCompare(b.key))
    .map(({ e }) => e);
}

export function mediaPath(c: Pick<PublicCompetition, "eventSlug" | "slug">, entryId: string, kind: "video" | "still"): string {
  return `/e/${c.eventSlug}/${c.slug}/entries/${entryId}/media/${kind}`;
}

interface CheckSummary {
  state: (typeof checkRuns.$inferSelect)["state"];
  verdict: (typeof checkRuns.$inferSelect)["verdict"];
  figures: Record<string, unknown>;
  /** artifact kind → its /artifacts URL */
  artifacts: Record<string, string>;
}

/**
 * The latest check run of each upload with its artifacts, and the public files of each upload, in three
 * queries whatever the number of entries (the showcase is the busiest public page).
 */
async function loadShowcaseData(uploadIds: string[]) {
  if (uploadIds.length === 0) return { checks: new Map<string, CheckSummary>(), files: new Map<string, { kind: string; mediaType: string | null }[]>() };
  const runs = await db()
    .selectDistinctOn([checkRuns.uploadId], { id: checkRuns.id, uploadId: checkRuns.uploadId, state: checkRuns.state, verdict: checkRuns.verdict, figures: checkRuns.figures })
    .from(checkRuns)
    .where(inArray(checkRuns.uploadId, uploadIds))
    .orderBy(checkRuns.uploadId, desc(checkRuns.queuedAt));
  const arts = runs.length
    ? await db().select({ id: artifacts.id, kind: artifacts.kind, checkRunId: artifacts.checkRunId }).from(artifacts).where(inArray(artifacts.checkRunId, runs.map((r) => r.id)))
    : [];
  const files = await db()
    .select({ uploadId: uploadFiles.uploadId, kind: uploadFiles.kind, mediaType: uploadFiles.mediaType })
    .from(uploadFiles)
    .where(and(inArray(uploadFiles.uploadId, uploadIds), eq(uploadFiles.state, "confirmed"), inArray(uploadFiles.kind, ["video", "still"])));
  const checks = new Map<string, CheckSummary>();
  for (const r of runs) {
    const own = arts.filter((a) => a.checkRunId === r.id);
    checks.set(r.uploadId, { state: r.state, verdict: r.verdict, figures: r.figures as Record<string, unknown>, artifacts: Object.fromEntries(own.map((a) => [a.kind, `/artifacts/${a.id}`])) });
  }
  const byUpload = new Map<string, { kind: string; mediaType: string | null }[]>();
  for (const f of files) byUpload.set(f.uploadId, [...(byUpload.get(f.uploadId) ?? []), f]);
  return { checks, files: byUpload };
}

function describe(c: PublicCompetition, e: EligibleEntry, position: number, check: CheckSummary | undefined, files: { kind: string; mediaType: string | null }[]): ShowcaseEntry {
  const video = files.find((f) => f.kind === "video");
  const still = files.find((f) => f.kind === "still");
  const url = (kind: string) => check?.artifacts[kind] ?? null;
  const figures = check?.figures ?? {};
  return {
    id: e.id,
    title: e.title,
    description: e.description,
    crew: c.crewsHidden ? null : e.crewName,
    position,
    check: { state: check?.state ?? "none", verdict: check?.verdict ?? null },
    flash: flashSummary(figures),
    captureFlash: captureFlashSummary(figures),
    loop: loopSummary(figures),
    stats: publicStats(figures),
    media: {
      still: still ? mediaPath(c, e.id, "still") : null,
      firstFrame: url("first-frame"),
      contactSheet: url("contact-sheet"),
      referenceWebm: url("webm"),
      referenceMp4: url("mp4"),
      referenceAudio: url("wav"),
      waveform: url("waveform"),
      layoutPicture: url("layout-svg") ?? url("layout-png"),
      captureVideo: video ? mediaPath(c, e.id, "video") : null,
      captureMediaType: video?.mediaType ?? null,
    },
    referenceReady: Boolean(url("webm") || url("mp4")),
  };
}

async function describeAll(c: PublicCompetition, list: { e: EligibleEntry; position: number }[]): Promise<ShowcaseEntry[]> {
  const { checks, files } = await loadShowcaseData(list.map(({ e }) => e.uploadId));
  return list.map(({ e, position }) => describe(c, e, position, checks.get(e.uploadId), files.get(e.uploadId) ?? []));
}

/** Every showcase entry of a competition, in presentation order. */
export async function showcaseEntries(c: PublicCompetition): Promise<ShowcaseEntry[]> {
  const list = await eligibleEntries(c.id);
  return describeAll(c, list.map((e, i) => ({ e, position: i + 1 })));
}

/** The storage key of an eligible entry's capture video or still, for streaming; null when not public. */
export async function publicMediaFile(
  c: PublicCompetition,
  entryId: string,
  kind: "video" | "still",
): Promise<{ s3Key: string; mediaType: string; sizeBytes: number | null; sha256: string | null } | null> {
  if (!showcaseIsOpen(c)) return null;
  const e = (await eligibleEntries(c.id)).find((x) => x.id === entryId);
  if (!e) return null;
  const [f] = await db()
    .select({ s3Key: uploadFiles.s3Key, mediaType: uploadFiles.mediaType, sizeBytes: uploadFiles.sizeBytes, sha256: uploadFiles.sha256 })
    .from(uploadFiles)
    .where(and(eq(uploadFiles.uploadId, e.uploadId), eq(uploadFiles.kind, kind), eq(uploadFiles.state, "confirmed")));
  if (!f) return null;
  return { s3Key: f.s3Key, mediaType: f.mediaType ?? (kind === "video" ? "video/webm" : "image/png"), sizeBytes: f.sizeBytes, sha256: f.sha256 };
}

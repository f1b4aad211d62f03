import { and, asc, desc, eq, inArray } from "drizzle-orm";
import { slugify } from "~/competitions/forms";
import { db } from "~/db/client.server";
import { artifacts, checkRuns, competitions, crews, entries, events, uploadFiles, uploads } from "~/db/schema";
import { awardsOfEvent } from "~/results/awards.server";
import { publishedResults } from "~/results/results.server";
import { eligibleEntries, SHOWCASE_STATES } from "~/showcase/showcase.server";

/**
 * What the party archive holds: every entry that was shown (the counting upload of every eligible entry of every
 * compo past its deadline), with the stored files and reference-capture artifacts and their recorded SHA-256.
 * No bytes are read here; the zip writer streams them one at a time.
 */
export interface StoredFile {
  /** path inside the entry's folder */
  name: string;
  s3Key: string;
  sizeBytes: number;
  sha256: string;
  /** what it is, for the info file */
  role: string;
  originalName?: string;
}

export interface ArchivedEntry {
  folder: string;
  entryId: string;
  title: string;
  crew: string;
  crewHandle: string;
  compo: { slug: string; title: string };
  position: number;
  place: { place: number; tied: boolean; points: number; version: number } | null;
  awards: string[];
  upload: { number: number; completedAt: Date | null };
  check: { verdict: string | null; finishedAt: Date | null } | null;
  files: StoredFile[];
}

export interface ArchivePlan {
  event: { id: string; slug: string; title: string; timeZone: string; venue: string };
  entries: ArchivedEntry[];
}

const UPLOAD_ROLES: Record<string, [string, string]> = {
  bundle: ["source", "source bundle"],
  layout: ["layout", "layout (GDSII)"],
  video: ["capture", "capture video (the crew's own)"],
  still: ["still", "still image"],
};

/** Reference-capture artifacts Gatecrash rendered itself, by artifact kind. */
const REFERENCE_ROLES: Record<string, [string, string]> = {
  webm: ["reference/preview", "reference capture video (WebM)"],
  mp4: ["reference/preview", "reference capture video (MP4)"],
  wav: ["reference/audio", "reference capture audio (WAV)"],
  "first-frame": ["reference/first-frame", "reference capture, first frame"],
  "contact-sheet": ["reference/contact-sheet", "reference capture, contact sheet"],
};

const EXT_BY_TYPE: Record<string, string> = {
  "video/webm": "webm",
  "video/mp4": "mp4",
  "audio/wav": "wav",
  "audio/x-wav": "wav",
  "image/png": "png",
  "image/svg+xml": "svg",
  "application/zip": "zip",
  "application/gzip": "tar.gz",
  "application/vnd.gdsii": "gds",
};

/** A file-name-safe piece of a path: lower-case letters, digits and dashes. */
export const safeSegment = (s: string, fallback = "item") => slugify(s, fallback, 48);

/** The extension of the uploaded name when it is a plain one (".tar.gz" kept whole), else from the media type. */
export function extensionOf(filename: string | null, mediaType: string | null): string {
  const m = filename?.toLowerCase().match(/\.(tar\.gz|[a-z0-9]{1,5})$/);
  if (m) return m[1];
  return (mediaType && EXT_BY_TYPE[mediaType]) || "bin";
}

export async function archivePlan(eventId: string): Promise<ArchivePlan | null> {
  const [e] = await db().select().from(events).where(eq(events.id, eventId));
  if (!e) return null;
  const compos = await db()
    .select()
    .from(competitions)
    .where(and(eq(competitions.eventId, e.id), inArray(competitions.state, [...SHOWCASE_STATES])))
    .orderBy(asc(competitions.createdAt), asc(competitions.title));
  const awardsByEntry = new Map<string, string[]>();
  for (const a of await awardsOfEvent(e.id)) if (a.winner) awardsByEntry.set(a.winner.entryId, [...(awardsByEntry.get(a.winner.entryId) ?? []), a.title]);

  const out: ArchivedEntry[] = [];
  for (const c of compos) {
    const list = await eligibleEntries(c.id);
    if (list.length === 0) continue;
    const published = await publishedResults(c.id);
    const places = new Map(published?.payload.standings.map((s) => [s.entryId, { place: s.place, tied: s.tied, points: s.mixed, version: published.version }]) ?? []);
    const uploadIds = list.map((x) => x.uploadId);
    const files = await db()
      .select()
      .from(uploadFiles)
      .where(and(inArray(uploadFiles.uploadId, uploadIds), eq(uploadFiles.state, "confirmed")));
    const ups = await db().select({ id: uploads.id, completedAt: uploads.completedAt }).from(uploads).where(inArray(uploads.id, uploadIds));
    const runs = await db()
      .selectDistinctOn([checkRuns.uploadId], { id: checkRuns.id, uploadId: checkRuns.uploadId, verdict: checkRuns.verdict, finishedAt: checkRuns.finishedAt })
      .from(checkRuns)
      .where(inArray(checkRuns.uploadId, uploadIds))
      .orderBy(checkRuns.uploadId, desc(checkRuns.queuedAt));
    const arts = runs.length ? await db().select().from(artifacts).where(inArray(artifacts.checkRunId, runs.map((r) => r.id))) : [];
    const handles = new Map(
      (await db().select({ id: entries.id, handle: crews.handle }).from(entries).innerJoin(crews, eq(crews.id, entries.crewId)).where(inArray(entries.id, list.map((x) => x.id)))).map((r) => [r.id, r.handle]),
    );
    list.forEach((x, i) => {
      const run = runs.find((r) => r.uploadId === x.uploadId) ?? null;
      const stored: StoredFile[] = [];
      for (const f of files.filter((f) => f.uploadId === x.uploadId)) {
        const [base, role] = UPLOAD_ROLES[f.kind];
        if (f.sha256 && f.sizeBytes !== null) stored.push({ name: `${base}.${extensionOf(f.filename, f.mediaType)}`, s3Key: f.s3Key, sizeBytes: f.sizeBytes, sha256: f.sha256, role, originalName: f.filename });
      }
      for (const a of run ? arts.filter((a) => a.checkRunId === run.id) : []) {
        const known = REFERENCE_ROLES[a.kind];
        if (known) stored.push({ name: `${known[0]}.${extensionOf(null, a.mediaType)}`, s3Key: a.s3Key, sizeBytes: a.sizeBytes, sha256: a.sha256, role: known[1] });
      }
      stored.sort((a, b) => a.name.localeCompare(b.name));
      out.push({
        folder: `${safeSegment(c.slug, "compo")}/${String(i + 1).padStart(2, "0")}-${safeSegment(x.title, "entry")}`,
        entryId: x.id,
        title: x.title,
        crew: x.crewName,
        crewHandle: handles.get(x.id) ?? "",
        compo: { slug: c.slug, title: c.title },
        position: i + 1,
        place: places.get(x.id) ?? null,
        awards: awardsByEntry.get(x.id) ?? [],
        upload: { number: x.uploadNumber, completedAt: ups.find((u) => u.id === x.uploadId)?.completedAt ?? null },
        check: run ? { verdict: run.verdict, finishedAt: run.finishedAt } : null,
        files: stored,
      });
    });
  }
  return { event: { id: e.id, slug: e.slug, title: e.title, timeZone: e.timeZone, venue: e.venue }, entries: out };
}

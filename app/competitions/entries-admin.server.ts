import { and, desc, eq, inArray, sql } from "drizzle-orm";
import { audit } from "~/audit/log.server";
import { db } from "~/db/client.server";
import { checkRuns, crewMembers, crews, entries, uploadFiles, uploads, user } from "~/db/schema";
import { enqueueMail } from "~/mail/outbox.server";
import { composeMail } from "~/mail/templates";
import { presignGet } from "~/storage/s3.server";
import { conflict, notFound } from "~/errors/app-error";

/** The organizer's view of a competition's entries: the table rows, file downloads, disqualification. */
export interface EntryRow {
  id: string;
  title: string;
  crewHandle: string;
  crewName: string;
  feeState: string;
  state: string;
  disqualifiedReason: string | null;
  upload: { number: number; state: string; at: string | null } | null;
  verdict: "pass" | "warn" | "fail" | null;
  checkState: string | null;
  files: { id: string; kind: string; filename: string; sizeBytes: number | null; state: string }[];
}

export async function entriesTable(competitionId: string): Promise<EntryRow[]> {
  const rows = await db()
    .select({
      id: entries.id,
      title: entries.title,
      crewHandle: crews.handle,
      crewName: crews.name,
      feeState: entries.feeState,
      state: entries.state,
      disqualifiedReason: entries.disqualifiedReason,
    })
    .from(entries)
    .innerJoin(crews, eq(crews.id, entries.crewId))
    .where(eq(entries.competitionId, competitionId));
  if (rows.length === 0) return [];
  const ids = rows.map((r) => r.id);
  // Newest upload that reached storage (complete or late) per entry.
  const ups = await db()
    .selectDistinctOn([uploads.entryId], { id: uploads.id, entryId: uploads.entryId, number: uploads.number, state: uploads.state, completedAt: uploads.completedAt, createdAt: uploads.createdAt })
    .from(uploads)
    .where(and(inArray(uploads.entryId, ids), inArray(uploads.state, ["complete", "late"])))
    .orderBy(uploads.entryId, desc(uploads.number));
  const upIds = ups.map((u) => u.id);
  const runs = upIds.length
    ? await db()
        .selectDistinctOn([checkRuns.uploadId], { uploadId: checkRuns.uploadId, verdict: checkRuns.verdict, state: checkRuns.state })
        .from(checkRuns)
        .where(inArray(checkRuns.uploadId, upIds))
        .orderBy(checkRuns.uploadId, desc(checkRuns.queuedAt))
    : [];
  const files = upIds.length ? await db().select().from(uploadFiles).where(inArray(uploadFiles.uploadId, upIds)) : [];
  return rows.map((r) => {
    const u = ups.find((x) => x.entryId === r.id);
    const run = u ? runs.find((x) => x.uploadId === u.id) : undefined;
    return {
      ...r,
      upload: u ? { number: u.number, state: u.state, at: (u.completedAt ?? u.createdAt).toISOString() } : null,
      verdict: run?.verdict ?? null,
      checkState: run?.state ?? null,
      files: files
        .filter((f) => f.uploadId === u?.id)
        .map((f) => ({ id: f.id, kind: f.kind, filename: f.filename, sizeBytes: f.sizeBytes, state: f.state })),
    };
  });
}

/** A presigned download of any uploaded file of an entry in this competition; null when the id is not one. */
export async function fileDownloadUrl(competitionId: string, fileId: string): Promise<string | null> {
  const [f] = await db()
    .select({ key: uploadFiles.s3Key, filename: uploadFiles.filename })
    .from(uploadFiles)
    .innerJoin(uploads, eq(uploads.id, uploadFiles.uploadId))
    .innerJoin(entries, eq(entries.id, uploads.entryId))
    .where(and(eq(uploadFiles.id, fileId), eq(entries.competitionId, competitionId)));
  if (!f) return null;
  return presignGet(f.key, f.filename, 300);
}

export async function disqualifyEntry(a: {
  actorUserId: string;
  competition: { id: string; eventId: string; title: string };
  entryId: string;
  reason: string;
  appUrl: string;
}): Promise<{ mailed: number }> {
  const [e] = await db()
    .update(entries)
    .set({ state: "disqualified", disqualifiedReason: a.reason, updatedAt: new Date() })
    .where(and(eq(entries.id, a.entryId), eq(entries.competitionId, a.competition.id), sql`${entries.state} <> 'disqualified'`))
    .returning({ id: entries.id, title: entries.title, crewId: entries.crewId });
  if (!e) {
    const [exists] = await db().select({ state: entries.state }).from(entries).where(and(eq(entries.id, a.entryId), eq(entries.competitionId, a.competition.id)));
    throw exists ? conflict("already_disqualified", "This entry is already disqualified.") : notFound("No such entry in this compo.");
  }
  const members = await db()
    .select({ id: user.id, email: user.email, name: user.name })
    .from(crewMembers)
    .innerJoin(user, eq(user.id, crewMembers.userId))
    .where(eq(crewMembers.crewId, e.crewId));
  for (const m of members)
    await enqueueMail(
      composeMail(
        m.email,
        `Your entry “${e.title}” was disqualified from ${a.competition.title}`,
        [
          `Hello ${m.name},`,
          `The organizers of ${a.competition.title} disqualified your crew's entry “${e.title}”. Their reason:`,
          a.reason,
          "If you think this is a mistake, reply to the organizers through the event's usual contact. Fees and refunds follow the event's terms and local law.",
          { text: "Your entries", href: new URL("/my/entries", a.appUrl).toString() },
        ],
        `disqualified:${e.id}:${m.id}`,
      ),
    );
  await audit({
    actorUserId: a.actorUserId,
    eventId: a.competition.eventId,
    action: "entry.disqualified",
    subjectType: "entry",
    subjectId: e.id,
    details: { reason: a.reason, mailed: members.map((m) => m.email) },
  });
  return { mailed: members.length };
}

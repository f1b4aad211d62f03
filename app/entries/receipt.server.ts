import { eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { competitions, crewMembers, crews, entries, events, uploadFiles, uploads, user } from "~/db/schema";
import { env } from "~/env.server";
import { enqueueMail } from "~/mail/outbox.server";
import { uploadReceiptMail } from "~/mail/templates";
import { formatBytes } from "./parts";
import { FILE_KINDS, KIND_LABELS } from "./sniff";

/**
 * The receipt to every crew member (the wording is the mail template's): every file's name, size and SHA-256, the
 * repository commit and licence when given, and the server time. Once per upload and person.
 */
export async function sendUploadReceipt(uploadId: string): Promise<void> {
  const [row] = await db()
    .select({ upload: uploads, entry: entries, competition: competitions, event: events, crew: crews })
    .from(uploads)
    .innerJoin(entries, eq(entries.id, uploads.entryId))
    .innerJoin(competitions, eq(competitions.id, entries.competitionId))
    .innerJoin(events, eq(events.id, competitions.eventId))
    .innerJoin(crews, eq(crews.id, entries.crewId))
    .where(eq(uploads.id, uploadId));
  const files = await db().select().from(uploadFiles).where(eq(uploadFiles.uploadId, uploadId));
  const members = await db().select({ id: user.id, email: user.email }).from(crewMembers).innerJoin(user, eq(user.id, crewMembers.userId)).where(eq(crewMembers.crewId, row.entry.crewId));
  const { upload: u } = row;
  const listed = FILE_KINDS.flatMap((k) => files.filter((x) => x.kind === k)).map((f) => ({
    label: KIND_LABELS[f.kind],
    filename: f.filename,
    sizeBytes: f.sizeBytes,
    sizeText: formatBytes(f.sizeBytes ?? 0),
    sha256: f.sha256,
  }));
  for (const m of members) {
    await enqueueMail(
      uploadReceiptMail({
        to: m.email,
        dedupeKey: `upload-receipt:${uploadId}:${m.id}`,
        number: u.number,
        late: u.state === "late",
        lateException: u.lateException,
        lateReason: row.entry.lateReason,
        entry: { id: row.entry.id, title: row.entry.title },
        crewName: row.crew.name,
        competitionTitle: row.competition.title,
        event: { title: row.event.title, timeZone: row.event.timeZone },
        at: u.completedAt ?? new Date(),
        appUrl: env().APP_URL,
        repository: u.repositoryUrl && u.repositoryCommit ? { url: u.repositoryUrl, commit: u.repositoryCommit } : null,
        licence: u.licence,
        files: listed,
      }),
    );
  }
}

import { and, eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { competitions, crewMembers, entries, uploadFiles, uploads } from "~/db/schema";
import { isId } from "~/security/ids";

/** Who may upload: the entry, upload or file of a crew the user is a member of, else null (the API's 404). */
/** An entry the user may upload to (crew member), with its competition; null → 404. */
export async function entryForUploader(entryId: string, userId: string) {
  const [row] = await db()
    .select({ entry: entries, competition: competitions })
    .from(entries)
    .innerJoin(competitions, eq(competitions.id, entries.competitionId))
    .innerJoin(crewMembers, and(eq(crewMembers.crewId, entries.crewId), eq(crewMembers.userId, userId)))
    .where(eq(entries.id, entryId));
  return row ?? null;
}

/** A pending/recorded upload of an entry the user is a crew member of; null → 404. */
export async function uploadForUploader(uploadId: string, userId: string) {
  if (!isId(uploadId)) return null;
  const [row] = await db()
    .select({ upload: uploads, entry: entries, competition: competitions })
    .from(uploads)
    .innerJoin(entries, eq(entries.id, uploads.entryId))
    .innerJoin(competitions, eq(competitions.id, entries.competitionId))
    .innerJoin(crewMembers, and(eq(crewMembers.crewId, entries.crewId), eq(crewMembers.userId, userId)))
    .where(eq(uploads.id, uploadId));
  return row ?? null;
}

export async function fileForUploader(uploadId: string, fileId: string, userId: string) {
  const up = await uploadForUploader(uploadId, userId);
  if (!up || !isId(fileId)) return null;
  const [file] = await db().select().from(uploadFiles).where(and(eq(uploadFiles.id, fileId), eq(uploadFiles.uploadId, uploadId)));
  return file ? { ...up, file } : null;
}

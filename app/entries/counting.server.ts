import { and, desc, eq, inArray } from "drizzle-orm";
import { db } from "~/db/client.server";
import { entries, uploads } from "~/db/schema";

/**
 * Which upload of an entry is judged: the one the crew picked as final, when it picked one of its counting
 * uploads; otherwise the newest upload that counts (on time, or within the organizer's late exception). Late
 * uploads never count. One rule for the entry page, the report, the showcase and the jury.
 */
export interface CountingUpload {
  id: string;
  number: number;
  /** The crew picked it (rather than it being the newest). */
  picked: boolean;
}

export async function countingUploads(entryIds: string[]): Promise<Map<string, CountingUpload>> {
  const out = new Map<string, CountingUpload>();
  if (entryIds.length === 0) return out;
  const picks = await db().select({ id: entries.id, finalUploadId: entries.finalUploadId }).from(entries).where(inArray(entries.id, entryIds));
  const rows = await db()
    .select({ id: uploads.id, entryId: uploads.entryId, number: uploads.number })
    .from(uploads)
    .where(and(inArray(uploads.entryId, entryIds), eq(uploads.state, "complete")))
    .orderBy(desc(uploads.number));
  const pickOf = new Map(picks.map((p) => [p.id, p.finalUploadId]));
  for (const u of rows) {
    const picked = pickOf.get(u.entryId) === u.id;
    const current = out.get(u.entryId);
    if (!current || (picked && !current.picked)) out.set(u.entryId, { id: u.id, number: u.number, picked });
  }
  return out;
}

export async function countingUploadOf(entryId: string): Promise<CountingUpload | null> {
  return (await countingUploads([entryId])).get(entryId) ?? null;
}

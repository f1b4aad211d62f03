import { and, desc, eq } from "drizzle-orm";
import { queueCheckRun } from "~/conformance/queue.server";
import { db } from "~/db/client.server";
import { auditLog, checkRuns, competitions, entries, uploads } from "~/db/schema";
import { conflict, notFound } from "~/errors/app-error";
import { timelinessOf, uploadWindowOpen } from "./deadline";

/**
 * The crew picks which of its counting uploads is judged, until the deadline (or the end of its late exception).
 * Picking the newest one, or none, goes back to the default: the newest counting upload. Refusals are AppErrors.
 */
export async function chooseFinalUpload(entryId: string, userId: string, uploadNumber: number | null, now = new Date()): Promise<{ message: string }> {
  const outcome = await pickInTransaction(entryId, userId, uploadNumber, now);
  if (outcome.picked) await checkIfNeverChecked(outcome.picked);
  return { message: outcome.message };
}

/** A picked upload whose check was dropped while a newer one waited (superseded) is checked after all. */
async function checkIfNeverChecked(uploadId: string): Promise<void> {
  const [latest] = await db().select({ state: checkRuns.state }).from(checkRuns).where(eq(checkRuns.uploadId, uploadId)).orderBy(desc(checkRuns.queuedAt)).limit(1);
  if (!latest || latest.state === "superseded") await queueCheckRun(uploadId);
}

function pickInTransaction(entryId: string, userId: string, uploadNumber: number | null, now: Date) {
  return db().transaction(async (tx) => {
    const [row] = await tx
      .select({ entry: entries, competition: competitions })
      .from(entries)
      .innerJoin(competitions, eq(competitions.id, entries.competitionId))
      .where(eq(entries.id, entryId))
      .for("update", { of: entries });
    if (!row) throw notFound("That entry was not found.");
    const { entry, competition } = row;
    const when = timelinessOf(now, competition.deadlineAt, competition.graceMinutes, entry.lateUntil);
    if (!uploadWindowOpen(competition.state, entry.state, when)) throw conflict("deadline_passed", "The deadline has passed: the upload that counts can no longer be changed.");
    let finalUploadId: string | null = null;
    if (uploadNumber !== null) {
      const [u] = await tx.select().from(uploads).where(and(eq(uploads.entryId, entryId), eq(uploads.number, uploadNumber)));
      if (!u) throw notFound(`Upload #${uploadNumber} does not exist.`);
      if (u.state !== "complete") throw conflict("late_upload", `Upload #${uploadNumber} arrived after the deadline; only on-time uploads can be judged.`);
      finalUploadId = u.id;
    }
    await tx.update(entries).set({ finalUploadId, updatedAt: now }).where(eq(entries.id, entryId));
    await tx.insert(auditLog).values({ actorUserId: userId, eventId: competition.eventId, action: "entry.final-upload", subjectType: "entry", subjectId: entryId, details: { uploadNumber } });
    return {
      picked: finalUploadId,
      message: uploadNumber === null ? "The newest on-time upload counts again." : `Upload #${uploadNumber} is now the one that is judged. A newer upload would take its place.`,
    };
  });
}

import { eq } from "drizzle-orm";
import { audit } from "~/audit/log.server";
import { db } from "~/db/client.server";
import { competitions, entries, uploads, user } from "~/db/schema";
import { countingUploadOf } from "./counting.server";
import { AppError, conflict, notFound } from "~/errors/app-error";
import { cutoffOf } from "./deadline";

/**
 * An organizer's late exception for one entry (a crew whose power failed at the party, say): uploads until a
 * stated time after the deadline count, with the reason on record — in the audit log, on the entry page, on the
 * receipt and in front of the jury. The caller has checked that the user organizes the entry's event. Refusals are
 * AppErrors; one about the form's `until` or `reason` names that field.
 */

const fieldError = (field: "until" | "reason", message: string) => new AppError(400, "invalid_body", message, { fieldErrors: { [field]: [message] } });

/** At most this long after the cutoff: an exception is for a mishap, not a second deadline. */
export const MAX_EXCEPTION_HOURS = 72;

export async function grantLateException(entryId: string, organizerId: string, input: { until: Date; reason: string }, now = new Date()): Promise<{ message: string }> {
  const reason = input.reason.trim();
  if (reason.length < 5) throw fieldError("reason", "State the reason (at least 5 characters): the jury and the crew see it.");
  const [row] = await db().select({ entry: entries, competition: competitions }).from(entries).innerJoin(competitions, eq(competitions.id, entries.competitionId)).where(eq(entries.id, entryId));
  if (!row) throw notFound("That entry was not found.");
  const cutoff = cutoffOf(row.competition.deadlineAt, row.competition.graceMinutes);
  if (!cutoff) throw fieldError("until", "The competition has no deadline yet, so there is nothing to make an exception from.");
  if (Number.isNaN(input.until.getTime()) || input.until <= cutoff || input.until <= now) {
    throw fieldError("until", `The exception must end after the deadline (${cutoff.toISOString()}) and after now.`);
  }
  if (input.until.getTime() - cutoff.getTime() > MAX_EXCEPTION_HOURS * 3600_000) {
    throw fieldError("until", `An exception can run at most ${MAX_EXCEPTION_HOURS} hours past the deadline.`);
  }
  if (row.competition.state === "judging" || row.competition.state === "results") {
    throw conflict("judging_begun", "Judging has begun: an exception now would change what the jury already sees.");
  }
  await db().update(entries).set({ lateUntil: input.until, lateReason: reason, lateGrantedBy: organizerId, lateGrantedAt: now, updatedAt: now }).where(eq(entries.id, entryId));
  await audit({ actorUserId: organizerId, eventId: row.competition.eventId, action: "entry.late-exception.grant", subjectType: "entry", subjectId: entryId, details: { until: input.until.toISOString(), reason } });
  return { message: `Late exception granted until ${input.until.toISOString()} (UTC).` };
}

export async function revokeLateException(entryId: string, organizerId: string, now = new Date()): Promise<{ message: string }> {
  const [row] = await db().select({ entry: entries, competition: competitions }).from(entries).innerJoin(competitions, eq(competitions.id, entries.competitionId)).where(eq(entries.id, entryId));
  if (!row) throw notFound("That entry was not found.");
  if (!row.entry.lateUntil) throw conflict("no_exception", "This entry has no late exception.");
  // Uploads already recorded under it keep counting: they are on record as such.
  await db().update(entries).set({ lateUntil: null, lateReason: null, lateGrantedBy: null, lateGrantedAt: null, updatedAt: now }).where(eq(entries.id, entryId));
  await audit({ actorUserId: organizerId, eventId: row.competition.eventId, action: "entry.late-exception.revoke", subjectType: "entry", subjectId: entryId, details: { until: row.entry.lateUntil.toISOString(), reason: row.entry.lateReason } });
  return { message: "The late exception was withdrawn." };
}

/** The exception as pages show it (entry page, jury), or null. */
export async function lateExceptionOf(entryId: string): Promise<{ until: string; reason: string; grantedBy: string | null; grantedAt: string | null } | null> {
  const [row] = await db()
    .select({ until: entries.lateUntil, reason: entries.lateReason, grantedAt: entries.lateGrantedAt, by: user.name })
    .from(entries)
    .leftJoin(user, eq(user.id, entries.lateGrantedBy))
    .where(eq(entries.id, entryId));
  if (!row?.until) return null;
  return { until: row.until.toISOString(), reason: row.reason ?? "", grantedBy: row.by, grantedAt: row.grantedAt?.toISOString() ?? null };
}

/** What the jury is told: the exception (if one stands) and whether the upload they judge came in under one. */
export async function lateNoteForJury(entryId: string): Promise<{ exception: Awaited<ReturnType<typeof lateExceptionOf>>; judgedUploadLate: boolean } | null> {
  const exception = await lateExceptionOf(entryId);
  const counting = await countingUploadOf(entryId);
  const [u] = counting ? await db().select({ lateException: uploads.lateException }).from(uploads).where(eq(uploads.id, counting.id)) : [];
  const judgedUploadLate = u?.lateException ?? false;
  return exception || judgedUploadLate ? { exception, judgedUploadLate } : null;
}

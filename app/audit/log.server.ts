import { db } from "~/db/client.server";
import { auditLog } from "~/db/schema";

/** Appends one line to the audit log: who did what to which object. Never updated, never deleted. */
export async function audit(entry: {
  actorUserId: string | null;
  eventId?: string | null;
  action: string;
  subjectType: string;
  subjectId: string;
  details?: Record<string, unknown>;
}): Promise<void> {
  await db()
    .insert(auditLog)
    .values({ ...entry, eventId: entry.eventId ?? null, details: entry.details ?? {} });
}

import { db, type Executor } from "~/db/client.server";
import { auditLog } from "~/db/schema";

/**
 * Appends one line to the audit log: who did what to which object. Never updated, never deleted. Inside a
 * transaction, pass its handle (`ex`), so the line commits with the change it records.
 */
export async function audit(
  entry: {
  actorUserId: string | null;
  eventId?: string | null;
  action: string;
  subjectType: string;
  subjectId: string;
  details?: Record<string, unknown>;
  },
  ex: Executor = db(),
): Promise<void> {
  await ex
    .insert(auditLog)
    .values({ ...entry, eventId: entry.eventId ?? null, details: entry.details ?? {} });
}

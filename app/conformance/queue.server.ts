import { eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { env } from "~/env.server";
import { checkRuns, uploads } from "~/db/schema";
import { queue, QUEUES, waitingPlace, type WaitingPlace } from "~/jobs/queue.server";

/**
 * Check runs on pg-boss. One waiting job per entry (the queue's "short" policy, keyed by entry): a crew that
 * uploads ten times in a minute has one job in the line, and it checks their newest upload. A run that Gatecrash
 * failed goes back at a lower priority, behind every first attempt, so no crew's report waits on another's retries.
 */
const RETRY_DELAY_SECONDS = 15;

async function entryOf(uploadId: string): Promise<string> {
  const [u] = await db().select({ entryId: uploads.entryId }).from(uploads).where(eq(uploads.id, uploadId));
  if (!u) throw new Error(`upload ${uploadId} does not exist`);
  return u.entryId;
}

function send(checkRunId: string, entryId: string, extra: { priority?: number; startAfter?: number } = {}) {
  return queue().then((boss) =>
    boss.send(QUEUES.checkRun, { checkRunId }, {
      singletonKey: entryId,
      // pg-boss's own retry covers a worker killed mid-run (the job expires and is handed out again)
      retryLimit: 2,
      retryDelay: 5,
      expireInSeconds: env().CHECK_RUN_EXPIRE_SECONDS,
      ...extra,
    }),
  );
}

/** Queues the conformance check of one confirmed upload; a worker picks it up (app/conformance/run.server.ts). */
export async function queueCheckRun(uploadId: string): Promise<string> {
  const entryId = await entryOf(uploadId);
  const [run] = await db().insert(checkRuns).values({ uploadId, state: "queued" }).returning({ id: checkRuns.id });
  // Null when this entry already has a job waiting: that job takes this newer upload when its turn comes.
  await send(run.id, entryId);
  return run.id;
}

/** A run that waits without a job of its own (its upload became worth checking again: the crew picked it). */
export async function resendCheckRun(checkRunId: string, entryId: string): Promise<void> {
  await send(checkRunId, entryId);
}

/** After a failed attempt (the run is back in state "queued"): behind every first attempt, after a pause. */
export async function requeueCheckRun(checkRunId: string): Promise<void> {
  const [row] = await db()
    .select({ attempts: checkRuns.attempts, entryId: uploads.entryId })
    .from(checkRuns)
    .innerJoin(uploads, eq(uploads.id, checkRuns.uploadId))
    .where(eq(checkRuns.id, checkRunId));
  if (!row) return;
  await send(checkRunId, row.entryId, { priority: -row.attempts, startAfter: RETRY_DELAY_SECONDS * row.attempts });
}

/** The entry's place in the check queue, or null when nothing of it waits. */
export function queuePlaceOf(entryId: string): Promise<WaitingPlace | null> {
  return waitingPlace(QUEUES.checkRun, entryId);
}

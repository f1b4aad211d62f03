import { db } from "~/db/client.server";
import { env } from "~/env.server";
import { checkRuns } from "~/db/schema";
import { queue, QUEUES } from "~/jobs/queue.server";

/** Queues the conformance check of one confirmed upload; the worker picks it up (app/conformance/run.server.ts). */
export async function queueCheckRun(uploadId: string): Promise<string> {
  const [run] = await db().insert(checkRuns).values({ uploadId, state: "queued" }).returning({ id: checkRuns.id });
  const boss = await queue();
  // One retry covers a worker killed mid-run; the run itself is idempotent (it replaces its findings).
  await boss.send(QUEUES.checkRun, { checkRunId: run.id }, { retryLimit: 2, retryDelay: 10, expireInSeconds: env().CHECK_RUN_EXPIRE_SECONDS, singletonKey: run.id });
  return run.id;
}

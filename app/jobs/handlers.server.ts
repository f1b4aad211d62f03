import type PgBoss from "pg-boss";
import { executeCheckRun } from "~/conformance/run.server";
import { closeDueCompetitions } from "~/competitions/service.server";
import { sweepStaleUploads } from "~/entries/uploads.server";
import { env } from "~/env.server";
import { deliverOutboxMail, requeueStaleMail } from "~/mail/outbox.server";
import { QUEUES } from "./queue.server";

/** How often an idle check-run slot asks for work: pg-boss 10's shortest interval, so a report starts within it. */
const CHECK_POLL_SECONDS = 0.5;

/** Job handlers shared by the worker process and the tests (which run them in-process). */
export async function registerJobs(boss: PgBoss, opts: { checkConcurrency?: number } = {}): Promise<void> {
  await boss.work<{ outboxId: string }>(QUEUES.mail, { batchSize: 5 }, async (jobs) => {
    for (const job of jobs) await deliverOutboxMail(job.data.outboxId);
  });
  await boss.work(QUEUES.mailSweep, async () => {
    await requeueStaleMail();
  });
  // competitions: the minute sweep closes every open compo whose deadline has come
  await boss.work(QUEUES.deadlineSweep, async () => {
    await closeDueCompetitions(new Date());
    // Uploads started but never completed for a day are marked abandoned (they never counted).
    await sweepStaleUploads();
  });
  // WORKER_CONCURRENCY slots, each its own pg-boss worker taking one check run at a time; more processes on more
  // machines add more slots, and pg-boss hands each job to exactly one of them.
  const slots = opts.checkConcurrency ?? env().WORKER_CONCURRENCY;
  for (let i = 0; i < slots; i++) {
    await boss.work<{ checkRunId: string }>(QUEUES.checkRun, { batchSize: 1, pollingIntervalSeconds: CHECK_POLL_SECONDS }, async ([job]) => {
      return { outcome: await executeCheckRun(job.data.checkRunId) };
    });
  }
}

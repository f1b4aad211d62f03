import type PgBoss from "pg-boss";
import { executeCheckRun } from "~/conformance/run.server";
import { closeDueCompetitions } from "~/competitions/service.server";
import { sweepStaleUploads } from "~/entries/uploads.server";
import { deliverOutboxMail, requeueStaleMail } from "~/mail/outbox.server";
import { QUEUES } from "./queue.server";

/** Job handlers shared by the worker process and the tests (which run them in-process). */
export async function registerJobs(boss: PgBoss): Promise<void> {
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
  // One check run at a time per worker: each uses both cores for verilator builds. Add workers to scale.
  await boss.work<{ checkRunId: string }>(QUEUES.checkRun, { batchSize: 1 }, async ([job]) => {
    await executeCheckRun(job.data.checkRunId);
  });
}

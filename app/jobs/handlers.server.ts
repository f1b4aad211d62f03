import type PgBoss from "pg-boss";
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
}

import { sweepWorkFolders } from "~/conformance/workdir.server";
import { closeDb } from "~/db/client.server";
import { env } from "~/env.server";
import { queue, QUEUES, stopQueue } from "~/jobs/queue.server";
import { registerJobs } from "~/jobs/handlers.server";
import { warmBuildTools } from "~/simulation/build.server";

/**
 * The worker process: drains the queues on the same PostgreSQL. Run more of them on more machines to drain
 * the check queue in parallel; pg-boss hands each job to one worker at a time. WORKER_CONCURRENCY check runs
 * go at once in each process.
 */
async function main() {
  const settings = env(); // fail fast on a bad environment
  const swept = sweepWorkFolders();
  if (swept.length) console.log(`[worker] removed ${swept.length} work folder(s) older than a day: ${swept.join(", ")}`);
  // verilator's runtime objects and precompiled header are built once per machine, before the first job needs them
  await warmBuildTools();
  const boss = await queue({ supervise: true });
  await registerJobs(boss);
  await boss.schedule(QUEUES.mailSweep, "* * * * *");
  await boss.schedule(QUEUES.deadlineSweep, "* * * * *");
  console.log(`[worker] ready: queues ${Object.values(QUEUES).join(", ")}; ${settings.WORKER_CONCURRENCY} check run(s) at a time`);
  const stop = async (signal: string) => {
    console.log(`[worker] ${signal}: finishing current jobs`);
    await stopQueue();
    await closeDb();
    process.exit(0);
  };
  process.on("SIGTERM", () => void stop("SIGTERM"));
  process.on("SIGINT", () => void stop("SIGINT"));
}

await main();

import PgBoss from "pg-boss";
import { env } from "~/env.server";

/** Queue names. Every queue is created before use (pg-boss 10). */
export const QUEUES = {
  mail: "mail-send",
  mailSweep: "mail-sweep",
  checkRun: "check-run",
  deadlineSweep: "deadline-sweep",
} as const;

let boss: PgBoss | undefined;
let starting: Promise<PgBoss> | undefined;

/** The web process only sends jobs: no supervision or schedules there; the worker runs those. */
export function queue(opts: { supervise?: boolean } = {}): Promise<PgBoss> {
  if (boss) return Promise.resolve(boss);
  starting ??= (async () => {
    const b = new PgBoss({
      connectionString: env().DATABASE_URL,
      supervise: opts.supervise ?? false,
      schedule: opts.supervise ?? false,
      max: 4,
      maintenanceIntervalSeconds: env().QUEUE_MAINTENANCE_SECONDS,
    });
    b.on("error", (e) => console.error("[queue]", e.message));
    await b.start();
    for (const name of Object.values(QUEUES)) await b.createQueue(name);
    boss = b;
    return b;
  })();
  return starting;
}

export async function stopQueue(): Promise<void> {
  if (boss) await boss.stop({ graceful: true, timeout: 10_000 });
  boss = undefined;
  starting = undefined;
}

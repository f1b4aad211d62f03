import PgBoss from "pg-boss";
import { sql } from "drizzle-orm";
import { db } from "~/db/client.server";
import { env } from "~/env.server";

/** Queue names. Every queue is created before use (pg-boss 10). */
export const QUEUES = {
  mail: "mail-send",
  mailSweep: "mail-sweep",
  checkRun: "check-run",
  deadlineSweep: "deadline-sweep",
} as const;

/**
 * pg-boss 10's "short" policy keeps at most one waiting (created) job per singleton key. Check runs are keyed by
 * entry, so one entry never has more than one job waiting, however often its crew uploads: a second send while
 * one waits is dropped, and the waiting job checks the entry's newest upload when a worker takes it.
 */
const POLICIES: Partial<Record<(typeof QUEUES)[keyof typeof QUEUES], "short">> = { [QUEUES.checkRun]: "short" };

/** pg-boss's own schema; named here because the queue-place query reads its job table. */
export const QUEUE_SCHEMA = "pgboss";

let boss: PgBoss | undefined;
let starting: Promise<PgBoss> | undefined;

/** The web process only sends jobs: no supervision or schedules there; the worker runs those. */
export function queue(opts: { supervise?: boolean } = {}): Promise<PgBoss> {
  if (boss) return Promise.resolve(boss);
  starting ??= (async () => {
    const b = new PgBoss({
      connectionString: env().DATABASE_URL,
      schema: QUEUE_SCHEMA,
      supervise: opts.supervise ?? false,
      schedule: opts.supervise ?? false,
      max: 4,
      maintenanceIntervalSeconds: env().QUEUE_MAINTENANCE_SECONDS,
    });
    b.on("error", (e) => console.error("[queue]", e.message));
    await b.start();
    for (const name of Object.values(QUEUES)) {
      const policy = POLICIES[name];
      await b.createQueue(name, policy ? { name, policy } : undefined);
      // a queue made before it had a policy gets it now (jobs copy the policy when they are sent)
      if (policy) await b.updateQueue(name, { name, policy });
    }
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

export interface WaitingPlace {
  /** 1 = the next job a free worker takes */
  place: number;
  /** jobs of this queue that workers are running now */
  active: number;
}

/**
 * Where the waiting job with this singleton key stands, in the order pg-boss hands jobs out
 * (priority first, then age: its fetch orders by `priority desc, created_on, id`). Null when none waits.
 */
export async function waitingPlace(name: string, singletonKey: string): Promise<WaitingPlace | null> {
  const job = sql.raw(`${QUEUE_SCHEMA}.job`);
  const rows = await db().execute<{ place: number; active: number }>(sql`
    with mine as (
      select priority, created_on, id from ${job}
      where name = ${name} and singleton_key = ${singletonKey} and state < 'active'
      order by priority desc, created_on, id limit 1
    )
    select
      (select count(*)::int from ${job} j, mine
        where j.name = ${name} and j.state < 'active'
          and (j.priority > mine.priority or (j.priority = mine.priority and (j.created_on, j.id) < (mine.created_on, mine.id)))) + 1 as place,
      (select count(*)::int from ${job} where name = ${name} and state = 'active') as active
    from mine`);
  const [row] = rows;
  return row ? { place: row.place, active: row.active } : null;
}

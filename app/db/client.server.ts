import { AsyncLocalStorage } from "node:async_hooks";
import { drizzle } from "drizzle-orm/postgres-js";
import postgres from "postgres";
import { env } from "~/env.server";
import { TransactionSlots } from "./slots";
import * as schema from "./schema";

/**
 * The one PostgreSQL pool of a process, and the rules that keep it from jamming:
 * - Nothing inside a transaction may ask the pool for a second connection: the transaction's own handle (`tx`) is
 *   passed down instead. A transaction that waited for a second connection while holding its first could fill
 *   the pool with transactions waiting on each other (a burst of ballots did). `db()` called while a
 *   `db().transaction` callback runs throws NestedConnectionError, so such code fails in every test that reaches it.
 * - Transactions take one of `max - 1` slots, so plain queries always have a connection to run on; a transaction
 *   that cannot get a slot within the acquire timeout fails with DatabaseBusyError (the root middleware answers 503
 *   with Retry-After) instead of waiting without end.
 * - The server ends any statement that runs longer than `statement_timeout` and any session left idle inside a
 *   transaction longer than `idle_in_transaction_session_timeout`, so a stuck request cannot hold a connection.
 */
export class NestedConnectionError extends Error {
  constructor() {
    super("db() was called inside a db().transaction callback: pass the transaction handle (tx) down instead of taking a second pool connection");
    this.name = "NestedConnectionError";
  }
}

export class DatabaseBusyError extends Error {
  constructor(readonly waitedMs: number) {
    super(`no database connection became free within ${waitedMs} ms`);
    this.name = "DatabaseBusyError";
  }
}

export interface PoolOptions {
  max?: number;
  statementTimeoutMs?: number;
  idleInTransactionTimeoutMs?: number;
  acquireTimeoutMs?: number;
}

const transactionScope = new AsyncLocalStorage<{ open: boolean }>();
/** Set around a request by the root middleware: whether any transaction of the request waited in vain for a slot. */
export const poolPressure = new AsyncLocalStorage<{ busy: boolean }>();

function assertOutsideTransaction(): void {
  if (transactionScope.getStore()?.open) throw new NestedConnectionError();
}

export function createDb(url: string, opts: PoolOptions = {}) {
  const max = opts.max ?? 10;
  const acquireTimeoutMs = opts.acquireTimeoutMs ?? 5000;
  // idle_timeout lets the process exit once work is done (STACK.md). `connection` values are sent as run-time
  // parameters when each connection starts.
  const sql = postgres(url, {
    max,
    idle_timeout: 20,
    onnotice: () => {},
    connection: {
      statement_timeout: opts.statementTimeoutMs ?? 15_000,
      idle_in_transaction_session_timeout: opts.idleInTransactionTimeoutMs ?? 10_000,
    },
  });
  const db = drizzle(sql, { schema });
  const slots = new TransactionSlots(Math.max(1, max - 1));
  const begin = db.transaction.bind(db);
  db.transaction = (async (fn, config) => {
    assertOutsideTransaction();
    const release = await slots.acquire(acquireTimeoutMs, (ms) => new DatabaseBusyError(ms)).catch((e: unknown) => {
      if (e instanceof DatabaseBusyError) {
        const pressure = poolPressure.getStore();
        if (pressure) pressure.busy = true;
      }
      throw e;
    });
    try {
      return await begin((tx) => {
        const scope = { open: true };
        return transactionScope.run(scope, () => fn(tx)).finally(() => {
          scope.open = false;
        });
      }, config);
    } finally {
      release();
    }
  }) as typeof db.transaction;
  return { sql, db };
}

export type Db = ReturnType<typeof createDb>["db"];
/** A transaction handle, as `db().transaction` passes it to its callback. */
export type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];
/** What a helper that may run inside or outside a transaction takes: the pool, or the transaction's handle. */
export type Executor = Db | Tx;

let shared: ReturnType<typeof createDb> | undefined;

export function db(): Db {
  assertOutsideTransaction();
  if (!shared) {
    const e = env();
    shared = createDb(e.DATABASE_URL, {
      max: e.DATABASE_POOL_MAX,
      statementTimeoutMs: e.DATABASE_STATEMENT_TIMEOUT_MS,
      idleInTransactionTimeoutMs: e.DATABASE_IDLE_IN_TRANSACTION_TIMEOUT_MS,
      acquireTimeoutMs: e.DATABASE_ACQUIRE_TIMEOUT_MS,
    });
  }
  return shared.db;
}

export async function closeDb(): Promise<void> {
  if (shared) {
    await shared.sql.end({ timeout: 5 });
    shared = undefined;
  }
}

export { schema };

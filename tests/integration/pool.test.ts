import { sql } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb, createDb, DatabaseBusyError, db, NestedConnectionError } from "~/db/client.server";
import { auditLog } from "~/db/schema";
import { audit } from "~/audit/log.server";
import { env } from "~/env.server";

/**
 * The pool's rules (app/db/client.server.ts), on the real database: no second connection from inside a
 * transaction, a bounded wait for a transaction slot, and the server-side timeouts on every connection.
 */
const own: { sql: { end(o: { timeout: number }): Promise<void> } }[] = [];
afterAll(async () => {
  for (const p of own) await p.sql.end({ timeout: 5 });
  await closeDb();
});

function pool(opts: Parameters<typeof createDb>[1]) {
  const p = createDb(env().DATABASE_URL, opts);
  own.push(p);
  return p.db;
}

describe("the database pool", () => {
  it("refuses db() inside a transaction, so a helper that forgets the handle fails in every test that reaches it", async () => {
    const subject = crypto.randomUUID();
    await expect(
      db().transaction(async () => {
        await audit({ actorUserId: null, action: "test.nested", subjectType: "test", subjectId: subject });
      }),
    ).rejects.toBeInstanceOf(NestedConnectionError);
    // With the handle passed down the same line is written, and commits with the transaction.
    await db().transaction(async (tx) => {
      await audit({ actorUserId: null, action: "test.nested", subjectType: "test", subjectId: subject }, tx);
    });
    const rows = await db().select().from(auditLog).where(sql`${auditLog.subjectId} = ${subject}`);
    expect(rows).toHaveLength(1);
    // Outside the callback (after it ended) db() is fine again, even in a continuation started inside it.
    let later: Promise<unknown> = Promise.resolve();
    await db().transaction(async () => {
      later = new Promise((r) => setImmediate(r)).then(() => db().execute(sql`select 1`));
    });
    await expect(later).resolves.toBeTruthy();
  });

  it("sets statement_timeout and idle_in_transaction_session_timeout on its connections", async () => {
    const d = pool({ max: 2, statementTimeoutMs: 1234, idleInTransactionTimeoutMs: 2345 });
    const [row] = (await d.execute(sql`select current_setting('statement_timeout') as st, current_setting('idle_in_transaction_session_timeout') as it`)) as unknown as { st: string; it: string }[];
    // PostgreSQL 15 documentation, § 20.11.1 (Client Connection Defaults): values in ms are shown with their unit.
    expect(row).toEqual({ st: "1234ms", it: "2345ms" });
    await expect(d.execute(sql`select pg_sleep(3)`)).rejects.toThrow();
  });

  it("answers a transaction that finds no free slot within the acquire timeout with DatabaseBusyError, while plain queries go on", async () => {
    const d = pool({ max: 2, acquireTimeoutMs: 150 });
    let release!: () => void;
    const held = new Promise<void>((r) => (release = r));
    let started!: () => void;
    const isIn = new Promise<void>((r) => (started = r));
    const first = d.transaction(async (tx) => {
      await tx.execute(sql`select 1`);
      started();
      await held;
      return "first";
    });
    await isIn;
    await expect(d.transaction(async () => "second")).rejects.toBeInstanceOf(DatabaseBusyError);
    // The one connection transactions may not take still answers plain queries.
    await expect(d.execute(sql`select 2 as two`)).resolves.toBeTruthy();
    release();
    await expect(first).resolves.toBe("first");
    await expect(d.transaction(async () => "third")).resolves.toBe("third");
  });
});

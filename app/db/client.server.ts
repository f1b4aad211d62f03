import { drizzle } from "drizzle-orm/postgres-js";
import postgres from "postgres";
import { env } from "~/env.server";
import * as schema from "./schema";

export type Db = ReturnType<typeof createDb>["db"];

export function createDb(url: string, max = 10) {
  // idle_timeout lets the process exit once work is done (STACK.md).
  const sql = postgres(url, { max, idle_timeout: 20, onnotice: () => {} });
  return { sql, db: drizzle(sql, { schema }) };
}

let shared: ReturnType<typeof createDb> | undefined;

export function db(): Db {
  shared ??= createDb(env().DATABASE_URL);
  return shared.db;
}

export async function closeDb(): Promise<void> {
  if (shared) {
    await shared.sql.end({ timeout: 5 });
    shared = undefined;
  }
}

export { schema };

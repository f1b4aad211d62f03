import { drizzle } from "drizzle-orm/postgres-js";
import { migrate } from "drizzle-orm/postgres-js/migrator";
import postgres from "postgres";
import { fileURLToPath } from "node:url";

const MIGRATIONS = fileURLToPath(new URL("../../drizzle", import.meta.url));

/** Applies the committed migrations in drizzle/ (drizzle-orm's migrator; drizzle-kit is never run here). */
export async function applyMigrations(url: string): Promise<void> {
  const sql = postgres(url, { max: 1, onnotice: () => {} });
  try {
    await migrate(drizzle(sql), { migrationsFolder: MIGRATIONS });
  } finally {
    await sql.end({ timeout: 5 });
  }
}

// `npx tsx scripts/lib/migrate.ts`: once per release, against the production database (DATABASE_URL).
if (import.meta.url === `file://${process.argv[1]}`) {
  const { env } = await import("~/env.server");
  await applyMigrations(env().DATABASE_URL);
  console.log("migrations applied");
}

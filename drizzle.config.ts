import { defineConfig } from "drizzle-kit";

// Migrations are generated from app/db/schema.ts into drizzle/ and committed;
// they are applied at start-up by drizzle-orm's migrator (scripts/lib/migrate.ts), never by drizzle-kit in CI.
export default defineConfig({
  dialect: "postgresql",
  schema: "./app/db/schema.ts",
  out: "./drizzle",
});

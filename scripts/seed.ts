/** Seeds the demo scenario into DATABASE_URL if it is not there yet (run by `npm start`). */
import { closeDb, db } from "~/db/client.server";
import { seedDemo } from "~/demo/seed.server";

const result = await seedDemo(db());
console.log(result.seeded ? `Demo scenario seeded (${result.entryIds.length} entries).` : "Demo scenario already present; nothing changed.");
await closeDb();

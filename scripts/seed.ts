/** Seeds the demo scenario into DATABASE_URL if it is not there yet (run by `npm start`). */
import { closeDb, db } from "~/db/client.server";
import { seedDemo } from "~/demo/seed.server";
import { seedDemoUploads } from "~/demo/uploads.server";
import { stopQueue } from "~/jobs/queue.server";

const result = await seedDemo(db());
if (result.seeded) {
  const queued = await seedDemoUploads(db(), result.entryIds);
  console.log(`Demo scenario seeded: ${result.entryIds.length} entries, ${queued} check runs queued (the worker runs them in the background).`);
} else {
  console.log("Demo scenario already present; nothing changed.");
}
await stopQueue();
await closeDb();

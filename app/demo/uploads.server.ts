import { eq } from "drizzle-orm";
import { readFileSync } from "node:fs";
import { createHash } from "node:crypto";
import { zipBuffer } from "~/storage/zip.server";
import type { Db } from "~/db/client.server";
import { entries, uploadFiles, uploads } from "~/db/schema";
import { queueCheckRun } from "~/conformance/queue.server";
import { putObject } from "~/storage/s3.server";
import { DEMO_DESIGNS, designPath } from "../../demo/designs/index";
import { demoEntryLayout } from "../../demo/designs/layouts";

const DAY = 24 * 3600 * 1000;

const zipOf = (name: string, contents: Buffer) => zipBuffer({ [name]: contents }, new Date("2027-01-01T00:00:00Z"));

/**
 * Gives every demo entry real files — its Verilog packed as a .zip and a GDSII layout generated for it —
 * as upload number 1, and queues its check run so a newcomer sees real reports (and reference captures)
 * once the worker has been through them.
 */
export async function seedDemoUploads(db: Db, entryIds: string[], now = new Date()): Promise<number> {
  let queued = 0;
  for (const [i, entryId] of entryIds.entries()) {
    const design = DEMO_DESIGNS[i];
    const [entry] = await db.select().from(entries).where(eq(entries.id, entryId));
    const completedAt = design.competition === "judging" ? new Date(now.getTime() - 3 * DAY + i * 3600_000) : new Date(now.getTime() - i * 3600_000);
    const bundle = await zipOf(`${design.slug}.v`, readFileSync(designPath(design.slug)));
    // Each layout is its design's: the same flip-flops and ports (demo/designs/layouts.ts).
    const layout = Buffer.from(demoEntryLayout(design.slug).bytes);
    const [upload] = await db.insert(uploads).values({ entryId: entry.id, number: 1, state: "complete", createdAt: completedAt, completedAt }).returning();
    for (const [kind, bytes, filename, mediaType] of [
      ["bundle", bundle, `${design.slug}.zip`, "application/zip"],
      ["layout", layout, `${design.slug}.gds`, "application/vnd.gdsii"],
    ] as const) {
      const key = `uploads/${entry.id}/${upload.id}/${kind}`;
      await putObject(key, bytes, mediaType);
      await db.insert(uploadFiles).values({
        uploadId: upload.id,
        kind,
        s3Key: key,
        filename,
        claimedBytes: bytes.length,
        sizeBytes: bytes.length,
        sha256: createHash("sha256").update(bytes).digest("hex"),
        mediaType,
        state: "confirmed",
        confirmedAt: completedAt,
      });
    }
    await queueCheckRun(upload.id);
    queued += 1;
  }
  return queued;
}

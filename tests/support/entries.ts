import { createHash } from "node:crypto";
import { competitions, crewMembers, crews, entries, uploadFiles, uploads } from "~/db/schema";
import { db } from "~/db/client.server";
import type { Ruleset } from "~/rules/ruleset";
import { TEST_RULESET } from "./rulesets";
import { putObject } from "~/storage/s3.server";
import { unique } from "./users";

/** A competition with one crew's entry, made for a test (state and deadline as the test needs them). */
export async function makeCompetitionWithEntry(opts: {
  eventId: string;
  captainId: string;
  state?: "draft" | "open" | "closed" | "judging" | "results";
  ruleset?: Ruleset;
  deadlineAt?: Date;
}) {
  const [competition] = await db()
    .insert(competitions)
    .values({ eventId: opts.eventId, slug: unique("comp"), title: "Test Compo", state: opts.state ?? "open", ruleset: opts.ruleset ?? TEST_RULESET, deadlineAt: opts.deadlineAt ?? new Date(Date.now() + 86_400_000) })
    .returning();
  const [crew] = await db().insert(crews).values({ handle: unique("crew"), name: "Test Crew" }).returning();
  await db().insert(crewMembers).values({ crewId: crew.id, userId: opts.captainId, role: "captain" });
  const [entry] = await db().insert(entries).values({ competitionId: competition.id, crewId: crew.id, title: "Test Entry", feeState: "not_required" }).returning();
  return { competition, crew, entry };
}

/** Stores files in the S3 fake and records them as a complete upload, as the upload flow would. */
export async function makeCompleteUpload(entryId: string, number: number, files: { kind: "bundle" | "layout" | "video" | "still"; bytes: Uint8Array; filename: string; mediaType: string }[]) {
  const [upload] = await db().insert(uploads).values({ entryId, number, state: "complete", completedAt: new Date() }).returning();
  for (const f of files) {
    const key = `test/${upload.id}/${f.kind}`;
    await putObject(key, f.bytes, f.mediaType);
    await db()
      .insert(uploadFiles)
      .values({ uploadId: upload.id, kind: f.kind, s3Key: key, filename: f.filename, claimedBytes: f.bytes.length, sizeBytes: f.bytes.length, sha256: createHash("sha256").update(f.bytes).digest("hex"), mediaType: f.mediaType, state: "confirmed", confirmedAt: new Date() });
  }
  return upload;
}

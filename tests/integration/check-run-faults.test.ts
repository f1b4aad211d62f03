import { eq } from "drizzle-orm";
import { randomBytes } from "node:crypto";
import { existsSync, readdirSync, readFileSync } from "node:fs";
import { resolve } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { zipOf } from "../support/archives";
import { closeDb, db } from "~/db/client.server";
import { checkRuns, findings, uploadFiles } from "~/db/schema";
import { env } from "~/env.server";
import { DEMO_RULESET } from "~/rules/ruleset";
import { executeCheckRun } from "~/conformance/run.server";
import { queueCheckRun } from "~/conformance/queue.server";
import { generateDemoLayout } from "../support/demo-layout";
import { stopQueue } from "~/jobs/queue.server";
import { putObject } from "~/storage/s3.server";
import { designPath } from "../../demo/designs/index";
import { makeCompetitionWithEntry, makeCompleteUpload } from "../support/entries";
import { makeEvent, makeUser } from "../support/users";

/**
 * Issue 12, item 5: one broken file must not lose the whole check run. A capture video that starts with the
 * MP4 "ftyp" box (ISO/IEC 14496-12, §4.3: a box is a 32-bit size then a four-character type; "ftyp" comes first)
 * and is garbage after it passes the upload's sniffing, then fails to decode in ffmpeg.
 */
afterAll(async () => {
  await stopQueue();
  await closeDb();
});

/** The run's work folders still on disk (one per attempt while it runs). */
const runFolders = (runId: string) => (existsSync(resolve(env().WORKDIR)) ? readdirSync(resolve(env().WORKDIR)).filter((n) => n.includes(runId)) : []);

const garbageMp4 = () => Buffer.concat([Buffer.from("00000018667479706973366d0000020069736f6d69736f32", "hex"), randomBytes(256 * 1024)]);

async function uploadOf(files: { video?: Buffer; simulate?: boolean } = {}) {
  const event = await makeEvent();
  const captain = await makeUser();
  const made = await makeCompetitionWithEntry({ eventId: event.id, captainId: captain.id, state: "open" });
  const upload = await makeCompleteUpload(made.entry.id, 1, [
    { kind: "bundle", bytes: await zipOf({ "xor.v": readFileSync(designPath("xor-tide")) }), filename: "xor.zip", mediaType: "application/zip" },
    { kind: "layout", bytes: generateDemoLayout({ ruleset: DEMO_RULESET, shape: "single", flipFlops: 30, logicCells: 200, seed: 3 }).bytes, filename: "xor.gds", mediaType: "application/vnd.gdsii" },
    ...(files.video ? [{ kind: "video" as const, bytes: files.video, filename: "capture.mp4", mediaType: "video/mp4" }] : []),
  ]);
  return { ...made, upload, runId: await queueCheckRun(upload.id) };
}

describe("a check run with one broken file", () => {
  it("keeps the other steps' findings, reports the video as unreadable, is not retried, and leaves no work folder", async () => {
    const { runId } = await uploadOf({ video: garbageMp4() });
    // The input's fault is an outcome, not an exception: pg-boss would retry a thrown error.
    await expect(executeCheckRun(runId, { simulate: false })).resolves.toBe("done");
    const [run] = await db().select().from(checkRuns).where(eq(checkRuns.id, runId));
    expect(run.state).toBe("done");
    expect(run.attempts).toBe(1);
    expect(run.verdict).toBe("fail");
    const rows = await db().select().from(findings).where(eq(findings.checkRunId, runId));
    const byRule = new Map(rows.map((r) => [r.rule, r]));
    for (const rule of ["intake.bundle", "precheck.clean", "source.top", "layout.die.size"]) expect(byRule.get(rule)?.verdict, rule).toBe("pass");
    const video = byRule.get("capture.video.unreadable");
    expect(video?.verdict).toBe("fail");
    expect(video?.step).toBe("capture");
    expect(video?.advice).toBeTruthy();
    expect(runFolders(runId)).toEqual([]);
  }, 180_000);

  it("refuses an object whose SHA-256 differs from the upload receipt, and says so", async () => {
    const { upload, runId } = await uploadOf();
    const [layout] = await db().select().from(uploadFiles).where(eq(uploadFiles.uploadId, upload.id)).then((r) => r.filter((f) => f.kind === "layout"));
    // The stored object changes after the receipt was issued (a corrupted or replaced object).
    await putObject(layout.s3Key, generateDemoLayout({ ruleset: DEMO_RULESET, shape: "single", flipFlops: 31, logicCells: 200, seed: 4 }).bytes, "application/vnd.gdsii");
    await expect(executeCheckRun(runId, { simulate: false })).resolves.toBe("done");
    const rows = await db().select().from(findings).where(eq(findings.checkRunId, runId));
    const mismatch = rows.find((r) => r.rule === "layout.receipt");
    expect(mismatch?.verdict).toBe("fail");
    expect(mismatch?.evidence).toContain(layout.sha256!);
    // The layout was not read: no layout measurements from the replaced bytes.
    expect(rows.some((r) => r.rule === "layout.die.size")).toBe(false);
    expect(rows.find((r) => r.rule === "source.top")?.verdict).toBe("pass");
    expect(runFolders(runId)).toEqual([]);
  }, 120_000);
});

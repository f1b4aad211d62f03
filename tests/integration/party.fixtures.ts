import { db } from "~/db/client.server";
import { artifacts, checkRuns } from "~/db/schema";
import { putObject } from "~/storage/s3.server";
import { makeCompleteUpload } from "../support/entries";
import { makeCompo, type CompoFixture } from "./showcase.fixtures";

/** Two compos of one party (one organizer), for the party tests. All data is made up here. */
export async function twoCompoParty() {
  const a = await makeCompo({ method: "points", title: "Alpha Beam" });
  const b = await makeCompo({ method: "points", title: "Bravo Tone", party: a });
  return { a, b };
}

/** Gives each of the compo's entries a newest upload with real stored files and a check run with real reference artifacts. */
export async function withStoredFiles(f: CompoFixture, verdicts: ("pass" | "warn" | "fail")[]) {
  const out: { entryId: string; files: Record<string, Buffer>; wavKey: string }[] = [];
  for (const [i, e] of f.entries.entries()) {
    const files = {
      bundle: Buffer.from(`zip bytes of ${e.title} ${i}`),
      layout: Buffer.from(`gds bytes of ${e.title} ${i}`),
      video: Buffer.from(`webm capture of ${e.title} ${i}`),
    };
    const upload = await makeCompleteUpload(e.id, 2, [
      { kind: "bundle", bytes: files.bundle, filename: "design.zip", mediaType: "application/zip" },
      { kind: "layout", bytes: files.layout, filename: "design.gds", mediaType: "application/vnd.gdsii" },
      { kind: "video", bytes: files.video, filename: "capture.webm", mediaType: "video/webm" },
    ]);
    const [run] = await db()
      .insert(checkRuns)
      .values({ uploadId: upload.id, state: "done", verdict: verdicts[i] ?? "pass", figures: { layout: { topCell: "gc_entry", widthUm: 180, heightUm: 120, matchedShape: "single", flipFlops: 40 + i } }, finishedAt: new Date() })
      .returning();
    for (const [kind, type] of [["webm", "video/webm"], ["wav", "audio/wav"], ["first-frame", "image/png"]] as const) {
      const bytes = Buffer.from(`${kind} of ${e.title}`);
      const key = `test-artifacts/${run.id}/${kind}`;
      const stored = await putObject(key, bytes, type);
      await db().insert(artifacts).values({ checkRunId: run.id, kind, s3Key: key, mediaType: type, sizeBytes: stored.size, sha256: stored.sha256 });
    }
    out.push({ entryId: e.id, files, wavKey: `test-artifacts/${run.id}/wav` });
  }
  return out;
}


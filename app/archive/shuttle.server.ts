import { and, asc, desc, eq, inArray } from "drizzle-orm";
import { storedRuleset } from "~/competitions/service.server";
import { db } from "~/db/client.server";
import { checkRuns, competitions, crews, entries, events, uploadFiles } from "~/db/schema";
import { eligibleEntries, SHOWCASE_STATES } from "~/showcase/showcase.server";
import { safeSegment } from "./contents.server";
import { manifestText } from "./party-archive.server";
import { assertStored, sha256Hex, streamZip, type ZipItem } from "./zip-stream.server";

/**
 * The shuttle export: the layouts of the entries the organizer picked, all of which passed their conformance check
 * (verdict pass or warn on the counting upload), and a manifest in Gatecrash's own shape, `gatecrash-shuttle/1`
 * (docs/shuttle-export.md). A passing check is not the shuttle's signoff; the manifest says so.
 */
export const SHUTTLE_FORMAT = "gatecrash-shuttle/1";

export interface ShuttleCandidate {
  entryId: string;
  title: string;
  crew: string;
  crewHandle: string;
  compo: { id: string; slug: string; title: string };
  uploadId: string;
  uploadNumber: number;
  verdict: "pass" | "warn";
  checkRunId: string;
  layout: { s3Key: string; filename: string; sizeBytes: number; sha256: string };
  figures: { topCell: string | null; widthUm: number | null; heightUm: number | null; tileShape: string | null; flipFlops: number | null };
}

export class ShuttleError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "ShuttleError";
  }
}

const num = (v: unknown) => (typeof v === "number" && Number.isFinite(v) ? v : null);

/** Every entry of the party that may go on the shuttle: shown, its counting upload checked and not failed, with a layout. */
export async function shuttleCandidates(eventId: string): Promise<ShuttleCandidate[]> {
  const compos = await db()
    .select({ id: competitions.id, slug: competitions.slug, title: competitions.title })
    .from(competitions)
    .where(and(eq(competitions.eventId, eventId), inArray(competitions.state, [...SHOWCASE_STATES])))
    .orderBy(asc(competitions.createdAt), asc(competitions.title));
  const out: ShuttleCandidate[] = [];
  for (const c of compos) {
    const list = await eligibleEntries(c.id);
    if (list.length === 0) continue;
    const uploadIds = list.map((x) => x.uploadId);
    const runs = await db()
      .selectDistinctOn([checkRuns.uploadId], { id: checkRuns.id, uploadId: checkRuns.uploadId, state: checkRuns.state, verdict: checkRuns.verdict, figures: checkRuns.figures })
      .from(checkRuns)
      .where(inArray(checkRuns.uploadId, uploadIds))
      .orderBy(checkRuns.uploadId, desc(checkRuns.queuedAt));
    const layouts = await db()
      .select()
      .from(uploadFiles)
      .where(and(inArray(uploadFiles.uploadId, uploadIds), eq(uploadFiles.kind, "layout"), eq(uploadFiles.state, "confirmed")));
    const handles = new Map(
      (await db().select({ id: entries.id, handle: crews.handle }).from(entries).innerJoin(crews, eq(crews.id, entries.crewId)).where(inArray(entries.id, list.map((x) => x.id)))).map((r) => [r.id, r.handle]),
    );
    for (const x of list) {
      const run = runs.find((r) => r.uploadId === x.uploadId);
      const layout = layouts.find((l) => l.uploadId === x.uploadId);
      if (!run || run.state !== "done" || (run.verdict !== "pass" && run.verdict !== "warn") || !layout?.sha256 || layout.sizeBytes === null) continue;
      const lf = ((run.figures as Record<string, unknown>).layout ?? {}) as Record<string, unknown>;
      out.push({
        entryId: x.id,
        title: x.title,
        crew: x.crewName,
        crewHandle: handles.get(x.id) ?? "",
        compo: c,
        uploadId: x.uploadId,
        uploadNumber: x.uploadNumber,
        verdict: run.verdict,
        checkRunId: run.id,
        layout: { s3Key: layout.s3Key, filename: layout.filename, sizeBytes: layout.sizeBytes, sha256: layout.sha256 },
        figures: { topCell: typeof lf.topCell === "string" ? lf.topCell : null, widthUm: num(lf.widthUm), heightUm: num(lf.heightUm), tileShape: typeof lf.matchedShape === "string" ? lf.matchedShape : null, flipFlops: num(lf.flipFlops) },
      });
    }
  }
  return out;
}

export async function shuttleExport(eventId: string, entryIds: string[], now = new Date()) {
  const wanted = [...new Set(entryIds)];
  if (wanted.length === 0) throw new ShuttleError("Choose at least one entry for the shuttle.");
  const [e] = await db().select().from(events).where(eq(events.id, eventId));
  const all = await shuttleCandidates(eventId);
  const chosen = all.filter((c) => wanted.includes(c.entryId));
  const refused = wanted.filter((id) => !chosen.some((c) => c.entryId === id));
  if (refused.length) throw new ShuttleError(`${refused.length} of the chosen entries cannot go on the shuttle: not of this party, not shown, or their check did not pass.`);
  const rulesets = new Map(
    (await db().select({ id: competitions.id, ruleset: competitions.ruleset }).from(competitions).where(inArray(competitions.id, [...new Set(chosen.map((c) => c.compo.id))]))).map((r) => [r.id, storedRuleset(r).ruleset]),
  );
  const root = `${e.slug}-shuttle`;
  const items: ZipItem[] = [];
  const manifestEntries = chosen.map((c) => {
    const file = `layouts/${safeSegment(c.compo.slug, "compo")}--${safeSegment(c.crewHandle || c.crew, "crew")}--${safeSegment(c.title, "entry")}.gds`;
    items.push({ path: `${root}/${file}`, s3Key: c.layout.s3Key, sizeBytes: c.layout.sizeBytes, sha256: c.layout.sha256, mtime: now });
    const r = rulesets.get(c.compo.id)!;
    return {
      file,
      sha256: c.layout.sha256,
      bytes: c.layout.sizeBytes,
      entry: { id: c.entryId, title: c.title },
      crew: { handle: c.crewHandle, name: c.crew },
      compo: { slug: c.compo.slug, title: c.compo.title },
      upload: { number: c.uploadNumber, uploadedAs: c.layout.filename },
      check: { runId: c.checkRunId, verdict: c.verdict },
      layout: c.figures,
      rules: { topModule: r.topModule, tileUm: { width: r.tile.widthUm, height: r.tile.heightUm }, pinLabelLayer: r.pinLayer.layer, pinLabelDatatype: r.pinLayer.datatype, pins: r.pins.map((p) => ({ name: p.name, direction: p.direction, width: p.width })) },
    };
  });
  const manifest = {
    format: SHUTTLE_FORMAT,
    party: { slug: e.slug, title: e.title },
    exportedAt: now.toISOString(),
    notice: "A passing Gatecrash check is not signoff: the shuttle's own design-rule and layout-versus-schematic checks still apply.",
    entries: manifestEntries,
  };
  await assertStored(items);
  const manifestBytes = Buffer.from(JSON.stringify(manifest, null, 2) + "\n", "utf8");
  items.push({ path: `${root}/shuttle-manifest.json`, bytes: manifestBytes, mtime: now });
  const sums = [{ path: "shuttle-manifest.json", sha256: sha256Hex(manifestBytes) }, ...manifestEntries.map((m) => ({ path: m.file, sha256: m.sha256 }))];
  items.push({ path: `${root}/SHA256SUMS`, bytes: Buffer.from(manifestText(sums)), mtime: now });
  return { manifest, filename: `${root}.zip`, zip: streamZip(items) };
}

import { archivePlan, type ArchivedEntry, type ArchivePlan } from "./contents.server";
import { assertStored, sha256Hex, streamZip, type ZipItem } from "./zip-stream.server";

/**
 * The party archive: one folder per shown entry (source bundle, layout, capture, reference capture, info.txt),
 * a README.txt, and SHA256SUMS over every file in the format `sha256sum -c` reads (GNU coreutils: the hex digest,
 * two spaces, the path). The sums of stored files are the ones recorded at upload; the zip writer checks each
 * against the bytes it sends.
 */
export const MANIFEST_NAME = "SHA256SUMS";

const fmtPlace = (e: ArchivedEntry) =>
  e.place ? `${e.place.place}${e.place.tied ? " (tied)" : ""} with ${e.place.points.toFixed(3)} points (results version ${e.place.version})` : "not placed: no results published";

export function infoText(plan: ArchivePlan, e: ArchivedEntry): string {
  return [
    `Title: ${e.title}`,
    `Crew: ${e.crew}${e.crewHandle ? ` (@${e.crewHandle})` : ""}`,
    `Compo: ${e.compo.title} — ${plan.event.title}`,
    `Place: ${fmtPlace(e)}`,
    e.awards.length ? `Awards: ${e.awards.join("; ")}` : null,
    `Shown as entry ${e.position} of the compo`,
    `Upload: number ${e.upload.number}${e.upload.completedAt ? `, completed ${e.upload.completedAt.toISOString()}` : ""}`,
    `Conformance check: ${e.check?.verdict ?? "none"}${e.check?.finishedAt ? `, finished ${e.check.finishedAt.toISOString()}` : ""} (not signoff: the shuttle's own DRC and LVS still apply)`,
    `Gatecrash entry id: ${e.entryId}`,
    "",
    "Files (SHA-256, bytes, name, what it is):",
    ...e.files.map((f) => `${f.sha256}  ${f.sizeBytes}  ${f.name}  ${f.role}${f.originalName ? `, uploaded as ${f.originalName}` : ""}`),
    "",
  ]
    .filter((l): l is string => l !== null)
    .join("\n");
}

export function readmeText(plan: ArchivePlan, now: Date): string {
  return [
    `${plan.event.title} — party archive`,
    `Made by Gatecrash on ${now.toISOString()}. ${plan.entries.length} entries that were shown, one folder each (compo/NN-title).`,
    "",
    "Check every file: unzip, then run `sha256sum -c SHA256SUMS` in this folder.",
    "Each entry folder has info.txt (title, crew, place, checksums), the source bundle, the layout, the crew's capture",
    "video if they uploaded one, and the reference capture Gatecrash rendered itself (reference/).",
    "",
    "Photosensitivity: captures can flash. Audio: a 1-bit PWM pin is a full-scale square wave with a DC offset;",
    "listen through a low-pass filter and start at low volume. A passing check is not the shuttle's signoff.",
    "",
  ].join("\n");
}

export function manifestText(files: { path: string; sha256: string }[]): string {
  return files.map((f) => `${f.sha256}  ${f.path}`).join("\n") + "\n";
}

export async function partyArchive(eventId: string, now = new Date()) {
  const plan = await archivePlan(eventId);
  if (!plan) return null;
  const root = `${plan.event.slug}-archive`;
  const items: ZipItem[] = [];
  const sums: { path: string; sha256: string }[] = [];
  const addText = (path: string, text: string) => {
    const bytes = Buffer.from(text, "utf8");
    items.push({ path: `${root}/${path}`, bytes, mtime: now });
    sums.push({ path, sha256: sha256Hex(bytes) });
  };
  addText("README.txt", readmeText(plan, now));
  for (const e of plan.entries) {
    addText(`${e.folder}/info.txt`, infoText(plan, e));
    for (const f of e.files) {
      const path = `${e.folder}/${f.name}`;
      items.push({ path: `${root}/${path}`, s3Key: f.s3Key, sizeBytes: f.sizeBytes, sha256: f.sha256, mtime: e.upload.completedAt ?? now });
      sums.push({ path, sha256: f.sha256 });
    }
  }
  await assertStored(items);
  const manifest = Buffer.from(manifestText(sums), "utf8");
  items.push({ path: `${root}/${MANIFEST_NAME}`, bytes: manifest, mtime: now });
  return { plan, filename: `${root}.zip`, zip: streamZip(items) };
}

import { execFile } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { promisify } from "node:util";

/** Runs Debian's KLayout in batch mode as an independent reference for tests and benchmarks. */
const run = promisify(execFile);
const HERE = new URL(".", import.meta.url).pathname;

export interface KlayoutSummary {
  topCells: string[];
  topCell: string;
  bboxUm: [number, number, number, number];
  instances: Record<string, number>;
  labels: { text: string; layer: number; texttype: number; xUm: number; yUm: number }[];
  layers: [number, number][];
  cells: Record<string, [number, number, number, number] | null>;
  dbu: number;
  loadMs: number;
}

export async function klayoutSummary(gdsPath: string): Promise<KlayoutSummary> {
  const dir = mkdtempSync(join(tmpdir(), "gc-klayout-"));
  try {
    const out = join(dir, "summary.json");
    await run("klayout", ["-b", "-r", join(HERE, "klayout-summary.py"), "-rd", `gds=${gdsPath}`, "-rd", `out=${out}`], { timeout: 120_000 });
    return JSON.parse(readFileSync(out, "utf8")) as KlayoutSummary;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/** Writes KLayout's own fixture layout (rotations, mirrors, magnification, arrays, labels) and returns its bytes. */
export async function klayoutFixture(): Promise<Uint8Array> {
  const dir = mkdtempSync(join(tmpdir(), "gc-klayout-"));
  try {
    const out = join(dir, "fixture.gds");
    await run("klayout", ["-b", "-r", join(HERE, "klayout-write-fixture.py"), "-rd", `out=${out}`], { timeout: 120_000 });
    return new Uint8Array(readFileSync(out));
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

export function writeTemp(bytes: Uint8Array, name = "layout.gds"): { path: string; cleanup: () => void } {
  const dir = mkdtempSync(join(tmpdir(), "gc-gds-"));
  const path = join(dir, name);
  writeFileSync(path, bytes);
  return { path, cleanup: () => rmSync(dir, { recursive: true, force: true }) };
}

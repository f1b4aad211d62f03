import { execFileSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { gzipSync } from "node:zlib";
import { writeLayout } from "./writer";
import { afterAll, describe, expect, it } from "vitest";
import { generateDemoLayout } from "../../tests/support/demo-layout";
import { GdsiiError } from "./errors";
import { readLayoutFile } from "./reader.server";
import { klayoutSummary } from "../../tests/support/klayout";

/**
 * Compressed layouts (.gds.gz): compressed by Debian's gzip (an independent implementation of RFC 1952), read by
 * our reader and by KLayout, which reads .gds.gz itself; the same figures must come out. The inflated size is held
 * to the layout limit, so a gzip bomb stops at the limit.
 */
const dir = mkdtempSync(join(tmpdir(), "gc-gdsgz-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function gzipWithDebianTool(path: string): string {
  execFileSync("gzip", ["-k", "-9", "-f", path]);
  return `${path}.gz`;
}

describe("compressed layouts", () => {
  it("reads a .gds.gz like the .gds, and agrees with KLayout on it", async () => {
    const plain = join(dir, "entry.gds");
    writeFileSync(plain, generateDemoLayout({ flipFlops: 58, logicCells: 900, seed: 3 }).bytes);
    const packed = gzipWithDebianTool(plain);
    expect(statSync(packed).size).toBeLessThan(statSync(plain).size);
    const fromPlain = await readLayoutFile(plain);
    const fromPacked = await readLayoutFile(packed);
    expect(fromPacked).toEqual(fromPlain);
    const reference = await klayoutSummary(packed);
    expect(fromPacked.instances).toEqual(reference.instances);
    expect(fromPacked.topCell).toBe(reference.topCell);
  }, 120_000);

  it("holds the inflated size to the limit: a gzip bomb is refused clearly", async () => {
    // A valid start (HEADER … STRNAME) and then the same BOUNDARY element over and over: 64 MiB of well-formed
    // records that deflate to well under 200 KiB; the limit here is 8 MiB.
    const empty = writeLayout({ libName: "BOMB", userUnitsPerDbUnit: 0.001, metersPerDbUnit: 1e-9, structures: [{ name: "gc_entry", elements: [] }] });
    const start = Buffer.from(empty.subarray(0, empty.length - 8)); // without ENDSTR and ENDLIB (4 bytes each)
    const record = (type: number, dataType: number, data: number[]) => Buffer.from([0, 4 + data.length, type, dataType, ...data]);
    const xy = [0, 0, 1000, 0, 1000, 1000, 0, 1000, 0, 0].flatMap((v) => [(v >>> 24) & 255, (v >>> 16) & 255, (v >>> 8) & 255, v & 255]);
    // GDSII Stream Format Manual 6.0: BOUNDARY 08/00, LAYER 0D/02, DATATYPE 0E/02, XY 10/03, ENDEL 11/00.
    const element = Buffer.concat([record(0x08, 0, []), record(0x0d, 2, [0, 1]), record(0x0e, 2, [0, 0]), record(0x10, 3, xy), record(0x11, 0, [])]);
    const bomb = join(dir, "bomb.gds.gz");
    writeFileSync(bomb, gzipSync(Buffer.concat([start, Buffer.alloc(64 * 1024 * 1024 - (64 * 1024 * 1024) % element.length).fill(element)]), { level: 9 }));
    expect(statSync(bomb).size).toBeLessThan(200 * 1024);
    const started = process.memoryUsage().rss;
    const err = await readLayoutFile(bomb, { limits: { maxBytes: 8 * 1024 * 1024 } }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(GdsiiError);
    expect((err as Error).message).toMatch(/inflates to more than 8388608 bytes.*same limit/);
    expect(process.memoryUsage().rss - started).toBeLessThan(64 * 1024 * 1024);
  });

  it("refuses a layout over the limit once inflated, even when the compressed file is small", async () => {
    const plain = join(dir, "big.gds");
    writeFileSync(plain, generateDemoLayout({ flipFlops: 200, logicCells: 3000, shape: "wide" }).bytes);
    const packed = gzipWithDebianTool(plain);
    const limit = statSync(plain).size - 1;
    expect(statSync(packed).size).toBeLessThan(limit);
    await expect(readLayoutFile(packed, { limits: { maxBytes: limit } })).rejects.toThrow(/inflates to more than/);
    await expect(readLayoutFile(packed, { limits: { maxBytes: limit + 1 } })).resolves.toBeTruthy();
  });

  it("refuses a cut-off .gds.gz as a layout error, not a crash", async () => {
    const plain = join(dir, "cut.gds");
    writeFileSync(plain, generateDemoLayout({ flipFlops: 10, logicCells: 100 }).bytes);
    const packed = readFileSync(gzipWithDebianTool(plain));
    const cut = join(dir, "cut-short.gds.gz");
    writeFileSync(cut, packed.subarray(0, Math.floor(packed.length / 2)));
    await expect(readLayoutFile(cut)).rejects.toBeInstanceOf(GdsiiError);
  });
});

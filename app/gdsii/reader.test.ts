import { describe, expect, it } from "vitest";
import { writeFileSync, mkdtempSync, rmSync, truncateSync, openSync, closeSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { GdsiiError } from "./errors";
import { readLayout, LayoutReader } from "./reader";
import { readLayoutFile } from "./reader.server";
import { RecordType as R, DataType as D } from "./records";
import { RecordWriter, writeLayout, type GdsElement, type GdsLibrary, type GdsStructure } from "./writer";

const lib = (structures: GdsStructure[]): GdsLibrary => ({ libName: "T", userUnitsPerDbUnit: 0.001, metersPerDbUnit: 1e-9, structures });
const rect = (layer: number, x0: number, y0: number, x1: number, y1: number): GdsElement => ({
  kind: "boundary",
  layer,
  datatype: 0,
  points: [x0, y0, x1, y0, x1, y1, x0, y1],
});

function expectGdsiiError(fn: () => unknown, pattern: RegExp): GdsiiError {
  let caught: unknown;
  try {
    fn();
  } catch (e) {
    caught = e;
  }
  expect(caught).toBeInstanceOf(GdsiiError);
  expect((caught as GdsiiError).message).toMatch(pattern);
  return caught as GdsiiError;
}

function libraryStart(): RecordWriter {
  return new RecordWriter().int16(R.HEADER, [600]).int16(R.BGNLIB, new Array(12).fill(1)).ascii(R.LIBNAME, "T").real8(R.UNITS, [0.001, 1e-9]);
}

describe("readLayout on files from Gatecrash's writer", () => {
  const bytes = writeLayout(
    lib([
      { name: "leaf", elements: [rect(1, 0, 0, 1000, 500)] },
      { name: "pair", elements: [{ kind: "sref", cell: "leaf", x: 0, y: 0 }, { kind: "sref", cell: "leaf", x: 0, y: 2000, angle: 90 }] },
      {
        name: "top",
        elements: [
          { kind: "aref", cell: "pair", cols: 3, rows: 4, x: 0, y: 0, colStep: [5000, 0], rowStep: [0, 4000] },
          { kind: "path", layer: 2, datatype: 1, width: 200, pathtype: 0, points: [0, -1000, 3000, -1000] },
          { kind: "box", layer: 3, boxtype: 2, x0: -500, y0: 0, x1: -100, y1: 100 },
          { kind: "node", layer: 9, nodetype: 0, points: [-90000, 0] },
          { kind: "text", layer: 70, texttype: 0, x: 123, y: -456, text: "clk" },
        ],
      },
    ]),
  );
  const s = readLayout(bytes);

  it("finds the top cell and multiplies counts through arrays and nesting", () => {
    expect(s.topCells).toEqual(["top"]);
    expect(s.topCell).toBe("top");
    expect(s.instances).toEqual({ pair: 12, leaf: 24 }); // 3 × 4 pairs, 2 leaves each
    expect(s.depth).toBe(2);
  });

  it("bounds paths by width and flush ends, boxes, texts; ignores nodes", () => {
    // Worked by hand: leaf rotated 90° at (0, 2000) spans x -500..0; flush path spans y -1100..-900;
    // the last array member's pair spans up to (10000 + 1000, 12000 + 2000 + 1000).
    expect(s.bboxUm).toEqual([-0.5, -1.1, 11, 15]);
    expect(s.labels).toEqual([{ text: "clk", layer: 70, texttype: 0, xUm: 0.123, yUm: -0.456 }]);
    expect(s.layers).toEqual([{ layer: 1, datatype: 0 }, { layer: 2, datatype: 1 }, { layer: 3, datatype: 2 }, { layer: 70, datatype: 0 }]);
  });

  it("gives the same answer when the bytes arrive in tiny chunks", () => {
    const reader = new LayoutReader();
    for (let i = 0; i < bytes.length; i += 7) reader.push(bytes.subarray(i, i + 7));
    expect(reader.finish()).toEqual(s);
  });

  it("streams a file from disk", async () => {
    const dir = mkdtempSync(join(tmpdir(), "gc-read-"));
    try {
      writeFileSync(join(dir, "a.gds"), bytes);
      expect(await readLayoutFile(join(dir, "a.gds"))).toEqual(s);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it("collects top-level placements for pictures, an AREF as one entry", () => {
    const p = readLayout(bytes, { collectPlacements: 10 }).placements!;
    expect(p.length).toBe(1);
    expect(p.cellNames).toEqual(["pair"]);
    expect(Array.from(p.count)).toEqual([12]);
    expect(Array.from(p.boxUm)).toEqual([-0.5, 0, 11, 15]);
  });

  it("picks the biggest of several top cells", () => {
    const two = readLayout(writeLayout(lib([{ name: "small", elements: [rect(1, 0, 0, 10, 10)] }, { name: "big", elements: [rect(1, 0, 0, 100, 100)] }])));
    expect(two.topCells).toEqual(["big", "small"]);
    expect(two.topCell).toBe("big");
  });
});

describe("malformed layouts give a GdsiiError", () => {
  const good = writeLayout(lib([{ name: "leaf", elements: [rect(1, 0, 0, 10, 10)] }, { name: "top", elements: [{ kind: "sref", cell: "leaf", x: 0, y: 0 }] }]));

  it("truncated file", () => {
    expectGdsiiError(() => readLayout(good.subarray(0, good.length - 9)), /truncated/);
    expectGdsiiError(() => readLayout(good.subarray(0, 2)), /empty or too short/);
  });

  it("zero and odd record lengths", () => {
    const zero = libraryStart().raw([0, 0, 0x05, 0x02]).bytes();
    const e = expectGdsiiError(() => readLayout(zero), /length 0/);
    expect(e.offset).toBe(zero.length - 4);
    expectGdsiiError(() => readLayout(libraryStart().raw([0, 7, 0x05, 0x02, 0, 0, 0]).bytes()), /length 7.*odd/);
  });

  it("unknown record type", () => {
    expectGdsiiError(() => readLayout(libraryStart().raw([0, 4, 0x7f, 0]).bytes()), /unknown record type 0x7f/);
  });

  it("not a GDSII stream at all", () => {
    expectGdsiiError(() => readLayout(new TextEncoder().encode("module top; endmodule\n")), /.+/);
  });

  it("a structure that places itself, and a longer cycle", () => {
    expectGdsiiError(() => readLayout(writeLayout(lib([{ name: "loop", elements: [{ kind: "sref", cell: "loop", x: 0, y: 0 }] }]))), /loop places itself/);
    expectGdsiiError(
      () =>
        readLayout(
          writeLayout(
            lib([
              { name: "a", elements: [{ kind: "sref", cell: "b", x: 0, y: 0 }] },
              { name: "b", elements: [{ kind: "sref", cell: "a", x: 0, y: 0 }] },
              { name: "top", elements: [{ kind: "sref", cell: "a", x: 0, y: 0 }] },
            ]),
          ),
        ),
      /cycle: (a → b → a|b → a → b)/,
    );
  });

  it("a placement of a structure that is not defined", () => {
    expectGdsiiError(() => readLayout(writeLayout(lib([{ name: "top", elements: [{ kind: "sref", cell: "ghost", x: 0, y: 0 }] }]))), /ghost, which the library does not define/);
  });

  it("an AREF of 10⁹ members is counted, not expanded", () => {
    // 31,623² = 1,000,014,129 members; nested once more ×4 to pass 2^32.
    const s = readLayout(
      writeLayout(
        lib([
          { name: "bit", elements: [rect(1, 0, 0, 1, 1)] },
          { name: "plane", elements: [{ kind: "aref", cell: "bit", cols: 31623, rows: 31623, x: 0, y: 0, colStep: [2, 0], rowStep: [0, 2] }] },
          { name: "top", elements: [{ kind: "aref", cell: "plane", cols: 2, rows: 2, x: 0, y: 0, colStep: [100000, 0], rowStep: [0, 100000] }] },
        ]),
      ),
    );
    expect(s.instances).toEqual({ plane: 4, bit: 4 * 31623 * 31623 });
    expect(s.instanceCountsExact).toBe(true);
    expect(s.bboxUm).toEqual([0, 0, 163.245, 163.245]); // (100000 + 31622·2 + 1) nm
  });

  it("a hierarchy 10,000 deep: correct with the default limit, a clear error with a lower one", () => {
    const structures: GdsStructure[] = [{ name: "c0", elements: [rect(1, 0, 0, 10, 10)] }];
    for (let i = 1; i <= 10_000; i++) structures.push({ name: `c${i}`, elements: [{ kind: "sref", cell: `c${i - 1}`, x: 1, y: 0 }] });
    const bytes = writeLayout(lib(structures));
    const s = readLayout(bytes);
    expect(s.topCell).toBe("c10000");
    expect(s.depth).toBe(10_000);
    expect(s.instances.c0).toBe(1);
    expect(s.bboxUm).toEqual([10, 0, 10.01, 0.01]);
    expectGdsiiError(() => readLayout(bytes, { limits: { maxDepth: 1000 } }), /more than 1000 levels deep/);
  });

  it("a record claiming more bytes than remain", () => {
    const claim = libraryStart().raw([0xff, 0xfe, 0x10, 0x03, 0, 0, 0, 1]).bytes();
    expectGdsiiError(() => readLayout(claim), /claims 65534 bytes but only 8 remain/);
  });

  it("a 1 GB file is refused before reading", async () => {
    const dir = mkdtempSync(join(tmpdir(), "gc-big-"));
    try {
      const path = join(dir, "huge.gds");
      closeSync(openSync(path, "w"));
      truncateSync(path, 1024 * 1024 * 1024); // sparse: no disk used
      await expect(readLayoutFile(path)).rejects.toThrow(/1073741824 bytes, more than the limit/);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it("limits on structures and records", () => {
    const many = writeLayout(lib(Array.from({ length: 50 }, (_, i) => ({ name: `s${i}`, elements: [rect(1, 0, 0, 1, 1)] }))));
    expectGdsiiError(() => readLayout(many, { limits: { maxStructures: 10 } }), /more than 10 structure names/);
    expectGdsiiError(() => readLayout(many, { limits: { maxRecords: 100 } }), /more than 100 records/);
  });

  it("elements and records out of place", () => {
    expectGdsiiError(() => readLayout(libraryStart().none(R.BOUNDARY).bytes()), /outside a structure/);
    expectGdsiiError(
      () => readLayout(libraryStart().int16(R.BGNSTR, new Array(12).fill(1)).ascii(R.STRNAME, "x").none(R.SREF).int32(R.XY, [0, 0]).none(R.ENDEL).none(R.ENDSTR).none(R.ENDLIB).bytes()),
      /SREF element without SNAME/,
    );
    expectGdsiiError(
      () => readLayout(libraryStart().int16(R.BGNSTR, new Array(12).fill(1)).ascii(R.STRNAME, "x").none(R.BOUNDARY).int16(R.LAYER, [1]).int16(R.XY, [1, 2, 3], D.INT16).none(R.ENDEL).bytes()),
      /XY holds 6 bytes/,
    );
  });
});

describe("many structure names", () => {
  it("keeps 2,000 names apart, including names that differ in one byte and names that are prefixes of others", () => {
    // Gatecrash's own writer makes the file; the census per cell is known by construction: cell i placed (i % 5) + 1 times.
    const names = Array.from({ length: 2000 }, (_, i) => (i % 2 ? `c${i}` : `c${i}_x`));
    names.push("c1_", "c1_x_", "C1");
    const leaves: GdsStructure[] = names.map((name) => ({ name, elements: [rect(1, 0, 0, 10, 10)] }));
    const top: GdsStructure = {
      name: "top",
      elements: names.flatMap((cell, i) => Array.from({ length: (i % 5) + 1 }, (_, k) => ({ kind: "sref" as const, cell, x: 20 * i, y: 20 * k }))),
    };
    const summary = readLayout(writeLayout(lib([...leaves, top])));
    expect(summary.topCell).toBe("top");
    names.forEach((name, i) => expect(summary.instances[name], name).toBe((i % 5) + 1));
    expect(Object.keys(summary.instances)).toHaveLength(names.length);
  });
});

describe("absolute magnification and absolute angle (STRANS)", () => {
  // GDSII Stream Format Manual, release 6.0, STRANS: a bit array whose bits are numbered from the left of the
  // 16-bit word; bit 0 reflects, bit 13 makes the magnification absolute, bit 14 the angle: 0x8000, 0x0004, 0x0002.
  // An absolute transform ignores the transforms of the placements above it, so a cell's box no longer depends on
  // the cell alone; Gatecrash counts such placements, and the layout check refuses them.
  const BGN = new Array(12).fill(1);
  const file = (strans: number) =>
    libraryStart()
      .int16(R.BGNSTR, BGN).ascii(R.STRNAME, "leaf")
      .none(R.BOUNDARY).int16(R.LAYER, [1]).int16(R.DATATYPE, [0]).int32(R.XY, [0, 0, 1000, 0, 1000, 500, 0, 500, 0, 0]).none(R.ENDEL)
      .none(R.ENDSTR)
      .int16(R.BGNSTR, BGN).ascii(R.STRNAME, "mid")
      .none(R.SREF).ascii(R.SNAME, "leaf").int16(R.STRANS, [strans], D.BITARRAY).real8(R.MAG, [2]).real8(R.ANGLE, [90]).int32(R.XY, [0, 0]).none(R.ENDEL)
      .none(R.ENDSTR)
      .int16(R.BGNSTR, BGN).ascii(R.STRNAME, "top")
      .none(R.SREF).ascii(R.SNAME, "mid").int16(R.STRANS, [0], D.BITARRAY).real8(R.MAG, [3]).int32(R.XY, [0, 0]).none(R.ENDEL)
      .none(R.SREF).ascii(R.SNAME, "mid").int32(R.XY, [50_000, 0]).none(R.ENDEL)
      .none(R.ENDSTR)
      .none(R.ENDLIB)
      .bytes();

  it("counts placements with absolute magnification (0x0004) or absolute angle (0x0002), and where they are", () => {
    expect(readLayout(file(0x0004)).absoluteTransforms).toEqual({ placements: 1, magnification: true, angle: false, cells: ["mid"] });
    expect(readLayout(file(0x0002)).absoluteTransforms).toEqual({ placements: 1, magnification: false, angle: true, cells: ["mid"] });
    expect(readLayout(file(0x8006)).absoluteTransforms).toEqual({ placements: 1, magnification: true, angle: true, cells: ["mid"] });
  });

  it("finds none where only the reflection bit or no bit is set", () => {
    expect(readLayout(file(0x8000)).absoluteTransforms).toEqual({ placements: 0, magnification: false, angle: false, cells: [] });
    expect(readLayout(file(0)).absoluteTransforms).toEqual({ placements: 0, magnification: false, angle: false, cells: [] });
  });
});


import { encodeReal8 } from "./real8";
import { DataType as D, MAX_RECORD_BYTES, RecordType as R, STRANS_REFLECT } from "./records";

/** A library to write: coordinates are integers in database units. */
export interface GdsLibrary {
  libName: string;
  /** Size of a database unit in user units (0.001 when the user unit is 1 µm and the database unit 1 nm). */
  userUnitsPerDbUnit: number;
  metersPerDbUnit: number;
  structures: GdsStructure[];
}

export interface GdsStructure {
  name: string;
  elements: GdsElement[];
}

export interface Placement {
  reflect?: boolean;
  mag?: number;
  /** Degrees, counter-clockwise. */
  angle?: number;
}

/** Points are flat [x0, y0, x1, y1, …] in database units. */
export type GdsElement =
  | { kind: "boundary"; layer: number; datatype: number; points: number[] }
  | { kind: "path"; layer: number; datatype: number; width: number; pathtype?: 0 | 1 | 2 | 4; bgnExtn?: number; endExtn?: number; points: number[] }
  | { kind: "box"; layer: number; boxtype: number; x0: number; y0: number; x1: number; y1: number }
  | { kind: "node"; layer: number; nodetype: number; points: number[] }
  | { kind: "text"; layer: number; texttype: number; x: number; y: number; text: string }
  | ({ kind: "sref"; cell: string; x: number; y: number } & Placement)
  | ({ kind: "aref"; cell: string; cols: number; rows: number; x: number; y: number; colStep: [number, number]; rowStep: [number, number] } & Placement);

/** Low-level record writer with a growing buffer; also used by tests to build malformed streams. */
export class RecordWriter {
  private buf = new Uint8Array(1 << 16);
  private view = new DataView(this.buf.buffer);
  private at = 0;

  private reserve(n: number): void {
    if (this.at + n <= this.buf.length) return;
    let size = this.buf.length * 2;
    while (size < this.at + n) size *= 2;
    const next = new Uint8Array(size);
    next.set(this.buf.subarray(0, this.at));
    this.buf = next;
    this.view = new DataView(next.buffer);
  }

  private header(type: number, dataType: number, payload: number): number {
    const len = 4 + payload;
    if (len > MAX_RECORD_BYTES) throw new RangeError(`record of ${len} bytes exceeds the 16-bit record length`);
    this.reserve(len);
    this.view.setUint16(this.at, len);
    this.buf[this.at + 2] = type;
    this.buf[this.at + 3] = dataType;
    this.at += 4;
    return this.at;
  }

  none(type: number): this {
    this.header(type, D.NONE, 0);
    return this;
  }

  int16(type: number, values: number[], dataType: number = D.INT16): this {
    let p = this.header(type, dataType, 2 * values.length);
    for (const v of values) {
      if (dataType === D.BITARRAY) this.view.setUint16(p, v);
      else this.view.setInt16(p, v);
      p += 2;
    }
    this.at = p;
    return this;
  }

  int32(type: number, values: number[]): this {
    let p = this.header(type, D.INT32, 4 * values.length);
    for (const v of values) {
      this.view.setInt32(p, v);
      p += 4;
    }
    this.at = p;
    return this;
  }

  real8(type: number, values: number[]): this {
    const p = this.header(type, D.REAL8, 8 * values.length);
    values.forEach((v, i) => encodeReal8(v, this.buf, p + 8 * i));
    this.at = p + 8 * values.length;
    return this;
  }

  ascii(type: number, text: string): this {
    const padded = text.length % 2 === 1 ? text.length + 1 : text.length; // records have even lengths
    let p = this.header(type, D.ASCII, padded);
    for (let i = 0; i < text.length; i++) this.buf[p++] = text.charCodeAt(i) & 0xff;
    if (padded > text.length) this.buf[p++] = 0;
    this.at = p;
    return this;
  }

  /** Any bytes at all, for tests of damaged files. */
  raw(bytes: ArrayLike<number>): this {
    this.reserve(bytes.length);
    this.buf.set(bytes, this.at);
    this.at += bytes.length;
    return this;
  }

  bytes(): Uint8Array {
    return this.buf.slice(0, this.at);
  }
}

// Fixed timestamps keep the output reproducible: 2024-01-01 00:00:00, twice (modified, accessed).
const STAMP = [2024, 1, 1, 0, 0, 0, 2024, 1, 1, 0, 0, 0];

export function writeLayout(lib: GdsLibrary): Uint8Array {
  const w = new RecordWriter();
  w.int16(R.HEADER, [600]).int16(R.BGNLIB, STAMP).ascii(R.LIBNAME, lib.libName);
  w.real8(R.UNITS, [lib.userUnitsPerDbUnit, lib.metersPerDbUnit]);
  for (const s of lib.structures) {
    w.int16(R.BGNSTR, STAMP).ascii(R.STRNAME, s.name);
    for (const e of s.elements) writeElement(w, e);
    w.none(R.ENDSTR);
  }
  w.none(R.ENDLIB);
  return w.bytes();
}

function writeElement(w: RecordWriter, e: GdsElement): void {
  switch (e.kind) {
    case "boundary": {
      const pts = closed(e.points);
      w.none(R.BOUNDARY).int16(R.LAYER, [e.layer]).int16(R.DATATYPE, [e.datatype]).int32(R.XY, pts);
      break;
    }
    case "path":
      w.none(R.PATH).int16(R.LAYER, [e.layer]).int16(R.DATATYPE, [e.datatype]);
      if (e.pathtype !== undefined) w.int16(R.PATHTYPE, [e.pathtype]);
      w.int32(R.WIDTH, [e.width]);
      if (e.pathtype === 4) w.int32(R.BGNEXTN, [e.bgnExtn ?? 0]).int32(R.ENDEXTN, [e.endExtn ?? 0]);
      w.int32(R.XY, e.points);
      break;
    case "box":
      w.none(R.BOX).int16(R.LAYER, [e.layer]).int16(R.BOXTYPE, [e.boxtype]);
      w.int32(R.XY, [e.x0, e.y0, e.x1, e.y0, e.x1, e.y1, e.x0, e.y1, e.x0, e.y0]);
      break;
    case "node":
      w.none(R.NODE).int16(R.LAYER, [e.layer]).int16(R.NODETYPE, [e.nodetype]).int32(R.XY, e.points);
      break;
    case "text":
      w.none(R.TEXT).int16(R.LAYER, [e.layer]).int16(R.TEXTTYPE, [e.texttype]).int32(R.XY, [e.x, e.y]).ascii(R.STRING, e.text);
      break;
    case "sref":
      w.none(R.SREF).ascii(R.SNAME, e.cell);
      writeStrans(w, e);
      w.int32(R.XY, [e.x, e.y]);
      break;
    case "aref":
      w.none(R.AREF).ascii(R.SNAME, e.cell);
      writeStrans(w, e);
      w.int16(R.COLROW, [e.cols, e.rows]);
      w.int32(R.XY, [
        e.x, e.y,
        e.x + e.cols * e.colStep[0], e.y + e.cols * e.colStep[1],
        e.x + e.rows * e.rowStep[0], e.y + e.rows * e.rowStep[1],
      ]);
      break;
  }
  w.none(R.ENDEL);
}

function writeStrans(w: RecordWriter, p: Placement): void {
  const mag = p.mag ?? 1;
  const angle = p.angle ?? 0;
  if (!p.reflect && mag === 1 && angle === 0) return;
  w.int16(R.STRANS, [p.reflect ? STRANS_REFLECT : 0], D.BITARRAY);
  if (mag !== 1) w.real8(R.MAG, [mag]);
  if (angle !== 0) w.real8(R.ANGLE, [angle]);
}

function closed(points: number[]): number[] {
  const n = points.length;
  if (n >= 2 && points[0] === points[n - 2] && points[1] === points[n - 1]) return points;
  return [...points, points[0], points[1]];
}

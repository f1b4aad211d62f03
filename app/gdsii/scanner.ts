import { GdsiiError } from "./errors";
import { addBox, addPoint, emptyBox, type Box } from "./geometry";
import { readReal8 } from "./real8";
import { LAST_RECORD_TYPE, RecordType as R, recordTypeName, STRANS_ABS_ANGLE, STRANS_ABS_MAG, STRANS_REFLECT } from "./records";
import type { ReadLimits } from "./summary";

/**
 * The record walker: consumes complete records from byte chunks and keeps only per-structure
 * summaries (own bounding boxes, one entry per distinct kind of placement, labels). Records may
 * arrive split across chunks; `scan` returns where the first incomplete record starts.
 */

/** All placements of one child with one orientation and magnification inside one parent. */
export interface PlacementClass {
  child: number;
  reflect: boolean;
  mag: number;
  angle: number;
  /** Members placed (AREF columns × rows summed). */
  count: number;
  /** Box of all placement origins, in database units. */
  origins: Box;
}

export interface RawLabel {
  text: string;
  layer: number;
  texttype: number;
  x: number;
  y: number;
}

export interface StructureState {
  name: string;
  defined: boolean;
  definedAt: number;
  firstReferencedAt: number;
  own: Box;
  ownByLayer: Map<number, Box>;
  classes: PlacementClass[];
  classByKey: Map<number | string, PlacementClass>;
  labels: RawLabel[];
  droppedPlacements: number;
}

export interface CollectedPlacements {
  parent: number[];
  klass: PlacementClass[];
  /** x0, y0, x1, y1 of placement origins (database units), 4 per placement. */
  origins: number[];
  count: number[];
}

const NO_ELEMENT = -1;
const FNV_OFFSET = 0x811c9dc5;

export class RecordScanner {
  libName = "";
  userUnitsPerDbUnit = NaN;
  metersPerDbUnit = NaN;
  sawHeader = false;
  ended = false;
  records = 0;
  readonly structures: StructureState[] = [];
  readonly layers = new Set<number>();
  labelCount = 0;
  labelsTruncated = false;
  classCount = 0;
  /**
   * Placements (SREF, AREF) whose STRANS sets absolute magnification or absolute angle. Their cell's transform would
   * not compose with the placements above it, so the boxes below assume it does; the layout check refuses them.
   */
  readonly absolute = { placements: 0, magnification: false, angle: false, cells: new Set<number>() };
  readonly collected: CollectedPlacements | null;

  /** Open-addressing hash table of structure names: slot → structure index + 1 (0: empty), linear probing. */
  private slots = new Int32Array(256);
  private readonly nameHashes: number[] = [];
  private readonly nameBytes: Uint8Array[] = [];
  private current: StructureState | null = null;
  private currentIndex = -1;

  // The element being read; fields are reset at every element start.
  private element = NO_ELEMENT;
  private elementAt = 0;
  private layer = 0;
  private datatype = 0;
  private width = 0;
  private pathtype = 0;
  private bgnExtn = 0;
  private endExtn = 0;
  private reflect = false;
  private absoluteBits = 0;
  private mag = 1;
  private angle = 0;
  private cols = 0;
  private rows = 0;
  private sname = -1;
  private xyCount = 0;
  private xy = [0, 0, 0, 0, 0, 0];
  private text: string | null = null;

  constructor(
    private readonly limits: ReadLimits,
    private readonly collectLimit: number,
  ) {
    this.collected = collectLimit > 0 ? { parent: [], klass: [], origins: [], count: [] } : null;
  }

  /** Walks the complete records in buf[start, end); `base` is the file offset of buf[0]. */
  scan(buf: Uint8Array, view: DataView, start: number, end: number, base: number): number {
    let pos = start;
    const maxRecords = this.limits.maxRecords;
    let records = this.records;
    while (!this.ended && pos + 4 <= end) {
      const len = (buf[pos] << 8) | buf[pos + 1];
      if (len < 4 || (len & 1) !== 0) {
        throw new GdsiiError(
          len === 0
            ? "a record has length 0 (every record is at least its 4 header bytes): the file is damaged or not GDSII"
            : `a record has length ${len}, which is ${len < 4 ? "shorter than its 4-byte header" : "odd"}: the file is damaged or not GDSII`,
          base + pos,
        );
      }
      if (pos + len > end) break;
      if (++records > maxRecords) {
        this.records = records;
        throw new GdsiiError(`the file holds more than ${maxRecords} records, the limit`, base + pos);
      }
      this.records = records;
      // The records of a placed design's paths and placements, by far the most common ones, are handled here
      // without a call to record(): the same checks and fields as its cases. Everything else, and anything before
      // the header, goes there.
      const type = this.sawHeader ? buf[pos + 2] : -1;
      const size = len - 4;
      const at = base + pos;
      switch (type) {
        case R.LAYER:
          if (size < 2) need(size, 2, "LAYER", at);
          this.layer = (buf[pos + 4] << 8) | buf[pos + 5];
          break;
        case R.DATATYPE:
          if (size < 2) need(size, 2, "DATATYPE", at);
          this.datatype = (buf[pos + 4] << 8) | buf[pos + 5];
          break;
        case R.PATHTYPE:
          if (size < 2) need(size, 2, "PATHTYPE", at);
          this.pathtype = view.getInt16(pos + 4);
          break;
        case R.WIDTH:
          if (size < 4) need(size, 4, "WIDTH", at);
          this.width = Math.abs(view.getInt32(pos + 4)); // negative = absolute width; same extent here
          break;
        case R.XY:
          this.readXy(view, pos + 4, size, at);
          break;
        case R.ENDEL:
          this.endElement(at);
          break;
        case R.PATH:
        case R.SREF:
          this.startElement(type, at);
          break;
        case R.SNAME:
          this.inElement("SNAME", at);
          this.sname = this.lookupName(buf, pos + 4, size, at);
          break;
        default:
          this.record(buf, view, pos, len, base);
      }
      pos += len;
    }
    return this.ended ? end : pos;
  }

  private record(buf: Uint8Array, view: DataView, pos: number, len: number, base: number): void {
    const type = buf[pos + 2];
    const at = base + pos;
    const data = pos + 4;
    const size = len - 4;
    if (!this.sawHeader) {
      if (type !== R.HEADER) throw new GdsiiError("the file does not start with a GDSII HEADER record: not a GDSII stream", at);
      this.sawHeader = true;
      return;
    }
    // The most common records (LAYER, DATATYPE, WIDTH, PATHTYPE, XY, ENDEL, PATH, SREF, SNAME) are handled in scan().
    switch (type) {
      case R.LIBNAME:
        this.libName = latin1(buf, data, size);
        return;
      case R.UNITS:
        need(size, 16, "UNITS", at);
        this.userUnitsPerDbUnit = readReal8(view, data);
        this.metersPerDbUnit = readReal8(view, data + 8);
        if (!(this.metersPerDbUnit > 0) || !(this.userUnitsPerDbUnit > 0)) {
          throw new GdsiiError("UNITS must give a positive size of the database unit", at);
        }
        return;
      case R.BGNSTR:
        if (this.current) throw new GdsiiError(`structure ${this.current.name} has no ENDSTR before the next BGNSTR`, at);
        this.current = placeholder(at);
        return;
      case R.STRNAME:
        this.defineStructure(buf, data, size, at);
        return;
      case R.ENDSTR:
        if (!this.current) throw new GdsiiError("ENDSTR without a structure", at);
        if (this.element !== NO_ELEMENT) throw new GdsiiError(`structure ${this.current.name} ends inside an element`, at);
        this.current = null;
        return;
      case R.ENDLIB:
        if (this.current) throw new GdsiiError(`the library ends inside structure ${this.current.name}`, at);
        this.ended = true;
        return;
      case R.BOUNDARY:
      case R.AREF:
      case R.TEXT:
      case R.NODE:
      case R.BOX:
        this.startElement(type, at);
        return;
      case R.TEXTTYPE:
      case R.BOXTYPE:
      case R.NODETYPE:
        need(size, 2, recordTypeName(type), at);
        this.datatype = view.getUint16(data);
        return;
      case R.BGNEXTN:
        need(size, 4, "BGNEXTN", at);
        this.bgnExtn = view.getInt32(data);
        return;
      case R.ENDEXTN:
        need(size, 4, "ENDEXTN", at);
        this.endExtn = view.getInt32(data);
        return;
      case R.STRANS: {
        need(size, 2, "STRANS", at);
        const bits = view.getUint16(data);
        this.reflect = (bits & STRANS_REFLECT) !== 0;
        this.absoluteBits = bits & (STRANS_ABS_MAG | STRANS_ABS_ANGLE);
        return;
      }
      case R.MAG:
        need(size, 8, "MAG", at);
        this.mag = readReal8(view, data);
        if (!(this.mag > 0)) throw new GdsiiError(`MAG ${this.mag} is not a positive magnification`, at);
        return;
      case R.ANGLE:
        need(size, 8, "ANGLE", at);
        this.angle = readReal8(view, data);
        if (!Number.isFinite(this.angle)) throw new GdsiiError("ANGLE is not a finite number", at);
        return;
      case R.COLROW:
        need(size, 4, "COLROW", at);
        this.cols = view.getInt16(data);
        this.rows = view.getInt16(data + 2);
        if (this.cols < 1 || this.rows < 1) {
          throw new GdsiiError(`an AREF needs at least 1 column and 1 row, not ${this.cols} × ${this.rows}`, at);
        }
        return;
      case R.STRING:
        this.inElement("STRING", at);
        this.text = latin1(buf, data, size);
        return;
      default:
        if (type > LAST_RECORD_TYPE) {
          throw new GdsiiError(`unknown record type 0x${type.toString(16).padStart(2, "0")}: not in the GDSII Stream Format Manual 6.0`, at);
        }
      // Every other record of the manual (dates, fonts, properties, plex, flags…) carries nothing a check needs.
    }
  }

  private defineStructure(buf: Uint8Array, data: number, size: number, at: number): void {
    const cur = this.current;
    if (!cur || cur.defined || cur.name !== "") throw new GdsiiError("STRNAME outside a BGNSTR header", at);
    const index = this.lookupName(buf, data, size, at);
    const s = this.structures[index];
    if (s.defined) throw new GdsiiError(`structure ${s.name} is defined twice`, at);
    s.defined = true;
    s.definedAt = cur.definedAt;
    this.current = s;
    this.currentIndex = index;
  }

  private startElement(type: number, at: number): void {
    if (!this.current || !this.current.defined) throw new GdsiiError(`${recordTypeName(type)} element outside a structure`, at);
    if (this.element !== NO_ELEMENT) {
      throw new GdsiiError(`${recordTypeName(type)} starts before the ${recordTypeName(this.element)} element ended (ENDEL missing)`, at);
    }
    this.element = type;
    this.elementAt = at;
    this.layer = 0;
    this.datatype = 0;
    this.width = 0;
    this.pathtype = 0;
    this.bgnExtn = 0;
    this.endExtn = 0;
    this.reflect = false;
    this.absoluteBits = 0;
    this.mag = 1;
    this.angle = 0;
    this.cols = 0;
    this.rows = 0;
    this.sname = -1;
    this.xyCount = -1;
    this.text = null;
  }

  private inElement(what: string, at: number): void {
    if (this.element === NO_ELEMENT) throw new GdsiiError(`${what} outside an element`, at);
  }

  private readXy(view: DataView, data: number, size: number, at: number): void {
    this.inElement("XY", at);
    if (size % 8 !== 0 || size === 0) throw new GdsiiError(`XY holds ${size} bytes, not a whole number of points`, at);
    const n = size / 8;
    const type = this.element;
    if (type === R.SREF || type === R.TEXT || type === R.AREF) {
      const wanted = type === R.AREF ? 3 : 1;
      if (n !== wanted) throw new GdsiiError(`${recordTypeName(type)} needs ${wanted} XY point${wanted > 1 ? "s" : ""}, not ${n}`, at);
      for (let i = 0; i < 2 * n; i++) this.xy[i] = view.getInt32(data + 4 * i);
      this.xyCount = n;
      return;
    }
    this.xyCount = n;
    if (type === R.NODE) return; // electrical connectivity only: no geometry
    const own = this.current!.own;
    const box = this.layerBox();
    if (type === R.PATH) {
      pathBounds(view, data, n, this.width / 2, this.pathtype, this.bgnExtn, this.endExtn, own, box);
      return;
    }
    for (let i = 0; i < n; i++) {
      const x = view.getInt32(data + 8 * i);
      const y = view.getInt32(data + 8 * i + 4);
      addPoint(own, x, y);
      addPoint(box, x, y);
    }
  }

  private lastLayerKey = -1;
  private lastLayerOwner: StructureState | null = null;
  private lastLayerBox: Box = emptyBox();

  private layerBox(): Box {
    const key = this.layer * 65536 + this.datatype;
    const cur = this.current!;
    if (key === this.lastLayerKey && cur === this.lastLayerOwner) return this.lastLayerBox;
    this.layers.add(key);
    let box = cur.ownByLayer.get(key);
    if (!box) {
      box = emptyBox();
      cur.ownByLayer.set(key, box);
    }
    this.lastLayerKey = key;
    this.lastLayerOwner = cur;
    this.lastLayerBox = box;
    return box;
  }

  private endElement(at: number): void {
    const type = this.element;
    if (type === NO_ELEMENT) throw new GdsiiError("ENDEL without an element", at);
    if (this.xyCount < 0) throw new GdsiiError(`${recordTypeName(type)} element without XY`, this.elementAt);
    this.element = NO_ELEMENT;
    const cur = this.current!;
    if (type === R.TEXT) {
      const box = this.layerBox();
      const x = this.xy[0];
      const y = this.xy[1];
      addPoint(cur.own, x, y);
      addPoint(box, x, y);
      if (this.labelCount >= this.limits.maxLabels) this.labelsTruncated = true;
      else {
        this.labelCount++;
        cur.labels.push({ text: this.text ?? "", layer: this.layer, texttype: this.datatype, x, y });
      }
      return;
    }
    if (type !== R.SREF && type !== R.AREF) return;
    if (this.sname < 0) throw new GdsiiError(`${recordTypeName(type)} element without SNAME`, this.elementAt);
    if (this.absoluteBits !== 0) {
      const abs = this.absolute;
      abs.placements++;
      if (this.absoluteBits & STRANS_ABS_MAG) abs.magnification = true;
      if (this.absoluteBits & STRANS_ABS_ANGLE) abs.angle = true;
      abs.cells.add(this.currentIndex);
    }
    const xy = this.xy;
    let count = 1;
    // The box of the placement origins, kept in four numbers (no array per placement).
    let ox0 = xy[0];
    let oy0 = xy[1];
    let ox1 = ox0;
    let oy1 = oy0;
    if (type === R.AREF) {
      if (this.cols === 0) throw new GdsiiError("AREF element without COLROW", this.elementAt);
      const c = this.cols;
      const r = this.rows;
      count = c * r;
      // Lattice corners: origin + (c-1)·column step and + (r-1)·row step; the others lie between them.
      const cx = ((xy[2] - xy[0]) / c) * (c - 1);
      const cy = ((xy[3] - xy[1]) / c) * (c - 1);
      const rx = ((xy[4] - xy[0]) / r) * (r - 1);
      const ry = ((xy[5] - xy[1]) / r) * (r - 1);
      for (const [x, y] of [[xy[0] + cx, xy[1] + cy], [xy[0] + rx, xy[1] + ry], [xy[0] + cx + rx, xy[1] + cy + ry]]) {
        if (x < ox0) ox0 = x;
        if (y < oy0) oy0 = y;
        if (x > ox1) ox1 = x;
        if (y > oy1) oy1 = y;
      }
    }
    const angle = ((this.angle % 360) + 360) % 360;
    // Numeric keys for the Manhattan orientations at unit magnification, which are nearly all placements.
    const quarter = angle / 90;
    const key: number | string =
      this.mag === 1 && Number.isInteger(quarter)
        ? this.sname * 8 + quarter * 2 + (this.reflect ? 1 : 0)
        : `${this.sname}|${this.reflect ? 1 : 0}|${this.mag}|${angle}`;
    let klass = cur.classByKey.get(key);
    if (!klass) {
      if (++this.classCount > this.limits.maxPlacementClasses) {
        throw new GdsiiError(`more than ${this.limits.maxPlacementClasses} distinct placements (cell, angle, magnification), the limit`, at);
      }
      klass = { child: this.sname, reflect: this.reflect, mag: this.mag, angle, count: 0, origins: emptyBox() };
      cur.classByKey.set(key, klass);
      cur.classes.push(klass);
    }
    klass.count += count;
    const o = klass.origins;
    if (ox0 < o[0]) o[0] = ox0;
    if (oy0 < o[1]) o[1] = oy0;
    if (ox1 > o[2]) o[2] = ox1;
    if (oy1 > o[3]) o[3] = oy1;
    const col = this.collected;
    if (col) {
      if (col.count.length < this.collectLimit) {
        col.parent.push(this.currentIndex);
        col.klass.push(klass);
        col.origins.push(ox0, oy0, ox1, oy1);
        col.count.push(count);
      } else cur.droppedPlacements++;
    }
  }

  /** Name → structure index without decoding the bytes again for names already seen. */
  private lookupName(buf: Uint8Array, data: number, size: number, at: number): number {
    let n = size;
    while (n > 0 && buf[data + n - 1] === 0) n--;
    if (n === 0) throw new GdsiiError("a structure name is empty", at);
    let h = FNV_OFFSET;
    for (let i = 0; i < n; i++) h = Math.imul(h ^ buf[data + i], 0x01000193);
    const slots = this.slots;
    const mask = slots.length - 1;
    let slot = h & mask;
    for (let v = slots[slot]; v !== 0; v = slots[slot]) {
      const idx = v - 1;
      if (this.nameHashes[idx] === h && sameBytes(this.nameBytes[idx], buf, data, n)) return this.touch(idx, at);
      slot = (slot + 1) & mask;
    }
    if (this.structures.length >= this.limits.maxStructures) {
      throw new GdsiiError(`more than ${this.limits.maxStructures} structure names, the limit`, at);
    }
    const idx = this.structures.length;
    this.nameBytes.push(buf.slice(data, data + n));
    this.nameHashes.push(h);
    const s = placeholder(-1);
    s.name = latin1(buf, data, n);
    s.firstReferencedAt = this.element === NO_ELEMENT ? -1 : at;
    this.structures.push(s);
    slots[slot] = idx + 1;
    // At most half full, so a probe ends soon.
    if (2 * this.structures.length > slots.length) this.growSlots();
    return idx;
  }

  private growSlots(): void {
    const slots = new Int32Array(this.slots.length * 2);
    const mask = slots.length - 1;
    for (let idx = 0; idx < this.nameHashes.length; idx++) {
      let slot = this.nameHashes[idx] & mask;
      while (slots[slot] !== 0) slot = (slot + 1) & mask;
      slots[slot] = idx + 1;
    }
    this.slots = slots;
  }

  private touch(idx: number, at: number): number {
    const s = this.structures[idx];
    if (s.firstReferencedAt < 0 && this.element !== NO_ELEMENT) s.firstReferencedAt = at;
    return idx;
  }
}

function placeholder(definedAt: number): StructureState {
  return {
    name: "",
    defined: false,
    definedAt,
    firstReferencedAt: -1,
    own: emptyBox(),
    ownByLayer: new Map(),
    classes: [],
    classByKey: new Map(),
    labels: [],
    droppedPlacements: 0,
  };
}

function need(size: number, bytes: number, what: string, at: number): void {
  if (size < bytes) throw new GdsiiError(`${what} record holds ${size} bytes, it needs ${bytes}`, at);
}

function sameBytes(a: Uint8Array, buf: Uint8Array, at: number, n: number): boolean {
  if (a.length !== n) return false;
  for (let i = 0; i < n; i++) if (a[i] !== buf[at + i]) return false;
  return true;
}

function latin1(buf: Uint8Array, at: number, size: number): string {
  let n = size;
  while (n > 0 && buf[at + n - 1] === 0) n--;
  let s = "";
  for (let i = 0; i < n; i++) s += String.fromCharCode(buf[at + i]);
  return s;
}

/**
 * Bounding box of a path outline: every segment as a rectangle of the path's width, ends extended
 * by the pathtype (0 flush, 1 round and 2 square by half the width, 4 by BGNEXTN/ENDEXTN) and inner
 * vertices by half the width, which covers the corner of a Manhattan bend exactly.
 */
const scratch: Box = [0, 0, 0, 0];

function pathBounds(
  view: DataView, data: number, n: number, hw: number, pathtype: number, bgn: number, end: number, own: Box, layer: Box,
): void {
  const capBegin = pathtype === 4 ? bgn : pathtype === 0 ? 0 : hw;
  const capEnd = pathtype === 4 ? end : pathtype === 0 ? 0 : hw;
  let px = view.getInt32(data);
  let py = view.getInt32(data + 4);
  const b = scratch;
  b[0] = b[1] = Infinity;
  b[2] = b[3] = -Infinity;
  for (let i = 1; i < n; i++) {
    const qx = view.getInt32(data + 8 * i);
    const qy = view.getInt32(data + 8 * i + 4);
    const dx = qx - px;
    const dy = qy - py;
    const e0 = i === 1 ? capBegin : hw;
    const e1 = i === n - 1 ? capEnd : hw;
    if (dy === 0 && dx !== 0) {
      const sx = dx > 0 ? 1 : -1;
      addPoint(b, px - sx * e0, py - hw);
      addPoint(b, qx + sx * e1, qy + hw);
    } else if (dx === 0 && dy !== 0) {
      const sy = dy > 0 ? 1 : -1;
      addPoint(b, px - hw, py - sy * e0);
      addPoint(b, qx + hw, qy + sy * e1);
    } else if (dx !== 0) {
      const length = Math.sqrt(dx * dx + dy * dy);
      const ux = dx / length;
      const uy = dy / length;
      const ax = px - ux * e0;
      const ay = py - uy * e0;
      const bx = qx + ux * e1;
      const by = qy + uy * e1;
      const nx = -uy * hw;
      const ny = ux * hw;
      addPoint(b, ax + nx, ay + ny);
      addPoint(b, ax - nx, ay - ny);
      addPoint(b, bx + nx, by + ny);
      addPoint(b, bx - nx, by - ny);
    }
    px = qx;
    py = qy;
  }
  if (b[0] > b[2]) {
    // A single point, or only zero-length segments: a square of the path's width.
    addPoint(b, px - hw, py - hw);
    addPoint(b, px + hw, py + hw);
  }
  addBox(own, b);
  addBox(layer, b);
}

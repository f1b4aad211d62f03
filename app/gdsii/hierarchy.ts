import { GdsiiError } from "./errors";
import { addBox, emptyBox, isEmpty, transformBox, type Box } from "./geometry";
import type { RecordScanner, StructureState } from "./scanner";
import type { BoxUm, CellSummary, LayoutSummary, ReadLimits, TopPlacements } from "./summary";

/**
 * Turns the scanner's per-structure summaries into the library's figures. Everything here walks
 * the hierarchy iteratively in topological order, so a 10,000-deep chain cannot overflow a stack,
 * and counts are BigInt so arrays of arrays cannot overflow.
 */
export function summarize(scan: RecordScanner, limits: ReadLimits): LayoutSummary {
  const structs = scan.structures;
  const n = structs.length;
  checkDefined(structs);
  if (n === 0) throw new GdsiiError("the library holds no structure");
  if (!(scan.metersPerDbUnit > 0)) throw new GdsiiError("the library has no UNITS record");

  const children = uniqueChildren(structs);
  const order = topologicalOrder(structs, children);
  const depth = longestChain(order, children, limits);

  // Boxes are kept per layer, as KLayout does, so that a cell rotated by an arbitrary angle is bounded
  // by its rotated layer boxes rather than by its rotated overall box, which would be looser.
  const layerBoxes: Map<number, Box>[] = new Array(n);
  const boxes: Box[] = new Array(n);
  for (let k = n - 1; k >= 0; k--) {
    const i = order[k];
    const s = structs[i];
    const mine = new Map<number, Box>();
    for (const [key, b] of s.ownByLayer) mine.set(key, [b[0], b[1], b[2], b[3]]);
    for (const c of s.classes) {
      for (const [key, child] of layerBoxes[c.child]) {
        const t = transformBox(child, c.reflect, c.mag, c.angle);
        const placed: Box = [t[0] + c.origins[0], t[1] + c.origins[1], t[2] + c.origins[2], t[3] + c.origins[3]];
        const acc = mine.get(key);
        if (acc) addBox(acc, placed);
        else mine.set(key, placed);
      }
    }
    const box = emptyBox();
    for (const b of mine.values()) addBox(box, b);
    layerBoxes[i] = mine;
    boxes[i] = box;
  }

  const referenced = new Uint8Array(n);
  for (const list of children) for (const c of list) referenced[c] = 1;
  const tops: number[] = [];
  for (let i = 0; i < n; i++) if (!referenced[i]) tops.push(i);
  const top = tops.reduce((best, i) => (area(boxes[i]) > area(boxes[best]) ? i : best), tops[0]);

  // 1e-9 m × 1e6 is 0.0009999999999999998 in binary; 15 digits give the intended 0.001 back.
  const um = Number((scan.metersPerDbUnit * 1e6).toPrecision(15));
  const multiplicity: bigint[] = new Array(n).fill(0n);
  multiplicity[top] = 1n;
  for (const i of order) {
    const m = multiplicity[i];
    if (m === 0n) continue;
    for (const c of structs[i].classes) multiplicity[c.child] += m * BigInt(c.count);
  }
  const instances: Record<string, number> = {};
  let exact = true;
  for (let i = 0; i < n; i++) {
    if (i === top || multiplicity[i] === 0n) continue;
    const v = Number(multiplicity[i]);
    if (!Number.isSafeInteger(v)) exact = false;
    instances[structs[i].name] = v;
  }

  const cells: Record<string, CellSummary> = {};
  for (let i = 0; i < n; i++) cells[structs[i].name] = { bboxUm: toUm(boxes[i], um), leaf: structs[i].classes.length === 0 };

  const topState = structs[top];
  const summary: LayoutSummary = {
    libName: scan.libName,
    units: { userUnitsPerDbUnit: scan.userUnitsPerDbUnit, metersPerDbUnit: scan.metersPerDbUnit },
    topCells: tops.map((i) => structs[i].name).sort(),
    topCell: topState.name,
    bboxUm: toUm(boxes[top], um),
    instances,
    instanceCountsExact: exact,
    labels: topState.labels.map((l) => ({ text: l.text, layer: l.layer, texttype: l.texttype, xUm: l.x * um, yUm: l.y * um })),
    labelsTruncated: scan.labelsTruncated,
    absoluteTransforms: {
      placements: scan.absolute.placements,
      magnification: scan.absolute.magnification,
      angle: scan.absolute.angle,
      cells: [...scan.absolute.cells].map((i) => structs[i].name).sort(),
    },
    layers: [...scan.layers].sort((a, b) => a - b).map((k) => ({ layer: Math.floor(k / 65536), datatype: k % 65536 })),
    topCellLayers: [...topState.ownByLayer.entries()]
      .sort((a, b) => a[0] - b[0])
      .map(([k, b]) => ({ layer: Math.floor(k / 65536), datatype: k % 65536, bboxUm: toUm(b, um)! })),
    cells,
    structureCount: n,
    recordCount: scan.records,
    depth,
  };
  if (scan.collected) summary.placements = topPlacements(scan, top, boxes, layerBoxes, um);
  return summary;
}

function checkDefined(structs: StructureState[]): void {
  for (const s of structs) {
    if (!s.defined) throw new GdsiiError(`a placement refers to structure ${s.name}, which the library does not define`, s.firstReferencedAt);
  }
}

function uniqueChildren(structs: StructureState[]): number[][] {
  const seen = new Int32Array(structs.length).fill(-1);
  return structs.map((s, i) => {
    const list: number[] = [];
    for (const c of s.classes) {
      if (seen[c.child] === i) continue;
      seen[c.child] = i;
      list.push(c.child);
    }
    return list;
  });
}

/** Kahn's algorithm: parents before children; anything left over sits on a cycle. */
function topologicalOrder(structs: StructureState[], children: number[][]): number[] {
  const n = structs.length;
  const indegree = new Uint32Array(n);
  for (const list of children) for (const c of list) indegree[c]++;
  const order: number[] = [];
  for (let i = 0; i < n; i++) if (indegree[i] === 0) order.push(i);
  for (let k = 0; k < order.length; k++) {
    for (const c of children[order[k]]) if (--indegree[c] === 0) order.push(c);
  }
  if (order.length === n) return order;
  // Walk from a leftover structure along leftover children until a structure repeats.
  let at = indegree.findIndex((d) => d > 0);
  const step = new Int32Array(n).fill(-1);
  const path: number[] = [];
  while (step[at] < 0) {
    step[at] = path.length;
    path.push(at);
    at = children[at].find((c) => indegree[c] > 0)!;
  }
  const cycle = path.slice(step[at]).map((i) => structs[i].name);
  const s = structs[at];
  if (cycle.length === 1) throw new GdsiiError(`structure ${s.name} places itself, so its hierarchy never ends`, s.definedAt);
  throw new GdsiiError(`structures place each other in a cycle: ${[...cycle, cycle[0]].join(" → ")}`, s.definedAt);
}

function longestChain(order: number[], children: number[][], limits: ReadLimits): number {
  const depth = new Uint32Array(order.length);
  let deepest = 0;
  for (const i of order) {
    const d = depth[i] + 1;
    for (const c of children[i]) {
      if (d > depth[c]) {
        depth[c] = d;
        if (d > deepest) deepest = d;
        if (d > limits.maxDepth) throw new GdsiiError(`the hierarchy is more than ${limits.maxDepth} levels deep, the limit`);
      }
    }
  }
  return deepest;
}

function area(b: Box): number {
  return isEmpty(b) ? -1 : (b[2] - b[0]) * (b[3] - b[1]);
}

function toUm(b: Box, um: number): BoxUm | null {
  return isEmpty(b) ? null : [b[0] * um, b[1] * um, b[2] * um, b[3] * um];
}

function topPlacements(scan: RecordScanner, top: number, boxes: Box[], layerBoxes: Map<number, Box>[], um: number): TopPlacements {
  const col = scan.collected!;
  const names: string[] = [];
  const nameIndex = new Map<number, number>();
  const picked: number[] = [];
  for (let k = 0; k < col.parent.length; k++) if (col.parent[k] === top && !isEmpty(boxes[col.klass[k].child])) picked.push(k);
  const cell = new Uint32Array(picked.length);
  const boxUm = new Float64Array(picked.length * 4);
  const count = new Float64Array(picked.length);
  const transformed = new Map<object, Box>();
  picked.forEach((k, j) => {
    const c = col.klass[k];
    let t = transformed.get(c);
    if (!t) {
      t = emptyBox();
      for (const b of layerBoxes[c.child].values()) addBox(t, transformBox(b, c.reflect, c.mag, c.angle));
      transformed.set(c, t);
    }
    let ni = nameIndex.get(c.child);
    if (ni === undefined) {
      ni = names.length;
      names.push(scan.structures[c.child].name);
      nameIndex.set(c.child, ni);
    }
    cell[j] = ni;
    const o = 4 * k;
    boxUm[4 * j] = (t[0] + col.origins[o]) * um;
    boxUm[4 * j + 1] = (t[1] + col.origins[o + 1]) * um;
    boxUm[4 * j + 2] = (t[2] + col.origins[o + 2]) * um;
    boxUm[4 * j + 3] = (t[3] + col.origins[o + 3]) * um;
    count[j] = col.count[k];
  });
  return { cellNames: names, cell, boxUm, count, length: picked.length, truncated: scan.structures[top].droppedPlacements > 0 };
}

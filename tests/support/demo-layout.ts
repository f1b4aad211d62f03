import { DEMO_RULESET, type Ruleset } from "~/rules/ruleset";
import { DIE_OUTLINE_LAYER } from "~/gdsii/conventions";
import { writeLayout, type GdsElement, type GdsLibrary, type GdsStructure } from "~/gdsii/writer";

/**
 * An invented standard-cell style layout for demo entries and tests: a die of the ruleset's tile
 * shape, rows of placed cells of Gatecrash's own invented library, fill arrays, and a pin label on
 * the pin layer at the die edge for every pin (bit) of the pin list. Database unit: 1 nm.
 */
export class DemoLayoutError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "DemoLayoutError";
  }
}

export interface DemoLayoutBreaks {
  /** Die one tile wider than maxTiles allows. */
  tooBig?: boolean;
  /** Leave out the label of this pin (true: the first output pin). */
  missingPin?: string | true;
  /** Place a memory macro, gc_sram_64x8. */
  forbiddenCell?: boolean;
  /** A shape sticking 5 µm out of the die on the right. */
  outsideBoundary?: boolean;
  /** Place more flip-flops than the budget (budget + 10 %, or 4× flipFlops when there is no budget). */
  tooManyFlipFlops?: boolean;
}

export interface DemoLayoutOptions {
  ruleset?: Ruleset;
  /** The name of one of the ruleset's tile shapes, e.g. "single" or "wide" (default: its first). */
  shape?: string;
  flipFlops?: number;
  logicCells?: number;
  seed?: number;
  /** One routing path per placed cell, to make files heavier (benchmarks). */
  wiresPerCell?: number;
  libName?: string;
  /** The design's top-level ports, labelled at the die edge (default: the ruleset's pin list). */
  ports?: { name: string; width: number; direction?: string }[];
  /** Name of the top cell (default: the ruleset's top module). */
  topCell?: string;
  break?: DemoLayoutBreaks;
}

export interface DemoLayout {
  library: GdsLibrary;
  bytes: Uint8Array;
  /** What the generator placed, for tests and demo data. */
  facts: {
    topCell: string;
    dieUm: [number, number, number, number];
    flipFlops: number;
    logicCells: number;
    fillCells: number;
    labels: string[];
    cellCounts: Record<string, number>;
  };
}

const NM_PER_UM = 1000;
const ROW_HEIGHT = 2800;
const MARGIN = 4000;

interface LeafCell {
  name: string;
  width: number;
}

const FLIP_FLOPS: LeafCell[] = [
  { name: "gc_dff", width: 6400 },
  { name: "gc_dffr", width: 7200 },
];
const LOGIC: LeafCell[] = [
  { name: "gc_inv", width: 1200 },
  { name: "gc_nand2", width: 1600 },
  { name: "gc_nor2", width: 1600 },
  { name: "gc_and2", width: 2000 },
  { name: "gc_xor2", width: 2800 },
  { name: "gc_mux2", width: 3200 },
  { name: "gc_buf", width: 1600 },
];
const FILL: LeafCell = { name: "gc_fill", width: 400 };
const SRAM = { name: "gc_sram_64x8", width: 24000, height: 5 * ROW_HEIGHT };

// Invented layer numbers for the demo cells' insides.
const BODY_LAYER = 1;
const GATE_LAYER = 5;
const WIRE_LAYER = 11;

export function generateDemoLayout(opts: DemoLayoutOptions = {}): DemoLayout {
  const ruleset = opts.ruleset ?? DEMO_RULESET;
  const name = opts.shape ?? ruleset.tile.allowedShapes[0].name;
  const shape = ruleset.tile.allowedShapes.find((s) => s.name === name);
  if (!shape) throw new DemoLayoutError(`shape "${name}" is not one of the ruleset's: ${ruleset.tile.allowedShapes.map((s) => s.name).join(", ")}`);
  const broken = opts.break ?? {};
  let { cols, rows } = shape;
  if (broken.tooBig) cols = ruleset.tile.maxTiles + 1;
  const dieW = Math.round(cols * ruleset.tile.widthUm * NM_PER_UM);
  const dieH = Math.round(rows * ruleset.tile.heightUm * NM_PER_UM);
  let flipFlops = count(opts.flipFlops ?? 140, "flipFlops");
  const logicCells = count(opts.logicCells ?? 1800, "logicCells");
  if (broken.tooManyFlipFlops) {
    const budget = ruleset.flipFlopBudget;
    flipFlops = budget !== null ? budget + Math.max(1, Math.ceil(budget * 0.1)) : Math.max(1, flipFlops * 4);
  }
  const random = mulberry32(opts.seed ?? 1);
  const top = opts.topCell ?? ruleset.topModule;
  const topElements: GdsElement[] = [];
  const cellCounts: Record<string, number> = {};
  const bump = (name: string, n = 1) => (cellCounts[name] = (cellCounts[name] ?? 0) + n);

  topElements.push(rect(DIE_OUTLINE_LAYER.layer, DIE_OUTLINE_LAYER.datatype, 0, 0, dieW, dieH));

  // Shuffle flip-flops among logic so rows look like a placed design.
  const queue: LeafCell[] = [];
  for (let i = 0; i < flipFlops; i++) queue.push(FLIP_FLOPS[i % FLIP_FLOPS.length]);
  for (let i = 0; i < logicCells; i++) queue.push(LOGIC[Math.floor(random() * LOGIC.length)]);
  for (let i = queue.length - 1; i > 0; i--) {
    const j = Math.floor(random() * (i + 1));
    [queue[i], queue[j]] = [queue[j], queue[i]];
  }

  const rowCount = Math.floor((dieH - 2 * MARGIN) / ROW_HEIGHT);
  const rowEnd = dieW - MARGIN;
  let fillCells = 0;
  let next = 0;
  const wires = opts.wiresPerCell ?? 0;
  let sramSpot: { x: number; y: number } | null = null;
  for (let r = 0; r < rowCount; r++) {
    const y = MARGIN + r * ROW_HEIGHT;
    const flipped = r % 2 === 1; // every other row mirrored about its top edge, sharing power rails
    let x = MARGIN;
    if (broken.forbiddenCell && !sramSpot && r === 0) {
      sramSpot = { x, y };
    }
    const reserveUntil = sramSpot && r < 5 ? sramSpot.x + SRAM.width : 0;
    if (reserveUntil) x = reserveUntil;
    while (next < queue.length && x + queue[next].width <= rowEnd) {
      const cell = queue[next++];
      topElements.push(
        flipped
          ? { kind: "sref", cell: cell.name, x, y: y + ROW_HEIGHT, reflect: true }
          : { kind: "sref", cell: cell.name, x, y },
      );
      for (let k = 0; k < wires; k++) {
        const wy = y + 400 + ((k * 700) % (ROW_HEIGHT - 800));
        topElements.push({ kind: "path", layer: WIRE_LAYER, datatype: 0, width: 200, pathtype: 2, points: [x + 200, wy, x + cell.width - 200, wy, x + cell.width - 200, wy + 300] });
      }
      bump(cell.name);
      x += cell.width;
    }
    const gaps = Math.floor((rowEnd - x) / FILL.width);
    if (gaps > 0) {
      topElements.push(
        flipped
          ? { kind: "aref", cell: FILL.name, cols: gaps, rows: 1, x, y: y + ROW_HEIGHT, colStep: [FILL.width, 0], rowStep: [0, ROW_HEIGHT], reflect: true }
          : { kind: "aref", cell: FILL.name, cols: gaps, rows: 1, x, y, colStep: [FILL.width, 0], rowStep: [0, ROW_HEIGHT] },
      );
      fillCells += gaps;
      bump(FILL.name, gaps);
    }
  }
  if (next < queue.length) {
    throw new DemoLayoutError(
      `${queue.length} cells do not fit a ${cols}x${rows} die (${queue.length - next} left over): ask for fewer cells or a bigger shape`,
    );
  }
  if (sramSpot) {
    topElements.push({ kind: "sref", cell: SRAM.name, x: sramSpot.x, y: sramSpot.y });
    bump(SRAM.name);
  }
  if (broken.outsideBoundary) {
    topElements.push(rect(WIRE_LAYER, 0, dieW - 2000, dieH / 2, dieW + 5000, dieH / 2 + 1000));
  }

  const labels = pinLabels(opts.ports ?? ruleset.pins, broken.missingPin);
  const pinLayer = ruleset.pinLayer.layer;
  const pinType = ruleset.pinLayer.datatype ?? 0;
  const spacing = dieW / (labels.length + 1);
  labels.forEach((text, i) => {
    const x = Math.round(spacing * (i + 1));
    // Pins along the bottom edge: a small pad on the pin layer with its label on the edge.
    topElements.push(rect(pinLayer, pinType, x - 300, 0, x + 300, 600));
    topElements.push({ kind: "text", layer: pinLayer, texttype: pinType, x, y: 0, text });
  });

  const leaves = [...FLIP_FLOPS, ...LOGIC, FILL].filter((c) => cellCounts[c.name]);
  const structures: GdsStructure[] = leaves.map((c) => leafCell(c.name, c.width, ROW_HEIGHT));
  if (sramSpot) structures.push(leafCell(SRAM.name, SRAM.width, SRAM.height));
  structures.push({ name: top, elements: topElements });
  const library: GdsLibrary = { libName: opts.libName ?? "GATECRASH_DEMO", userUnitsPerDbUnit: 0.001, metersPerDbUnit: 1e-9, structures };
  return {
    library,
    bytes: writeLayout(library),
    facts: {
      topCell: top,
      dieUm: [0, 0, dieW / NM_PER_UM, dieH / NM_PER_UM],
      flipFlops,
      logicCells,
      fillCells,
      labels,
      cellCounts,
    },
  };
}

/** One label per bit: `name` for a 1-bit pin, `name[i]` for each bit of a bus. */
function pinLabels(ports: NonNullable<DemoLayoutOptions["ports"]>, missing: string | true | undefined): string[] {
  const skip = missing === true ? (ports.find((p) => p.direction === "output") ?? ports[0])?.name : missing;
  const out: string[] = [];
  for (const p of ports) {
    if (p.name === skip) continue;
    if (p.width === 1) out.push(p.name);
    else for (let i = 0; i < p.width; i++) out.push(`${p.name}[${i}]`);
  }
  return out;
}

function leafCell(name: string, width: number, height: number): GdsStructure {
  return {
    name,
    elements: [
      rect(BODY_LAYER, 0, 0, 0, width, height),
      rect(GATE_LAYER, 0, Math.round(width * 0.3), 300, Math.round(width * 0.3) + 150, height - 300),
    ],
  };
}

function rect(layer: number, datatype: number, x0: number, y0: number, x1: number, y1: number): GdsElement {
  return { kind: "boundary", layer, datatype, points: [x0, y0, x1, y0, x1, y1, x0, y1] };
}

function count(n: number, what: string): number {
  if (!Number.isInteger(n) || n < 0 || n > 10_000_000) throw new DemoLayoutError(`${what} must be a whole number from 0 to 10,000,000, not ${n}`);
  return n;
}

/** Small seeded generator (mulberry32) so demo layouts are reproducible. */
function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

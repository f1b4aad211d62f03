import { RE2JS } from "re2js";
import { z } from "zod";

/**
 * The ruleset of a competition: what an entry must obey to go on the shared chip.
 * Stored as JSON with a version. Only `topModule` and `pins` are required; every other
 * field falls back to the demo compo's values (DEMO_RULESET_DEFAULTS).
 * Version 2 names the tile shapes ({name, cols, rows}); a version 1 ruleset (shapes written "CxR") is
 * upgraded when it is read (upgradeRuleset), so stored rulesets stay valid.
 */
export const RULESET_VERSION = 2;

export const PIN_ROLES = ["clock", "reset", "red", "green", "blue", "hsync", "vsync", "audio", "unused"] as const;
export type PinRole = (typeof PIN_ROLES)[number];

export const pinSchema = z.object({
  name: z.string().regex(/^[A-Za-z_][A-Za-z0-9_]*$/, "a Verilog identifier: letters, digits, _"),
  direction: z.enum(["input", "output", "inout"]),
  width: z.number().int().min(1).max(64),
  role: z.enum(PIN_ROLES),
});
export type Pin = z.infer<typeof pinSchema>;

/** A tile shape: a name of the organizer's choosing and its size in tiles (columns across, rows up). */
export const SHAPE_NAME = /^[a-z][a-z0-9-]{0,23}$/;
export const tileShapeSchema = z.object({
  name: z.string().regex(SHAPE_NAME, "a short name: lower-case letters, digits and dashes, e.g. wide"),
  cols: z.number().int().min(1).max(9),
  rows: z.number().int().min(1).max(9),
});
export type TileShape = z.infer<typeof tileShapeSchema>;

/**
 * The default tile and pin-label layer are Gatecrash's own invention, not any shuttle programme's: a tile of
 * 180 × 120 µm (0.0216 mm², inside the 0.02–0.04 mm² a design of a few thousand gates needs), at most two
 * tiles as "single", "wide" (two across) or "tall" (two up), and pin labels on GDSII layer 201. An organizer
 * sets their own shuttle's values on the compo form or by importing a ruleset (public/rulesets/).
 */
export const DEFAULT_TILE_SHAPES: TileShape[] = [
  { name: "single", cols: 1, rows: 1 },
  { name: "wide", cols: 2, rows: 1 },
  { name: "tall", cols: 1, rows: 2 },
];
export const DEFAULT_TILE = { widthUm: 180, heightUm: 120, maxTiles: 2, allowedShapes: DEFAULT_TILE_SHAPES };
export const DEFAULT_PIN_LAYER = { layer: 201, datatype: null, edgeToleranceUm: 1 };

/** A Gatecrash name for a version 1 shape "CxR" (columns x rows). */
export function legacyShapeName(cols: number, rows: number): string {
  const known = DEFAULT_TILE_SHAPES.find((s) => s.cols === cols && s.rows === rows);
  if (known) return known.name;
  if (rows === 1) return `wide-${cols}`;
  if (cols === 1) return `tall-${rows}`;
  return `block-${cols}-by-${rows}`;
}

/** Version 1 → 2: tile shapes written "CxR" become named shapes; anything else passes through to the schema. */
export function upgradeRuleset(input: unknown): unknown {
  if (!input || typeof input !== "object" || Array.isArray(input)) return input;
  const r = input as Record<string, unknown>;
  if (r.version !== undefined && r.version !== 1) return input;
  const tile = r.tile as Record<string, unknown> | undefined;
  const shapes = tile?.allowedShapes;
  const upgraded = Array.isArray(shapes)
    ? shapes.map((s) => {
        const m = typeof s === "string" ? /^([1-9])x([1-9])$/.exec(s) : null;
        return m ? { name: legacyShapeName(Number(m[1]), Number(m[2])), cols: Number(m[1]), rows: Number(m[2]) } : s;
      })
    : shapes;
  return { ...r, version: RULESET_VERSION, ...(tile ? { tile: { ...tile, allowedShapes: upgraded } } : {}) };
}

const uploadLimitsSchema = z.object({
  bundleBytes: z.number().int().positive().default(8 * 1024 * 1024),
  bundleUnpackedBytes: z.number().int().positive().default(32 * 1024 * 1024),
  bundleFiles: z.number().int().positive().default(500),
  bundleDepth: z.number().int().positive().default(8),
  bundleCompressionRatio: z.number().positive().default(100),
  layoutBytes: z.number().int().positive().default(64 * 1024 * 1024),
  videoBytes: z.number().int().positive().default(256 * 1024 * 1024),
  stillBytes: z.number().int().positive().default(8 * 1024 * 1024),
});

const simulationSchema = z.object({
  /**
   * null (the default): the whole demo — the capture runs until the design's complete state repeats at a frame
   * start (it loops) or until maxRunSeconds of picture. A number caps the capture at that many frames.
   */
  frames: z.number().int().min(1).max(36_000).nullable().default(null),
  /** Seconds of picture the whole-demo capture runs at most when the design does not loop sooner. */
  maxRunSeconds: z.number().int().min(1).max(600).default(180),
  resetCycles: z.number().int().min(1).max(1_000_000).default(20),
  compileSeconds: z.number().int().min(5).max(600).default(120),
  runSeconds: z.number().int().min(5).max(3600).default(120),
  memoryMb: z.number().int().min(256).max(16384).default(2048),
});

const repositorySchema = z.object({
  allowed: z.boolean().default(true),
  /** Fetch the commit's submodules too (each by its own link, checked like the entry's). */
  submodules: z.boolean().default(false),
  /** Bytes the repository host may send for one fetch, submodules included. */
  transferBytes: z.number().int().positive().default(16 * 1024 * 1024),
  fetchSeconds: z.number().int().min(5).max(600).default(60),
});

const clockSchema = z.object({
  frequencyHz: z.number().positive().default(25_175_000),
  tolerancePct: z.number().min(0).max(10).default(0.5),
  clocksPerPixel: z.number().int().min(1).max(8).default(1),
});

const rangeSchema = z
  .object({ min: z.number().positive(), max: z.number().positive() })
  .refine((r) => r.min <= r.max, { message: "the lowest value must not be above the highest", path: ["max"] });
const acceptanceWindowSchema = z.object({ lineRateKHz: rangeSchema, refreshHz: rangeSchema });

const rulesetObject = z.object({
  version: z.literal(RULESET_VERSION).default(RULESET_VERSION),
  topModule: z.string().regex(/^[A-Za-z_][A-Za-z0-9_$]*$/, "a Verilog module name"),
  pins: z.array(pinSchema).min(1),
  resetActive: z.enum(["low", "high"]).default("low"),
  /**
   * The board's clock: its frequency, how far the oscillator may stray (the rates must stay in the monitor window
   * at both ends), and how many clocks the design holds each pixel (2 for a 50 MHz board divided by two).
   */
  clock: clockSchema.default(clockSchema.parse({})),
  videoMode: z.string().default("vesa-dmt-640x480-60"),
  /** What the party's monitor or projector locks to; null means the video mode's own window (video-modes.ts). */
  monitor: acceptanceWindowSchema.nullable().default(null),
  colourBitsPerChannel: z.number().int().min(1).max(8).default(2),
  tile: z
    .object({
      widthUm: z.number().positive().default(DEFAULT_TILE.widthUm),
      heightUm: z.number().positive().default(DEFAULT_TILE.heightUm),
      maxTiles: z.number().int().min(1).max(16).default(DEFAULT_TILE.maxTiles),
      allowedShapes: z
        .array(tileShapeSchema)
        .min(1)
        .default(DEFAULT_TILE_SHAPES)
        .refine((l) => new Set(l.map((s) => s.name)).size === l.length, "every shape needs its own name"),
    })
    .default(DEFAULT_TILE),
  pinLayer: z
    .object({
      layer: z.number().int().min(0).max(65535).default(DEFAULT_PIN_LAYER.layer),
      datatype: z.number().int().min(0).max(65535).nullable().default(DEFAULT_PIN_LAYER.datatype),
      edgeToleranceUm: z.number().min(0).default(DEFAULT_PIN_LAYER.edgeToleranceUm),
    })
    .default(DEFAULT_PIN_LAYER),
  // A flip-flop is a name token that is `df` with an optional scan (s) / enable (e) prefix and only flip-flop
  // suffix letters after it (f, b, r, s, t, x, p, n, q, digits): gc_dffr_2, gc_sdfrtp_1, gc_edfxtp, gc_dfbbn —
  // not my_dfault. Gatecrash's own naming rule, written for invented cell libraries.
  flipFlopPattern: z.string().default("(?:^|_)(?:s|e|se)?df[fbrstxpnq0-9]*(?:_|$)"),
  flipFlopBudget: z.number().int().positive().nullable().default(null),
  // Memory macros as whole name tokens (gc_sram_64x8, gc_ram16x4, gc_dpram_32x8, gc_rom8_256), never inside a word (program1).
  forbiddenCellPatterns: z
    .array(z.string())
    .default(["(?:^|_)(?:s|b|dp|sp)?ram(?:\\d|_|$)", "(?:^|_)rom(?:\\d|_|$)", "(?:^|_)macro_mem"]),
  /** Layout against source: flip-flop cells in the layout may differ from synthesis by this share (fan-out duplicates). */
  layoutMatch: z.object({ flipFlopTolerancePct: z.number().min(0).max(100).default(5) }).default({ flipFlopTolerancePct: 5 }),
  /** The entry's licence (an SPDX expression): whether one must be given, and whether only OSI-approved ones count. */
  licence: z.object({ required: z.boolean().default(false), openOnly: z.boolean().default(false) }).default({ required: false, openOnly: false }),
  /** Sources by repository link and commit instead of a bundle file. */
  repository: repositorySchema.default(repositorySchema.parse({})),
  uploadLimits: uploadLimitsSchema.default(uploadLimitsSchema.parse({})),
  simulation: simulationSchema.default(simulationSchema.parse({})),
  flashCheck: z
    .object({
      enabled: z.boolean().default(true),
      action: z.enum(["warn", "block"]).default("warn"),
      /**
       * How the entries are watched. "desk": WCAG's area exemption applies (a flash smaller than 25 % of a 10° field,
       * estimated as 341 × 256 px at 1024 × 768, does not count). "hall": a projector in a hall, where a 10° field is a
       * much smaller share of the screen, so the exemption does not apply and a flash anywhere on the screen counts.
       */
      viewing: z.enum(["desk", "hall"]).default("hall"),
    })
    .default({ enabled: true, action: "warn", viewing: "hall" }),
  /** The audio pin is heard through a first-order RC low-pass at this cut-off (4 kHz: common practice, no source). */
  audio: z.object({ lowPassHz: z.number().min(100).max(20_000).default(4000) }).default({ lowPassHz: 4000 }),
});

/** The stored ruleset; older versions are upgraded on the way in. */
export const rulesetSchema = z.preprocess(upgradeRuleset, rulesetObject);

export type Ruleset = z.infer<typeof rulesetObject>;
export type RulesetInput = z.input<typeof rulesetObject>;

/** The demo compo's pin list: Gatecrash's own invention, not any shuttle's pin map. */
export const DEMO_PINS: Pin[] = [
  { name: "clk", direction: "input", width: 1, role: "clock" },
  { name: "rst_n", direction: "input", width: 1, role: "reset" },
  { name: "vga_r", direction: "output", width: 2, role: "red" },
  { name: "vga_g", direction: "output", width: 2, role: "green" },
  { name: "vga_b", direction: "output", width: 2, role: "blue" },
  { name: "vga_hs", direction: "output", width: 1, role: "hsync" },
  { name: "vga_vs", direction: "output", width: 1, role: "vsync" },
  { name: "pwm_out", direction: "output", width: 1, role: "audio" },
];

export const DEMO_RULESET: Ruleset = rulesetSchema.parse({ topModule: "gc_entry", pins: DEMO_PINS });

/** Parse untrusted JSON (an import, a CLI file). Throws a ZodError with field paths. */
export function parseRuleset(input: unknown): Ruleset {
  return rulesetSchema.parse(input);
}

export function pinsByRole(ruleset: Ruleset, role: PinRole): Pin[] {
  return ruleset.pins.filter((p) => p.role === role);
}

/**
 * Organizer-written cell-name patterns (flip-flop pattern, forbidden cells) run against entrant-chosen cell names,
 * so they are compiled with RE2's linear-time engine (re2js): matching takes time proportional to the name, never
 * exponential. RE2 syntax is the common subset of regular expressions without lookaround or back-references.
 * Case-insensitive; a pattern matches anywhere in the name unless anchored.
 */
export interface CellPattern {
  test(name: string): boolean;
}

export function compileCellPattern(pattern: string): CellPattern {
  const re = RE2JS.compile(pattern, RE2JS.CASE_INSENSITIVE);
  return { test: (name) => re.test(name) };
}

/** Why `pattern` cannot be a cell-name pattern (RE2's own message), or null when it compiles. */
export function patternProblem(pattern: string): string | null {
  try {
    RE2JS.compile(pattern, RE2JS.CASE_INSENSITIVE);
    return null;
  } catch (e) {
    if (e instanceof Error && e.name.startsWith("RE2JS")) return `${e.message.replace(/^error parsing regexp: /, "")} (patterns use RE2 syntax: no lookahead or back-references)`;
    throw e;
  }
}

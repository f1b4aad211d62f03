import { RE2JS } from "re2js";
import { z } from "zod";

/**
 * The ruleset of a competition: what an entry must obey to go on the shared chip.
 * Stored as JSON with a version. Only `topModule` and `pins` are required; every other
 * field falls back to the demo compo's values (DEMO_RULESET_DEFAULTS).
 */
export const RULESET_VERSION = 1;

export const PIN_ROLES = ["clock", "reset", "red", "green", "blue", "hsync", "vsync", "audio", "unused"] as const;
export type PinRole = (typeof PIN_ROLES)[number];

export const pinSchema = z.object({
  name: z.string().regex(/^[A-Za-z_][A-Za-z0-9_]*$/, "a Verilog identifier: letters, digits, _"),
  direction: z.enum(["input", "output", "inout"]),
  width: z.number().int().min(1).max(64),
  role: z.enum(PIN_ROLES),
});
export type Pin = z.infer<typeof pinSchema>;

export const TILE_SHAPE = /^[1-9]x[1-9]$/; // columns x rows of tiles, e.g. "1x2"

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
  // one second at 60 Hz: WCAG 2.3.1 counts flashes in any one-second window, which a shorter capture cannot show
  frames: z.number().int().min(1).max(600).default(60),
  resetCycles: z.number().int().min(1).max(1_000_000).default(20),
  compileSeconds: z.number().int().min(5).max(600).default(120),
  runSeconds: z.number().int().min(5).max(3600).default(120),
  memoryMb: z.number().int().min(256).max(16384).default(2048),
});

export const rulesetSchema = z.object({
  version: z.literal(RULESET_VERSION).default(RULESET_VERSION),
  topModule: z.string().regex(/^[A-Za-z_][A-Za-z0-9_$]*$/, "a Verilog module name"),
  pins: z.array(pinSchema).min(1),
  resetActive: z.enum(["low", "high"]).default("low"),
  clock: z
    .object({ frequencyHz: z.number().positive().default(25_175_000), tolerancePct: z.number().min(0).max(10).default(0.5) })
    .default({ frequencyHz: 25_175_000, tolerancePct: 0.5 }),
  videoMode: z.string().default("vesa-dmt-640x480-60"),
  colourBitsPerChannel: z.number().int().min(1).max(8).default(2),
  tile: z
    .object({
      widthUm: z.number().positive().default(160),
      heightUm: z.number().positive().default(100),
      maxTiles: z.number().int().min(1).max(16).default(2),
      allowedShapes: z.array(z.string().regex(TILE_SHAPE, "columns x rows, e.g. 1x2")).min(1).default(["1x1", "2x1", "1x2"]),
    })
    .default({ widthUm: 160, heightUm: 100, maxTiles: 2, allowedShapes: ["1x1", "2x1", "1x2"] }),
  pinLayer: z
    .object({
      layer: z.number().int().min(0).max(65535).default(70),
      datatype: z.number().int().min(0).max(65535).nullable().default(null),
      edgeToleranceUm: z.number().min(0).default(1),
    })
    .default({ layer: 70, datatype: null, edgeToleranceUm: 1 }),
  flipFlopPattern: z.string().default("(?:^|_)(?:df|dff|sdff|edff)"),
  flipFlopBudget: z.number().int().positive().nullable().default(null),
  forbiddenCellPatterns: z.array(z.string()).default(["sram", "ram\\d", "rom\\d", "macro_mem"]),
  uploadLimits: uploadLimitsSchema.default(uploadLimitsSchema.parse({})),
  simulation: simulationSchema.default(simulationSchema.parse({})),
  flashCheck: z
    .object({ enabled: z.boolean().default(true), action: z.enum(["warn", "block"]).default("warn") })
    .default({ enabled: true, action: "warn" }),
});

export type Ruleset = z.infer<typeof rulesetSchema>;
export type RulesetInput = z.input<typeof rulesetSchema>;

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

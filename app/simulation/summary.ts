import { z } from "zod";

/** The harness's summary.json: raw per-clock measurements, before any judgement. */
const syncSchema = z.object({
  warmupHighClocks: z.number().int().nonnegative(),
  warmupEdges: z.number().int().nonnegative(),
  warmupClocks: z.number().int().nonnegative(),
  activeLevel: z.union([z.literal(0), z.literal(1)]),
  periodMin: z.number().int().nonnegative(),
  periodMax: z.number().int().nonnegative(),
  periods: z.number().int().nonnegative(),
  pulseMin: z.number().int().nonnegative(),
  pulseMax: z.number().int().nonnegative(),
  pulses: z.number().int().nonnegative(),
});

export const HARNESS_STATUSES = ["ok", "no-hsync", "no-vsync", "hsync-lost", "vsync-lost", "finished"] as const;

export const harnessSummarySchema = z.object({
  status: z.enum(HARNESS_STATUSES),
  cycles: z.number().int().nonnegative(),
  seconds: z.number().nonnegative(),
  cpuSeconds: z.number().nonnegative(),
  /** frames up to the loop point (or the cap); the tail frames after the loop point are not counted */
  framesCaptured: z.number().int().nonnegative(),
  // optional: summaries from before loop detection (and hand-made ones in tests) lack them
  tailFrames: z.number().int().nonnegative().optional(),
  stoppedAtWallLimit: z.boolean().optional(),
  loop: z
    .object({ detected: z.boolean(), firstLoopFrame: z.number().int(), periodFrames: z.number().int().nonnegative(), stateBytes: z.number().int().nonnegative() })
    .optional(),
  hsync: syncSchema,
  vsync: syncSchema,
  linesPerFrame: z.object({ min: z.number().int(), max: z.number().int(), frames: z.number().int() }),
  blanking: z.object({
    colourClocks: z.number().int().nonnegative(),
    firstFrame: z.number().int(),
    firstLine: z.number().int(),
    firstHpos: z.number().int(),
    firstColour: z.number().int(),
  }),
  audio: z.object({
    sampleRate: z.number().int().positive(),
    samples: z.number().int().nonnegative(),
    risingEdges: z.number().int().nonnegative().optional(),
    maxRisingEdgesPerFrame: z.number().int().nonnegative().optional(),
    lowPassHz: z.number().positive().optional(),
  }),
});

export type HarnessSummary = z.infer<typeof harnessSummarySchema>;
export type SyncMeasurement = z.infer<typeof syncSchema>;

export class SummaryError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "SummaryError";
  }
}

export function parseHarnessSummary(text: string): HarnessSummary {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    throw new SummaryError(`the simulation summary is not JSON: ${(e as Error).message}`);
  }
  const parsed = harnessSummarySchema.safeParse(json);
  if (!parsed.success) throw new SummaryError(`the simulation summary has an unexpected shape: ${parsed.error.message}`);
  return parsed.data;
}

import { z } from "zod";
import { patternProblem, PIN_ROLES, RULESET_VERSION, rulesetSchema, SHAPE_NAME, type Ruleset, type RulesetInput, type TileShape } from "~/rules/ruleset";
import { windowProblem } from "~/rules/monitor";
import { VIDEO_MODES } from "~/rules/video-modes";
import { isValidTimeZone, utcToZonedWallTime, zonedWallTimeToUtc } from "./timezone";

/**
 * Form schemas for events and competitions, shared by the browser (Conform validation) and the server.
 * Times are typed on the event's wall clock ("YYYY-MM-DDTHH:mm") and stored in UTC.
 */
export const SLUG = /^[a-z0-9](?:[a-z0-9-]{0,62}[a-z0-9])?$/;
const slugField = z.string().trim().toLowerCase().regex(SLUG, "Lower-case letters, digits and dashes, e.g. open-gate.").optional();

export function slugify(s: string, fallback = "compo", maxLength = 60): string {
  return (
    s
      .normalize("NFKD")
      .replace(/[\u0300-\u036f]/g, "")
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, "-")
      .replace(/^-+|-+$/g, "")
      .slice(0, maxLength)
      .replace(/-+$/, "") || fallback
  );
}

const wallTime = z.string().optional();

function checkWallTime(ctx: z.RefinementCtx, value: string | undefined, tz: string, path: (string | number)[]) {
  if (!value) return;
  const r = zonedWallTimeToUtc(value, tz);
  if (!r.ok)
    ctx.addIssue({
      code: "custom",
      path,
      message: r.reason === "nonexistent" ? `This time does not exist in ${tz}: the clocks jump forward over it. Pick a time outside that hour.` : "A date and time, like 2027-03-28 20:00.",
    });
}

export const eventFormSchema = z
  .object({
    title: z.string({ error: "Name the event." }).trim().min(3, "At least 3 characters.").max(120, "At most 120 characters."),
    slug: slugField,
    description: z.string().trim().max(4000, "At most 4000 characters.").optional(),
    venue: z.string().trim().max(200, "At most 200 characters.").optional(),
    timeZone: z.string({ error: "Pick the event's time zone." }).trim().refine(isValidTimeZone, "Not an IANA time zone name; try e.g. Europe/Berlin."),
    startsAt: wallTime,
    endsAt: wallTime,
  })
  .superRefine((v, ctx) => {
    if (!isValidTimeZone(v.timeZone)) return;
    checkWallTime(ctx, v.startsAt, v.timeZone, ["startsAt"]);
    checkWallTime(ctx, v.endsAt, v.timeZone, ["endsAt"]);
    if (v.startsAt && v.endsAt && v.endsAt < v.startsAt) ctx.addIssue({ code: "custom", path: ["endsAt"], message: "The end comes after the start." });
  });
export type EventForm = z.infer<typeof eventFormSchema>;

const int = (min: number, max: number, what = "A whole number") =>
  z.number({ error: `${what} from ${min} to ${max}.` }).int(`${what} from ${min} to ${max}.`).min(min, `At least ${min}.`).max(max, `At most ${max}.`);
const positive = (max: number) => z.number({ error: "A number." }).positive("More than 0.").max(max, `At most ${max}.`);

export const pinRowSchema = z.object({
  name: z.string({ error: "Name the pin." }).trim().regex(/^[A-Za-z_][A-Za-z0-9_]*$/, "A Verilog identifier: letters, digits, _."),
  direction: z.enum(["input", "output", "inout"], { error: "input, output or inout." }),
  width: int(1, 64, "Bits"),
  role: z.enum(PIN_ROLES, { error: "Pick a role." }),
});

export const criterionRowSchema = z
  .object({
    id: z.string().uuid().optional(),
    name: z.string({ error: "Name the criterion." }).trim().min(1, "Name the criterion.").max(60, "At most 60 characters."),
    weight: positive(100),
    scaleMin: int(-100, 100),
    scaleMax: int(-100, 100),
  })
  .superRefine((c, ctx) => {
    if (c.scaleMax <= c.scaleMin) ctx.addIssue({ code: "custom", path: ["scaleMax"], message: "The top of the scale must be above its bottom." });
  });

const compiles = (p: string): boolean => patternProblem(p) === null;

const MIB = 1024 * 1024;

export const rulesetFormSchema = z.object({
  topModule: z.string({ error: "Name the top module." }).trim().regex(/^[A-Za-z_][A-Za-z0-9_$]*$/, "A Verilog module name."),
  pins: z.array(pinRowSchema, { error: "List at least one pin." }).min(1, "List at least one pin."),
  resetActive: z.enum(["low", "high"]),
  clock: z.object({
    frequencyHz: positive(2_000_000_000),
    tolerancePct: z.number({ error: "A number." }).min(0, "At least 0.").max(10, "At most 10."),
    clocksPerPixel: int(1, 8, "Clocks"),
  }),
  videoMode: z.string().refine((m) => m in VIDEO_MODES, "Pick a known video mode."),
  // blank = the video mode's own window
  monitor: z.object({
    lineMinKHz: positive(1000).optional(),
    lineMaxKHz: positive(1000).optional(),
    refreshMinHz: positive(1000).optional(),
    refreshMaxHz: positive(1000).optional(),
  }),
  colourBitsPerChannel: int(1, 8, "Bits"),
  tile: z.object({
    widthUm: positive(100_000),
    heightUm: positive(100_000),
    maxTiles: int(1, 16, "Tiles"),
    shapes: z
      .string({ error: "List the allowed shapes, e.g. single=1x1, wide=2x1." })
      .refine((s) => splitList(s).length > 0, "List at least one shape, e.g. single=1x1.")
      .refine((s) => parseShapes(s) !== null, "Each shape is name=columns x rows (1 to 9), e.g. single=1x1, wide=2x1, tall=1x2; names are lower-case letters, digits and dashes.")
      .refine((s) => new Set((parseShapes(s) ?? []).map((x) => x.name)).size === (parseShapes(s) ?? []).length, "Two shapes have the same name."),
  }),
  pinLayer: z.object({ layer: int(0, 65535), datatype: int(0, 65535).optional(), edgeToleranceUm: z.number({ error: "A number." }).min(0, "At least 0.").max(1000) }),
  flipFlopPattern: z.string({ error: "A pattern." }).superRefine((p, ctx) => {
    const problem = patternProblem(p);
    if (problem) ctx.addIssue({ code: "custom", message: `This pattern does not compile: ${problem}.` });
  }),
  flipFlopBudget: int(1, 10_000_000).optional(),
  forbiddenCellPatterns: z
    .string()
    .optional()
    .superRefine((s, ctx) => {
      for (const p of splitLines(s ?? "")) if (!compiles(p)) ctx.addIssue({ code: "custom", message: `"${p}" does not compile: ${patternProblem(p)}.` });
    }),
  uploadLimits: z.object({
    bundleMiB: positive(4096),
    bundleUnpackedMiB: positive(16384),
    bundleFiles: int(1, 100_000),
    bundleDepth: int(1, 64),
    bundleCompressionRatio: positive(100_000),
    layoutMiB: positive(16384),
    videoMiB: positive(16384),
    stillMiB: positive(4096),
  }),
  simulation: z.object({
    /** empty: the whole demo (until it loops or maxRunSeconds) */
    frames: int(1, 36_000, "Frames").optional(),
    maxRunSeconds: int(1, 600, "Seconds"),
    resetCycles: int(1, 1_000_000),
    compileSeconds: int(5, 600),
    runSeconds: int(5, 3600),
    memoryMb: int(256, 16384),
  }),
  flashCheck: z.object({ enabled: z.boolean().optional(), action: z.enum(["warn", "block"]), viewing: z.enum(["desk", "hall"]) }),
  audio: z.object({ lowPassHz: z.number({ error: "A number." }).min(100, "At least 100.").max(20_000, "At most 20000.") }),
  // what crews submit: layout against source, licence, repository links
  flipFlopTolerancePct: z.number({ error: "A number." }).min(0, "At least 0.").max(100, "At most 100."),
  licence: z.object({ required: z.boolean().optional(), openOnly: z.boolean().optional() }).optional(),
  repository: z.object({ allowed: z.boolean().optional(), submodules: z.boolean().optional(), transferMiB: positive(4096), fetchSeconds: int(5, 600) }),
});
export type RulesetForm = z.infer<typeof rulesetFormSchema>;

export function splitList(s: string): string[] {
  return s
    .split(/[\s,;]+/)
    .map((x) => x.trim())
    .filter(Boolean);
}
/** "single=1x1, wide=2x1" → named shapes; null when any item is not name=CxR. */
export function parseShapes(s: string): TileShape[] | null {
  const out: TileShape[] = [];
  for (const item of splitList(s)) {
    const m = /^([^=\s]+)\s*=\s*([1-9])\s*[x×]\s*([1-9])$/i.exec(item);
    if (!m || !SHAPE_NAME.test(m[1])) return null;
    out.push({ name: m[1], cols: Number(m[2]), rows: Number(m[3]) });
  }
  return out;
}

export const shapesText = (shapes: TileShape[]) => shapes.map((x) => `${x.name}=${x.cols}x${x.rows}`).join(", ");

export function splitLines(s: string): string[] {
  return s
    .split(/\r?\n/)
    .map((x) => x.trim())
    .filter(Boolean);
}

/** The four window fields: all blank = the mode's window; all given = the organizer's own. */
function monitorFromForm(m: RulesetForm["monitor"]): RulesetInput["monitor"] {
  const { lineMinKHz, lineMaxKHz, refreshMinHz, refreshMaxHz } = m;
  if (lineMinKHz == null || lineMaxKHz == null || refreshMinHz == null || refreshMaxHz == null) return null;
  return { lineRateKHz: { min: lineMinKHz, max: lineMaxKHz }, refreshHz: { min: refreshMinHz, max: refreshMaxHz } };
}

export function rulesetFromForm(f: RulesetForm): RulesetInput {
  return {
    version: RULESET_VERSION,
    topModule: f.topModule,
    pins: f.pins,
    resetActive: f.resetActive,
    clock: f.clock,
    videoMode: f.videoMode,
    monitor: monitorFromForm(f.monitor),
    colourBitsPerChannel: f.colourBitsPerChannel,
    tile: { widthUm: f.tile.widthUm, heightUm: f.tile.heightUm, maxTiles: f.tile.maxTiles, allowedShapes: parseShapes(f.tile.shapes) ?? [] },
    pinLayer: { layer: f.pinLayer.layer, datatype: f.pinLayer.datatype ?? null, edgeToleranceUm: f.pinLayer.edgeToleranceUm },
    flipFlopPattern: f.flipFlopPattern,
    flipFlopBudget: f.flipFlopBudget ?? null,
    forbiddenCellPatterns: splitLines(f.forbiddenCellPatterns ?? ""),
    uploadLimits: {
      bundleBytes: Math.round(f.uploadLimits.bundleMiB * MIB),
      bundleUnpackedBytes: Math.round(f.uploadLimits.bundleUnpackedMiB * MIB),
      bundleFiles: f.uploadLimits.bundleFiles,
      bundleDepth: f.uploadLimits.bundleDepth,
      bundleCompressionRatio: f.uploadLimits.bundleCompressionRatio,
      layoutBytes: Math.round(f.uploadLimits.layoutMiB * MIB),
      videoBytes: Math.round(f.uploadLimits.videoMiB * MIB),
      stillBytes: Math.round(f.uploadLimits.stillMiB * MIB),
    },
    simulation: { ...f.simulation, frames: f.simulation.frames ?? null },
    flashCheck: { enabled: f.flashCheck.enabled ?? false, action: f.flashCheck.action, viewing: f.flashCheck.viewing },
    audio: { lowPassHz: f.audio.lowPassHz },
    layoutMatch: { flipFlopTolerancePct: f.flipFlopTolerancePct },
    licence: { required: f.licence?.required ?? false, openOnly: f.licence?.openOnly ?? false },
    repository: { allowed: f.repository.allowed ?? false, submodules: f.repository.submodules ?? false, transferBytes: Math.round(f.repository.transferMiB * MIB), fetchSeconds: f.repository.fetchSeconds },
  };
}

// Exact (bytes / 2^20 is a finite binary fraction), so a save without changes gives back the same byte counts.
const mib = (bytes: number) => bytes / MIB;

/** A stored ruleset as the form's default values (numbers as strings the inputs show). */
export function rulesetToForm(r: Ruleset) {
  return {
    topModule: r.topModule,
    pins: r.pins.map((p) => ({ ...p, width: String(p.width) })),
    resetActive: r.resetActive,
    clock: { frequencyHz: String(r.clock.frequencyHz), tolerancePct: String(r.clock.tolerancePct), clocksPerPixel: String(r.clock.clocksPerPixel) },
    videoMode: r.videoMode,
    monitor: r.monitor
      ? { lineMinKHz: String(r.monitor.lineRateKHz.min), lineMaxKHz: String(r.monitor.lineRateKHz.max), refreshMinHz: String(r.monitor.refreshHz.min), refreshMaxHz: String(r.monitor.refreshHz.max) }
      : { lineMinKHz: "", lineMaxKHz: "", refreshMinHz: "", refreshMaxHz: "" },
    colourBitsPerChannel: String(r.colourBitsPerChannel),
    tile: { widthUm: String(r.tile.widthUm), heightUm: String(r.tile.heightUm), maxTiles: String(r.tile.maxTiles), shapes: shapesText(r.tile.allowedShapes) },
    pinLayer: { layer: String(r.pinLayer.layer), datatype: r.pinLayer.datatype == null ? "" : String(r.pinLayer.datatype), edgeToleranceUm: String(r.pinLayer.edgeToleranceUm) },
    flipFlopPattern: r.flipFlopPattern,
    flipFlopBudget: r.flipFlopBudget == null ? "" : String(r.flipFlopBudget),
    forbiddenCellPatterns: r.forbiddenCellPatterns.join("\n"),
    uploadLimits: {
      bundleMiB: String(mib(r.uploadLimits.bundleBytes)),
      bundleUnpackedMiB: String(mib(r.uploadLimits.bundleUnpackedBytes)),
      bundleFiles: String(r.uploadLimits.bundleFiles),
      bundleDepth: String(r.uploadLimits.bundleDepth),
      bundleCompressionRatio: String(r.uploadLimits.bundleCompressionRatio),
      layoutMiB: String(mib(r.uploadLimits.layoutBytes)),
      videoMiB: String(mib(r.uploadLimits.videoBytes)),
      stillMiB: String(mib(r.uploadLimits.stillBytes)),
    },
    simulation: Object.fromEntries(Object.entries(r.simulation).map(([k, v]) => [k, v === null ? "" : String(v)])),
    flashCheck: { enabled: r.flashCheck.enabled ? "on" : "", action: r.flashCheck.action, viewing: r.flashCheck.viewing },
    audio: { lowPassHz: String(r.audio.lowPassHz) },
    flipFlopTolerancePct: String(r.layoutMatch.flipFlopTolerancePct),
    licence: { required: r.licence.required ? "on" : "", openOnly: r.licence.openOnly ? "on" : "" },
    repository: { allowed: r.repository.allowed ? "on" : "", submodules: r.repository.submodules ? "on" : "", transferMiB: String(mib(r.repository.transferBytes)), fetchSeconds: String(r.repository.fetchSeconds) },
  };
}

/** The smallest unit of a currency (EUR: 2 decimals, JPY: 0), from Intl's currency data. */
export function currencyDigits(currency: string): number {
  try {
    return new Intl.NumberFormat("en", { style: "currency", currency }).resolvedOptions().maximumFractionDigits ?? 2;
  } catch {
    return 2;
  }
}

export function isKnownCurrency(c: string): boolean {
  const intl = Intl as unknown as { supportedValuesOf?: (k: string) => string[] };
  return /^[A-Za-z]{3}$/.test(c) && (intl.supportedValuesOf ? intl.supportedValuesOf("currency").includes(c.toUpperCase()) : true);
}

export function formatFee(amountMinor: number, currency: string): string {
  if (amountMinor === 0) return "Free";
  const digits = currencyDigits(currency);
  return new Intl.NumberFormat("en-GB", { style: "currency", currency: currency.toUpperCase() }).format(amountMinor / 10 ** digits);
}

export function competitionFormSchema(timeZone: string) {
  return z
    .object({
      title: z.string({ error: "Name the compo." }).trim().min(3, "At least 3 characters.").max(120, "At most 120 characters."),
      slug: slugField,
      description: z.string().trim().max(8000, "At most 8000 characters.").optional(),
      deadline: wallTime,
      graceMinutes: int(0, 1440, "Minutes").optional(),
      votingOpens: wallTime,
      votingCloses: wallTime,
      showStarts: wallTime,
      showMinutes: int(5, 24 * 60, "Minutes").optional(),
      free: z.boolean().optional(),
      feeAmount: z.number({ error: "An amount, like 15.00." }).min(0, "At least 0.").max(100_000, "At most 100000.").optional(),
      feeCurrency: z.string().trim().optional(),
      criteria: z.array(criterionRowSchema).max(12, "At most 12 criteria.").optional(),
      ruleset: rulesetFormSchema,
    })
    .superRefine((v, ctx) => {
      checkWallTime(ctx, v.deadline, timeZone, ["deadline"]);
      checkWallTime(ctx, v.votingOpens, timeZone, ["votingOpens"]);
      checkWallTime(ctx, v.votingCloses, timeZone, ["votingCloses"]);
      checkWallTime(ctx, v.showStarts, timeZone, ["showStarts"]);
      if (v.votingOpens && !v.votingCloses) ctx.addIssue({ code: "custom", path: ["votingCloses"], message: "When does voting close?" });
      if (v.votingCloses && !v.votingOpens) ctx.addIssue({ code: "custom", path: ["votingOpens"], message: "When does voting open?" });
      if (v.votingOpens && v.votingCloses && v.votingCloses <= v.votingOpens) ctx.addIssue({ code: "custom", path: ["votingCloses"], message: "Voting closes after it opens." });
      if (v.free && v.feeAmount) ctx.addIssue({ code: "custom", path: ["feeAmount"], message: "“Free entry” is ticked: clear the amount, or untick it to charge this fee." });
      if (!v.free) {
        if (!v.feeAmount) ctx.addIssue({ code: "custom", path: ["feeAmount"], message: "Enter the fee, or tick “Free entry”." });
        if (!v.feeCurrency || !isKnownCurrency(v.feeCurrency)) ctx.addIssue({ code: "custom", path: ["feeCurrency"], message: "A three-letter ISO 4217 currency code, like EUR." });
      }
      const names = (v.criteria ?? []).map((c) => c.name.toLowerCase());
      names.forEach((n, i) => {
        if (names.indexOf(n) !== i) ctx.addIssue({ code: "custom", path: ["criteria", i, "name"], message: "Two criteria have this name." });
      });
      const pinNames = v.ruleset.pins.map((p) => p.name);
      pinNames.forEach((n, i) => {
        if (pinNames.indexOf(n) !== i) ctx.addIssue({ code: "custom", path: ["ruleset", "pins", i, "name"], message: "Two pins have this name." });
      });
      // Backstop: the stored schema must accept what the form built (only when the form's own checks passed,
      // so one mistake is never reported twice); its paths are mapped back to the form's field names.
      if (!rulesetFormSchema.safeParse(v.ruleset).success) return;
      const r = rulesetSchema.safeParse(rulesetFromForm(v.ruleset));
      if (r.success) {
        const problem = windowProblem(r.data);
        if (problem) ctx.addIssue({ code: "custom", path: ["ruleset", "clock", "frequencyHz"], message: `No design could pass: ${problem}. Change the clock, the clocks per pixel, the mode or the monitor window.` });
      }
      const m = v.ruleset.monitor;
      const given = [m.lineMinKHz, m.lineMaxKHz, m.refreshMinHz, m.refreshMaxHz].filter((x) => x != null).length;
      if (given > 0 && given < 4) ctx.addIssue({ code: "custom", path: ["ruleset", "monitor", "lineMinKHz"], message: "Give all four limits of the monitor window, or leave all four blank for the mode's usual window." });
      if (!r.success)
        for (const issue of r.error.issues) {
          const path = issue.path.map((p) => (typeof p === "symbol" ? String(p) : p));
          if (path[0] === "tile" && path[1] === "allowedShapes") path.splice(1, path.length - 1, "shapes");
          if (path[0] === "uploadLimits" && typeof path[1] === "string") path[1] = path[1].replace(/Bytes$/, "MiB");
          ctx.addIssue({ code: "custom", path: ["ruleset", ...path], message: issue.message });
        }
    });
}
export type CompetitionForm = z.infer<ReturnType<typeof competitionFormSchema>>;

export interface CompetitionValues {
  title: string;
  slug: string;
  description: string;
  deadlineAt: Date | null;
  graceMinutes: number;
  votingOpensAt: Date | null;
  votingClosesAt: Date | null;
  showStartsAt: Date | null;
  showMinutes: number;
  feeAmount: number;
  feeCurrency: string;
  criteria: { id?: string; name: string; weight: number; scaleMin: number; scaleMax: number }[];
  ruleset: Ruleset;
}

const toUtc = (v: string | undefined, tz: string): Date | null => {
  if (!v) return null;
  const r = zonedWallTimeToUtc(v, tz);
  return r.ok ? r.utc : null;
};

/** A validated form as the stored values (UTC instants, minor units, a parsed ruleset). */
export function competitionValues(v: CompetitionForm, timeZone: string): CompetitionValues {
  const currency = (v.feeCurrency || "eur").toLowerCase();
  return {
    title: v.title,
    slug: v.slug || slugify(v.title),
    description: v.description ?? "",
    deadlineAt: toUtc(v.deadline, timeZone),
    graceMinutes: v.graceMinutes ?? 0,
    votingOpensAt: toUtc(v.votingOpens, timeZone),
    votingClosesAt: toUtc(v.votingCloses, timeZone),
    showStartsAt: toUtc(v.showStarts, timeZone),
    showMinutes: v.showMinutes ?? 60,
    feeAmount: v.free ? 0 : Math.round((v.feeAmount ?? 0) * 10 ** currencyDigits(currency)),
    feeCurrency: currency,
    criteria: v.criteria ?? [],
    ruleset: rulesetSchema.parse(rulesetFromForm(v.ruleset)),
  };
}

/** Stored values as the form's defaults (wall-clock strings in the event's zone). */
export function competitionToForm(
  c: Omit<CompetitionValues, "criteria"> & { criteria: Required<CompetitionValues["criteria"][number]>[] },
  tz: string,
) {
  const wall = (d: Date | null) => (d ? utcToZonedWallTime(d, tz) : "");
  const digits = currencyDigits(c.feeCurrency);
  return {
    title: c.title,
    slug: c.slug,
    description: c.description,
    deadline: wall(c.deadlineAt),
    graceMinutes: String(c.graceMinutes),
    votingOpens: wall(c.votingOpensAt),
    votingCloses: wall(c.votingClosesAt),
    showStarts: wall(c.showStartsAt),
    showMinutes: String(c.showMinutes),
    free: c.feeAmount === 0 ? "on" : "",
    feeAmount: c.feeAmount === 0 ? "" : (c.feeAmount / 10 ** digits).toFixed(digits),
    feeCurrency: c.feeCurrency.toUpperCase(),
    criteria: c.criteria.map((k) => ({ id: k.id, name: k.name, weight: String(k.weight), scaleMin: String(k.scaleMin), scaleMax: String(k.scaleMax) })),
    ruleset: rulesetToForm(c.ruleset),
  };
}

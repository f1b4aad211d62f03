import { execFileSync } from "node:child_process";
import { chmodSync, copyFileSync, mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Finding } from "~/rules/findings";
import { DEMO_RULESET, rulesetSchema } from "~/rules/ruleset";
import { pcmFromBuffer } from "./audio";
import { runReferenceCapture, type ReferenceCapture } from "./capture.server";

// Real verilator builds of tests/fixtures/designs/gc_pattern.v inside the sandbox, one per fault,
// switched on by a define file read before the design. Check values: VESA DMT 640×480 @ 60 Hz.
const FIXTURES = resolve(__dirname, "../../tests/fixtures/designs");
const root = mkdtempSync(join(tmpdir(), "gc-capture-"));
chmodSync(root, 0o755); // the sandbox user must be able to reach the build folder
afterAll(() => rmSync(root, { recursive: true, force: true }));

const VARIANTS = {
  correct: "",
  hsyncWidth: "`define HSYNC_WIDTH 100",
  positiveHsync: "`define HSYNC_POSITIVE",
  lineCount: "`define V_FRONT 9",
  blankColour: "`define BLANK_COLOUR",
  noVsync: "`define NO_VSYNC",
  fallingGreen: "`define FALLING_GREEN",
} as const;
type Variant = keyof typeof VARIANTS;

// every frame of each capture, as the harness sent it (frames are streamed, never written to disk)
const framesOf = new Map<string, Uint8Array[]>();

async function capture(name: string, defines: string, encode = false, file = "gc_pattern.v", ruleset = DEMO_RULESET, forceBothEdges = false): Promise<ReferenceCapture> {
  const src = join(root, name, "src");
  execFileSync("mkdir", ["-p", src]);
  writeFileSync(join(src, "variant.v"), `${defines}\n`);
  copyFileSync(join(FIXTURES, file), join(src, "design.v"));
  const frames: Uint8Array[] = [];
  framesOf.set(name, frames);
  return runReferenceCapture({ sourceDir: src, verilogFiles: ["variant.v", "design.v"], ruleset, workDir: join(root, name, "work"), frames: 4, encode, forceBothEdges, onFrame: (img) => frames.push(img.data) });
}

/** Pixels of a captured frame that differ from gc_pattern.v's formula; `rgb` is the frame as rgb24. */
function patternMismatches(rgb: Uint8Array): number {
  const frameNo = rgb[0] / 85; // r = x[7:6] + frame[1:0] at x = 0
  let mismatches = 0;
  for (let y = 0; y < 480; y++) {
    for (let x = 0; x < 640; x++) {
      const r = (((x >> 6) & 3) + frameNo) & 3, g = (y >> 6) & 3, b = ((x >> 5) ^ (y >> 5)) & 1 ? 3 : 1;
      const i = (y * 640 + x) * 3;
      if (rgb[i] !== r * 85 || rgb[i + 1] !== g * 85 || rgb[i + 2] !== b * 85) mismatches++;
    }
  }
  return mismatches;
}


const results = new Map<Variant, ReferenceCapture>();
beforeAll(async () => {
  const names = Object.keys(VARIANTS) as Variant[];
  // two builds at a time: the machine has two cores
  for (let i = 0; i < names.length; i += 2) {
    await Promise.all(names.slice(i, i + 2).map(async (n) => results.set(n, await capture(n, VARIANTS[n], n === "correct"))));
  }
}, 300_000);

// four frames are less than the one second WCAG counts flashes in: the flash findings say "unmeasured" (a warning)
// in every capture here, and are checked on their own below
const failed = (findings: Finding[]) => findings.filter((f) => f.verdict !== "pass" && !f.rule.startsWith("flash.")).map((f) => f.rule).sort();

describe("reference capture of a correct design", () => {
  it("passes every timing rule with the VESA DMT values", () => {
    const c = results.get("correct")!;
    expect(failed(c.findings)).toEqual([]);
    expect(c.video).toMatchObject({
      hsync: { periodClocks: 800, pulseClocks: 96, polarity: "negative" },
      vsync: { periodLines: 525, pulseLines: 2, polarity: "negative" },
      linesPerFrame: 525,
      framesRendered: 4,
    });
    expect(c.video!.frameRateHz).toBeCloseTo(59.94, 2);
  });

  it("captures the visible area aligned to sync: every pixel matches the design's formula", () => {
    const c = results.get("correct")!;
    // decode the PNG with ffmpeg, an independent PNG reader
    const rgb = execFileSync("ffmpeg", ["-v", "error", "-i", c.files.firstFramePng!, "-f", "rawvideo", "-pix_fmt", "rgb24", "-"]);
    expect(rgb.length).toBe(640 * 480 * 3);
    expect(patternMismatches(rgb)).toBe(0);
    expect(statSync(c.files.contactSheetPng!).size).toBeGreaterThan(1000);
  });

  it("decodes the audio pin's 1000.04 Hz tone within 1 %", () => {
    const c = results.get("correct")!;
    // the design toggles every 12 587 clocks: 25 175 000 / (2 · 12 587) = 1000.04 Hz
    const expected = 25_175_000 / (2 * 12_587);
    expect(Math.abs(c.audio!.dominantHz! - expected) / expected).toBeLessThan(0.01);
    // cross-check through ffmpeg's WAV reader: count rising zero crossings over the clip
    const samples = pcmFromBuffer(execFileSync("ffmpeg", ["-v", "error", "-i", c.files.wav!, "-f", "s16le", "-"]));
    let rises = 0;
    for (let i = 1; i < samples.length; i++) if (samples[i - 1] < 0 && samples[i] >= 0) rises++;
    const seconds = samples.length / 48_000;
    expect(Math.abs(rises / seconds - expected) / expected).toBeLessThan(0.03);
    expect(c.audio!.dcOffset).toBeCloseTo(0, 1);
    expect(readFileSync(c.files.waveformSvg!, "utf8")).toContain("<svg");
  });

  it("claims nothing about flashes from four frames, and reports its speed", () => {
    const c = results.get("correct")!;
    // WCAG 2.2 SC 2.3.1 counts flashes in any one-second period: 4 frames at 59.94 Hz are 0.067 s
    expect(c.flashFigures).toMatchObject({ verdict: "unmeasured", worstSecondFlashes: null, wholeDemo: false });
    expect(c.flashFigures!.statement).toMatch(/not measured/);
    expect(c.findings.filter((f) => f.rule.startsWith("flash.")).map((f) => [f.verdict, f.measured])).toEqual([["warn", "unmeasured"], ["warn", "unmeasured"]]);
    expect(c.loop).toMatchObject({ detected: false, stoppedBy: "frames", framesCaptured: 4 });
    expect(c.speed!.cycles).toBeGreaterThan(4 * 420_000);
    expect(c.speed!.realTimeMultiple).toBeCloseTo(c.speed!.cyclesPerSecond / 25_175_000, 6);
  });

  it("encodes WebM and MP4 previews whose length ffprobe reads as four frames", () => {
    const c = results.get("correct")!;
    for (const file of [c.files.webm!, c.files.mp4!]) {
      const probe = JSON.parse(execFileSync("ffprobe", ["-v", "error", "-show_entries", "format=duration:stream=codec_name", "-of", "json", file]).toString());
      const codecs = probe.streams.map((s: { codec_name: string }) => s.codec_name).sort();
      expect(codecs).toEqual(file.endsWith(".webm") ? ["opus", "vp9"] : ["aac", "h264"]);
      expect(Number(probe.format.duration)).toBeGreaterThan(0.05);
      expect(Number(probe.format.duration)).toBeLessThan(0.12);
    }
  });
});

describe("designs with one fault each", () => {
  it("a 100-clock hsync pulse fails only the hsync pulse width", () => {
    const c = results.get("hsyncWidth")!;
    expect(failed(c.findings)).toEqual(["video.hsync.pulse"]);
    expect(c.video!.hsync.pulseClocks).toBe(100);
  });
  it("a positive hsync fails only the hsync polarity", () => {
    const c = results.get("positiveHsync")!;
    expect(failed(c.findings)).toEqual(["video.hsync.polarity"]);
    expect(c.video!.hsync.polarity).toBe("positive");
  });
  it("524 lines a frame fails the vsync period and the line count (the same fact in two units), nothing else", () => {
    const c = results.get("lineCount")!;
    expect(failed(c.findings)).toEqual(["video.frame.lines", "video.vsync.period"]);
    expect(c.video!.linesPerFrame).toBe(524);
  });
  it("colour in the front porch fails only the blanking rule, and says where", () => {
    const c = results.get("blankColour")!;
    expect(failed(c.findings)).toEqual(["video.blanking.colour"]);
    const f = c.findings.find((x) => x.rule === "video.blanking.colour")!;
    // the design lights x = 642..645: 144 + 642 clocks after the hsync leading edge of the previous line → 786
    expect(f.evidence).toMatch(/786 clocks after hsync/);
  });
  it("no vsync ends with its own finding, not a hang, and hsync still passes", () => {
    const c = results.get("noVsync")!;
    expect(failed(c.findings)).toEqual(["video.vsync.missing"]);
    expect(c.video!.hsync).toEqual({ periodClocks: 800, pulseClocks: 96, polarity: "negative" });
    expect(c.files.firstFramePng).toBeNull();
  });
});

describe("evaluating only the rising clock edge", () => {
  it("is chosen for a design that only reacts to the rising edge, and changes no byte of the capture", async () => {
    const full = await capture("correctBothEdges", VARIANTS.correct, false, "gc_pattern.v", DEMO_RULESET, true);
    expect(results.get("correct")!.speed!.edgeMode).toBe("rising-only");
    expect(full.speed!.edgeMode).toBe("both-edges");
    expect(Buffer.concat(framesOf.get("correct")!).equals(Buffer.concat(framesOf.get("correctBothEdges")!))).toBe(true);
    expect(full.findings).toEqual(results.get("correct")!.findings);
  }, 120_000);

  it("is not chosen when a register is clocked on the falling edge, and that register still works", () => {
    const c = results.get("fallingGreen")!;
    expect(c.speed!.edgeMode).toBe("both-edges");
    expect(failed(c.findings)).toEqual([]);
    const frames = framesOf.get("fallingGreen")!;
    expect(frames).toHaveLength(4);
    for (const f of frames) expect(patternMismatches(f)).toBe(0);
  });
});

describe("limits", () => {
  it("kills a design whose elaboration never ends at the compile limit, with a clear finding", async () => {
    const ruleset = rulesetSchema.parse({ ...DEMO_RULESET, simulation: { ...DEMO_RULESET.simulation, compileSeconds: 5 } });
    // the limit shows in the finding; how long the kill takes is timed by `npx tsx tests/abuse/hogs.ts`, not asserted here
    const c = await capture("endless", "", false, "gc_endless_elaboration.v", ruleset);
    expect(c.findings).toHaveLength(1);
    expect(c.findings[0]).toMatchObject({ rule: "simulation.compile", verdict: "fail", limit: "5 s" });
    expect(String(c.findings[0].measured)).toMatch(/compile limit|CPU time/);
  }, 60_000);

  it("reports a design that does not compile as a failed build with verilator's message", async () => {
    const c = await capture("broken", "module gc_entry(input clk); wire x = ; endmodule", false, "gc_pattern.v");
    expect(c.findings[0]).toMatchObject({ rule: "simulation.compile", verdict: "fail" });
    expect(c.findings[0].evidence).toMatch(/Error/);
  }, 60_000);
});

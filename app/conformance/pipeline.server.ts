import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { readLayoutFile } from "~/gdsii/reader.server";
import { checkLayout } from "~/layout/check-layout";
import { layoutMatchesSource, type SourceSide } from "~/layout/matches-source";
import { layoutPictureSvg } from "~/layout/layout-picture";
import { layoutThumbnailPng } from "~/layout/layout-thumbnail";
import { extractBundle } from "~/sources/intake.server";
import { fetchRepositoryStep } from "~/sources/repository-step.server";
import { precheckPassed, precheckSources } from "~/sources/precheck.server";
import { runSourceChecks } from "~/sources/yosys.server";
import { compareVideoFile } from "~/simulation/compare-video.server";
import { runReferenceCapture } from "~/simulation/capture.server";
import { flashFigures, flashFindings } from "~/simulation/flash";
import { analyzeVideoFile } from "~/simulation/flash-video.server";
import { worstVerdict, type CheckStep, type Finding, type Verdict } from "~/rules/findings";
import type { Ruleset } from "~/rules/ruleset";
import { inputFaultFinding, internalFaultFinding } from "./step-faults";

/**
 * The conformance check of one upload, shared by the worker and the `npm run check` CLI.
 * Order matters for safety: the bundle is unpacked with limits, then pre-checked on its text, and only a clean
 * pre-check lets yosys and verilator (both inside the sandbox) read it.
 * Order matters for speed too: the cheap steps (intake, pre-check, yosys, layout) come first and each hands its
 * findings to `onReport` as soon as it has them, so the entry page shows them while verilator still builds.
 * A step that throws never takes the others down: see step-faults.ts for whose fault it was.
 */
export type InputFile = "bundle" | "layout" | "video";

export interface PipelineInput {
  ruleset: Ruleset;
  workDir: string;
  bundlePath?: string;
  /** Sources by repository link instead of a bundle: fetched first (app/sources/repository.server.ts), then taken as a bundle. */
  repository?: { url: string; commit: string; allowLoopback: boolean };
  layoutPath?: string;
  videoPath?: string;
  /** Files that were uploaded but cannot be used (the caller found them changed since the receipt): reported instead. */
  refused?: Partial<Record<InputFile, Finding>>;
  simulate: boolean;
  frames?: number;
  encode?: boolean;
  /** Draw the layout picture and thumbnail as artifacts (default true; `npm run check` prints no artifacts). */
  pictures?: boolean;
  /** A step starts. */
  onStep?: (step: CheckStep) => Promise<void> | void;
  /** A step (or, for the reference capture, a first part of it) has results. Calls come one at a time, in order. */
  onReport?: (report: StepReport) => Promise<void> | void;
}

export interface PipelineArtifact {
  kind: string;
  path: string;
  mediaType: string;
}

export interface StepReport {
  step: CheckStep;
  findings: Finding[];
  /** Merged into the run's figures key by key. */
  figures: Record<string, unknown>;
  artifacts: PipelineArtifact[];
  skipped: { step: CheckStep; reason: string }[];
}

export interface PipelineResult {
  verdict: Verdict;
  findings: Finding[];
  figures: Record<string, unknown>;
  artifacts: PipelineArtifact[];
  skipped: { step: CheckStep; reason: string }[];
  /** Steps Gatecrash itself failed (each also has a `<step>.internal` finding); a worker tries such a run again. */
  internalErrors: { step: CheckStep; message: string }[];
}

const MEDIA: Record<string, string> = {
  "first-frame": "image/png",
  "contact-sheet": "image/png",
  wav: "audio/wav",
  waveform: "image/svg+xml",
  webm: "video/webm",
  mp4: "video/mp4",
  "layout-svg": "image/svg+xml",
  "layout-png": "image/png",
};

type Part = Partial<Omit<StepReport, "step">>;
type Referenced = Awaited<ReturnType<typeof runReferenceCapture>>["referenceLuma"];

export async function runPipeline(input: PipelineInput): Promise<PipelineResult> {
  const { ruleset, workDir } = input;
  // Tools run as the sandbox user, who must be able to enter every folder they build in.
  mkdirSync(join(workDir, "scratch"), { recursive: true, mode: 0o755 });
  const result: PipelineResult = { verdict: "pass", findings: [], figures: {}, artifacts: [], skipped: [], internalErrors: [] };
  const stepMs: Partial<Record<CheckStep, number>> = {};
  const storedKinds = new Set<string>();
  let reports: Promise<void> = Promise.resolve();

  /** Adds a part to the result and hands it on; the caller's onReport calls are chained so they arrive in order. */
  const emit = (step: CheckStep, part: Part): Promise<void> => {
    const artifacts = (part.artifacts ?? []).filter((a) => !storedKinds.has(a.kind));
    for (const a of artifacts) storedKinds.add(a.kind);
    const report: StepReport = { step, findings: part.findings ?? [], figures: { ...part.figures, stepMs: { ...stepMs } }, artifacts, skipped: part.skipped ?? [] };
    result.findings.push(...report.findings);
    Object.assign(result.figures, part.figures);
    result.artifacts.push(...artifacts);
    result.skipped.push(...report.skipped);
    reports = reports.then(() => input.onReport?.(report));
    return reports;
  };
  const artifact = (kind: string, path: string | null | undefined): PipelineArtifact[] =>
    path ? [{ kind, path, mediaType: MEDIA[kind] ?? "application/octet-stream" }] : [];
  const skip = (step: CheckStep, reason: string) => emit(step, { skipped: [{ step, reason }] });

  /**
   * Runs one step. Its own failure becomes its finding; a failure of the caller's callbacks (the database, the
   * store) is not the step's and goes up to the caller. `early` sends a part while the step goes on.
   */
  const step = async (name: CheckStep, body: (early: (part: Part) => void) => Promise<Part>): Promise<void> => {
    await input.onStep?.(name);
    const started = Date.now();
    const earlyReports: Promise<void>[] = [];
    let part: Part;
    try {
      part = await body((p) => {
        const sent = emit(name, p);
        sent.catch(() => undefined); // awaited below; this only keeps Node from calling it unhandled meanwhile
        earlyReports.push(sent);
      });
    } catch (e) {
      const asInput = inputFaultFinding(name, e);
      if (!asInput) result.internalErrors.push({ step: name, message: e instanceof Error ? e.message : String(e) });
      part = { findings: [asInput ?? internalFaultFinding(name, e)] };
    }
    await Promise.all(earlyReports);
    stepMs[name] = Date.now() - started;
    await emit(name, part);
  };

  // 0. A repository link: its commit is fetched into a tree archive, which the intake then takes like a bundle
  let bundlePath = input.bundlePath;
  const repository = input.repository;
  if (repository) {
    await step("intake", async () => {
      const fetched = await fetchRepositoryStep(repository, ruleset, join(workDir, "repository"));
      bundlePath = fetched.archivePath ?? undefined;
      return { findings: fetched.findings, figures: { repository: fetched.figures } };
    });
  }

  // 1. Bundle intake
  let sourceDir: string | null = null;
  let verilogFiles: string[] = [];
  let sourceLines: number | null = null;
  if (input.refused?.bundle) {
    await emit("intake", { findings: [input.refused.bundle] });
  } else if (bundlePath) {
    const archive = bundlePath;
    await step("intake", async () => {
      const manifest = await extractBundle(archive, join(workDir, "src"), ruleset.uploadLimits);
      sourceDir = join(workDir, "src");
      verilogFiles = manifest.verilogFiles;
      sourceLines = manifest.sourceLines;
      return {
        figures: { intake: { format: manifest.format, files: manifest.files.length, verilogFiles: verilogFiles.length, sourceLines: manifest.sourceLines, totalBytes: manifest.totalBytes } },
        findings: [
          verilogFiles.length > 0
            ? { step: "intake", rule: "intake.bundle", verdict: "pass", title: "Source bundle unpacked within the limits", measured: `${manifest.files.length} files, ${manifest.totalBytes} bytes`, limit: `${ruleset.uploadLimits.bundleFiles} files, ${ruleset.uploadLimits.bundleUnpackedBytes} bytes` }
            : { step: "intake", rule: "intake.verilog", verdict: "fail", title: "The bundle holds no Verilog files", measured: 0, limit: "at least one .v or .sv", advice: "Put your design's .v files in the archive." },
        ],
      };
    });
  } else if (!repository) {
    await skip("intake", "no source bundle in this upload");
  }

  // 2. Pre-check, then 3. yosys — only on a bundle that unpacked
  let sourceClean = false;
  let synthesized: SourceSide | null = null;
  const readable = (): string | null => (verilogFiles.length > 0 ? sourceDir : null);
  const srcDir = readable();
  if (srcDir) {
    let precheckClean = false;
    await step("precheck", async () => {
      const pre = await precheckSources(srcDir, verilogFiles, { scratchDir: join(workDir, "scratch") });
      precheckClean = precheckPassed(pre);
      return { findings: pre };
    });
    if (precheckClean) {
      await step("source", async () => {
        const src = await runSourceChecks(srcDir, verilogFiles, ruleset, { scratchDir: join(workDir, "scratch") });
        sourceClean = src.figures.top !== null && !src.findings.some((f) => f.rule.startsWith("source.top") && f.verdict === "fail");
        if (sourceClean && !src.findings.some((f) => f.rule === "source.yosys")) synthesized = src.figures;
        return { findings: src.findings, figures: { source: { ...src.figures, sourceLines } } };
      });
    } else {
      await emit("source", {
        skipped: [
          { step: "source", reason: "the pre-check refused the source, so no tool read it" },
          { step: "simulation", reason: "the pre-check refused the source, so no tool read it" },
        ],
      });
    }
  }

  // 4. Layout
  if (input.refused?.layout) {
    await emit("layout", { findings: [input.refused.layout] });
  } else if (input.layoutPath) {
    const layoutPath = input.layoutPath;
    await step("layout", async () => {
      // A .gds.gz is inflated on the fly and held to the same size limit as a plain layout.
      const summary = await readLayoutFile(layoutPath, { collectPlacements: 20_000, limits: { maxBytes: ruleset.uploadLimits.layoutBytes } });
      const checked = checkLayout(summary, ruleset);
      const against = synthesized as SourceSide | null;
      const matched = against ? layoutMatchesSource(against, checked.figures, ruleset) : [];
      const skipped = against ? [] : [{ step: "layout" as const, reason: "no synthesized source to hold the layout against (flip-flops, ports)" }];
      const svgPath = join(workDir, "layout.svg");
      const pngPath = join(workDir, "layout.png");
      const pictures = input.pictures ?? true;
      if (pictures) {
        writeFileSync(svgPath, layoutPictureSvg(summary, ruleset, { dieUm: checked.figures.dieUm, title: summary.topCell ?? "layout" }));
        writeFileSync(pngPath, layoutThumbnailPng(summary, ruleset, { dieUm: checked.figures.dieUm, widthPx: 480 }));
      }
      return {
        findings: [...checked.findings, ...matched],
        skipped,
        figures: { layout: { ...checked.figures, topCells: summary.topCells, labels: summary.labels, instances: summary.instances, layers: summary.layers } },
        artifacts: pictures ? [...artifact("layout-svg", svgPath), ...artifact("layout-png", pngPath)] : [],
      };
    });
  } else {
    await skip("layout", "no layout in this upload");
  }

  // 5. Reference capture; its first still is sent as soon as the simulated design has drawn it
  let referenceLuma: Referenced = null;
  if (input.simulate && srcDir && sourceClean) {
    await step("simulation", async (early) => {
      const simDir = join(workDir, "sim");
      const cap = await runReferenceCapture({
        sourceDir: srcDir, verilogFiles, ruleset, workDir: simDir, frames: input.frames, encode: input.encode ?? true,
        onFirstFrame: (png) => {
          const path = join(workDir, "first-frame.png");
          writeFileSync(path, png);
          early({ artifacts: artifact("first-frame", path) });
        },
      });
      referenceLuma = cap.referenceLuma;
      return {
        findings: cap.findings,
        figures: {
          // the loop also under video (video.loop, as issue 13 names it)
          video: cap.video ? { ...cap.video, loop: cap.loop } : null,
          audio: cap.audio,
          speed: cap.speed,
          // flash = {verdict, worstSecondFlashes, worstSecondAt, analysedSeconds, wholeDemo, span, statement, …}
          flash: cap.flash && cap.flashFigures ? { ...cap.flashFigures, report: cap.flash } : null,
          loop: cap.loop,
          audioChecks: cap.audioChecks,
        },
        artifacts: [
          ...artifact("first-frame", cap.files.firstFramePng),
          ...artifact("contact-sheet", cap.files.contactSheetPng),
          ...artifact("wav", cap.files.wav),
          ...artifact("waveform", cap.files.waveformSvg),
          ...artifact("webm", cap.files.webm),
          ...artifact("mp4", cap.files.mp4),
        ],
      };
    });
  } else if (input.simulate && srcDir && !result.skipped.some((s) => s.step === "simulation")) {
    await skip("simulation", "the source checks did not find the top module");
  }

  // 6. The entrant's capture video: flash safety, and agreement with the reference
  if (input.refused?.video) {
    await emit("capture", { findings: [input.refused.video] });
  } else if (input.videoPath) {
    const videoPath = input.videoPath;
    const reference = referenceLuma as Referenced;
    await step("capture", async () => {
      // the whole video, streamed from ffmpeg; its own verdict gates its own player
      const { report: flash, span } = await analyzeVideoFile(videoPath, { workDir: join(workDir, "upload-video"), viewing: ruleset.flashCheck.viewing });
      const found: Finding[] = flashFindings(flash, ruleset, "uploaded capture video", 160, 120, span).map((f) => ({ ...f, step: "capture" as const, rule: f.rule.replace(/^flash\./, "capture.flash.") }));
      const figures: Record<string, unknown> = { captureFlash: flashFigures(flash, ruleset, span, "warn") };
      if (reference) {
        const cmp = await compareVideoFile(videoPath, reference, join(workDir, "compare"));
        figures.capture = cmp;
        found.push({
          step: "capture",
          rule: "capture.agreement",
          verdict: cmp.similarity !== null && cmp.similarity >= 0.5 ? "pass" : "warn",
          title: "Uploaded capture agrees with the reference capture",
          measured: cmp.similarity === null ? "no variation to compare" : cmp.similarity.toFixed(2),
          limit: "≥ 0.50 correlation of downscaled luma",
          evidence: cmp.statement,
          advice: "If your capture comes from the same design, check it was recorded from reset at 60 Hz without effects added.",
        });
      }
      return { findings: found, figures };
    });
  }

  await reports;
  result.figures.stepMs = { ...stepMs };
  result.verdict = worstVerdict(result.findings);
  return result;
}

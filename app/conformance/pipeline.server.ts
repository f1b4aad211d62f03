import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { GdsiiError } from "~/gdsii/errors";
import { readLayoutFile } from "~/gdsii/reader.server";
import { checkLayout } from "~/layout/check-layout";
import { layoutMatchesSource, type SourceSide } from "~/layout/matches-source";
import { layoutPictureSvg } from "~/layout/layout-picture";
import { layoutThumbnailPng } from "~/layout/layout-thumbnail";
import { BundleError, extractBundle } from "~/sources/intake.server";
import { fetchRepositoryStep } from "~/sources/repository-step.server";
import { precheckPassed, precheckSources } from "~/sources/precheck.server";
import { runSourceChecks } from "~/sources/yosys.server";
import { compareVideoFile } from "~/simulation/compare-video.server";
import { runReferenceCapture } from "~/simulation/capture.server";
import { flashFindings } from "~/simulation/flash";
import { analyzeVideoFile } from "~/simulation/flash-video.server";
import { worstVerdict, type CheckStep, type Finding, type Verdict } from "~/rules/findings";
import type { Ruleset } from "~/rules/ruleset";

/**
 * The conformance check of one upload, shared by the worker and the `npm run check` CLI.
 * Order matters for safety: the bundle is unpacked with limits, then pre-checked on its text, and only a clean
 * pre-check lets yosys and verilator (both inside the sandbox) read it.
 */
export interface PipelineInput {
  ruleset: Ruleset;
  workDir: string;
  bundlePath?: string;
  /** Sources by repository link instead of a bundle: fetched first (app/sources/repository.server.ts), then taken as a bundle. */
  repository?: { url: string; commit: string; allowLoopback: boolean };
  layoutPath?: string;
  videoPath?: string;
  simulate: boolean;
  frames?: number;
  encode?: boolean;
  onStep?: (step: CheckStep) => Promise<void> | void;
}

export interface PipelineArtifact {
  kind: string;
  path: string;
  mediaType: string;
}

export interface PipelineResult {
  verdict: Verdict;
  findings: Finding[];
  figures: Record<string, unknown>;
  artifacts: PipelineArtifact[];
  skipped: { step: CheckStep; reason: string }[];
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

export async function runPipeline(input: PipelineInput): Promise<PipelineResult> {
  const { ruleset, workDir } = input;
  // Tools run as the sandbox user, who must be able to enter every folder they build in.
  mkdirSync(join(workDir, "scratch"), { recursive: true, mode: 0o755 });
  const findings: Finding[] = [];
  const figures: Record<string, unknown> = {};
  const artifacts: PipelineArtifact[] = [];
  const skipped: PipelineResult["skipped"] = [];
  const artifact = (kind: string, path: string | null | undefined) => {
    if (path) artifacts.push({ kind, path, mediaType: MEDIA[kind] ?? "application/octet-stream" });
  };

  // 0. A repository link: its commit is fetched into a tree archive, which the intake then takes like a bundle
  let bundlePath = input.bundlePath;
  if (input.repository) {
    await input.onStep?.("intake");
    const fetched = await fetchRepositoryStep(input.repository, ruleset, join(workDir, "repository"));
    findings.push(...fetched.findings);
    figures.repository = fetched.figures;
    bundlePath = fetched.archivePath ?? undefined;
  }

  // 1. Bundle intake
  let sourceDir: string | null = null;
  let verilogFiles: string[] = [];
  if (bundlePath) {
    await input.onStep?.("intake");
    try {
      const manifest = await extractBundle(bundlePath, join(workDir, "src"), ruleset.uploadLimits);
      sourceDir = join(workDir, "src");
      verilogFiles = manifest.verilogFiles;
      figures.intake = { format: manifest.format, files: manifest.files.length, verilogFiles: verilogFiles.length, sourceLines: manifest.sourceLines, totalBytes: manifest.totalBytes };
      findings.push(
        verilogFiles.length > 0
          ? { step: "intake", rule: "intake.bundle", verdict: "pass", title: "Source bundle unpacked within the limits", measured: `${manifest.files.length} files, ${manifest.totalBytes} bytes`, limit: `${ruleset.uploadLimits.bundleFiles} files, ${ruleset.uploadLimits.bundleUnpackedBytes} bytes` }
          : { step: "intake", rule: "intake.verilog", verdict: "fail", title: "The bundle holds no Verilog files", measured: 0, limit: "at least one .v or .sv", advice: "Put your design's .v files in the archive." },
      );
    } catch (e) {
      if (!(e instanceof BundleError)) throw e;
      findings.push({ step: "intake", rule: `intake.${e.code}`, verdict: "fail", title: "The source bundle was refused", evidence: e.message, advice: "Pack plain Verilog files into a .zip or .tar.gz without links, absolute paths or '..'." });
    }
  } else if (!input.repository) {
    skipped.push({ step: "intake", reason: "no source bundle in this upload" });
  }

  // 2. Pre-check, then 3. yosys — only on a bundle that unpacked
  let sourceClean = false;
  let synthesized: SourceSide | null = null;
  if (sourceDir && verilogFiles.length > 0) {
    await input.onStep?.("precheck");
    const pre = await precheckSources(sourceDir, verilogFiles, { scratchDir: join(workDir, "scratch") });
    findings.push(...pre);
    if (precheckPassed(pre)) {
      await input.onStep?.("source");
      const src = await runSourceChecks(sourceDir, verilogFiles, ruleset, { scratchDir: join(workDir, "scratch") });
      findings.push(...src.findings);
      figures.source = { ...src.figures, sourceLines: (figures.intake as { sourceLines?: number } | undefined)?.sourceLines ?? null };
      sourceClean = src.figures.top !== null && !src.findings.some((f) => f.rule.startsWith("source.top") && f.verdict === "fail");
      if (sourceClean && !src.findings.some((f) => f.rule === "source.yosys")) synthesized = src.figures;
    } else {
      skipped.push({ step: "source", reason: "the pre-check refused the source, so no tool read it" });
      skipped.push({ step: "simulation", reason: "the pre-check refused the source, so no tool read it" });
    }
  }

  // 4. Layout
  if (input.layoutPath) {
    await input.onStep?.("layout");
    try {
      // A .gds.gz is inflated on the fly and held to the same size limit as a plain layout.
      const summary = await readLayoutFile(input.layoutPath, { collectPlacements: 20_000, limits: { maxBytes: ruleset.uploadLimits.layoutBytes } });
      const checked = checkLayout(summary, ruleset);
      findings.push(...checked.findings);
      if (synthesized) findings.push(...layoutMatchesSource(synthesized, checked.figures, ruleset));
      else skipped.push({ step: "layout", reason: "no synthesized source to hold the layout against (flip-flops, ports)" });
      figures.layout = { ...checked.figures, topCells: summary.topCells, labels: summary.labels, instances: summary.instances, layers: summary.layers };
      const svgPath = join(workDir, "layout.svg");
      writeFileSync(svgPath, layoutPictureSvg(summary, ruleset, { dieUm: checked.figures.dieUm, title: summary.topCell ?? "layout" }));
      artifact("layout-svg", svgPath);
      const pngPath = join(workDir, "layout.png");
      writeFileSync(pngPath, layoutThumbnailPng(summary, ruleset, { dieUm: checked.figures.dieUm, widthPx: 480 }));
      artifact("layout-png", pngPath);
    } catch (e) {
      if (!(e instanceof GdsiiError)) throw e;
      findings.push({ step: "layout", rule: "layout.read", verdict: "fail", title: "The layout could not be read as GDSII", evidence: e.message, advice: "Export the layout again as a GDSII stream file (.gds, or gzip-compressed .gds.gz) and upload that file." });
    }
  } else {
    skipped.push({ step: "layout", reason: "no layout in this upload" });
  }

  // 5. Reference capture
  let referenceLuma: Awaited<ReturnType<typeof runReferenceCapture>>["referenceLuma"] = null;
  if (input.simulate && sourceDir && sourceClean) {
    await input.onStep?.("simulation");
    const cap = await runReferenceCapture({ sourceDir, verilogFiles, ruleset, workDir: join(workDir, "sim"), frames: input.frames, encode: input.encode ?? true });
    findings.push(...cap.findings);
    figures.video = cap.video;
    figures.audio = cap.audio;
    figures.speed = cap.speed;
    figures.flash = cap.flash ? { verdict: cap.flash.passes ? "pass" : ruleset.flashCheck.action === "block" ? "fail" : "warn", worstSecondFlashes: Math.max(cap.flash.general.worstFlashes, cap.flash.red.worstFlashes), report: cap.flash } : null;
    artifact("first-frame", cap.files.firstFramePng);
    artifact("contact-sheet", cap.files.contactSheetPng);
    artifact("wav", cap.files.wav);
    artifact("waveform", cap.files.waveformSvg);
    artifact("webm", cap.files.webm);
    artifact("mp4", cap.files.mp4);
    referenceLuma = cap.referenceLuma;
  } else if (input.simulate && sourceDir && !skipped.some((s) => s.step === "simulation")) {
    skipped.push({ step: "simulation", reason: "the source checks did not find the top module" });
  }

  // 6. The entrant's capture video: flash safety, and agreement with the reference
  if (input.videoPath) {
    await input.onStep?.("capture");
    const flash = await analyzeVideoFile(input.videoPath, { workDir: join(workDir, "upload-video") });
    findings.push(...flashFindings(flash, ruleset, "uploaded capture video", 160, 120).map((f) => ({ ...f, step: "capture" as const, rule: f.rule.replace(/^flash\./, "capture.flash.") })));
    figures.captureFlash = { verdict: flash.passes ? "pass" : "warn", worstSecondFlashes: Math.max(flash.general.worstFlashes, flash.red.worstFlashes) };
    if (referenceLuma) {
      const cmp = await compareVideoFile(input.videoPath, referenceLuma, join(workDir, "compare"));
      figures.capture = cmp;
      findings.push({
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
  }

  return { verdict: worstVerdict(findings), findings, figures, artifacts, skipped };
}

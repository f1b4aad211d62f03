import { GdsiiError } from "~/gdsii/errors";
import type { CheckStep, Finding } from "~/rules/findings";
import { BundleError } from "~/sources/bundle-error";
import { CompareError } from "~/simulation/compare";
import { VideoDecodeError } from "~/simulation/video-decode.server";

/**
 * When a check step throws, whose fault was it? An upload that cannot be read is the entrant's: it becomes a
 * failing finding of that step and is never retried (the same bytes fail the same way). Anything else — a tool
 * that would not start, the store or the database gone — is Gatecrash's: the step gets a finding saying so, the
 * other steps' findings stay, and the run is tried again.
 */
export function inputFaultFinding(step: CheckStep, error: unknown): Finding | null {
  if (error instanceof BundleError) {
    return { step, rule: `intake.${error.code}`, verdict: "fail", title: "The source bundle was refused", evidence: error.message, advice: "Pack plain Verilog files into a .zip or .tar.gz without links, absolute paths or '..'." };
  }
  if (error instanceof GdsiiError) {
    return { step, rule: "layout.read", verdict: "fail", title: "The layout could not be read as GDSII", evidence: error.message, advice: "Export the layout again as a GDSII stream file (.gds, or gzip-compressed .gds.gz) and upload that file." };
  }
  if (step === "capture" && (error instanceof VideoDecodeError || error instanceof CompareError)) {
    const log = error instanceof VideoDecodeError && error.log ? `: ${error.log.trim().split("\n").slice(-3).join(" / ")}` : "";
    return {
      step,
      rule: "capture.video.unreadable",
      verdict: "fail",
      title: "The capture video could not be read",
      evidence: `${error.message}${log}`.slice(0, 1500),
      advice: "Export the capture again as WebM (VP8/VP9) or MP4 (H.264) and upload it; the source and layout results above stand.",
    };
  }
  return null;
}

/** The finding a step gets when Gatecrash itself failed it. Not the entrant's fault, so it does not fail the entry. */
export function internalFaultFinding(step: CheckStep, error: unknown): Finding {
  const message = error instanceof Error ? error.message : String(error);
  return {
    step,
    rule: `${step}.internal`,
    verdict: "warn",
    title: "Gatecrash could not finish this step",
    evidence: message.slice(0, 1500),
    advice: "This is a fault on Gatecrash's side, not in your upload. The check is tried again by itself; the organizers see it too.",
  };
}

/** One measured rule of a check run. */
export type Verdict = "pass" | "warn" | "fail";

export type CheckStep = "intake" | "precheck" | "source" | "layout" | "simulation" | "flash" | "capture";

export interface Finding {
  step: CheckStep;
  /** Stable rule id, e.g. "source.ports.missing", "layout.die.size", "video.hsync.pulse". */
  rule: string;
  verdict: Verdict;
  /** Human summary of the rule, one line. */
  title: string;
  measured?: string | number | null;
  limit?: string | number | null;
  /** Where and why: file:line, a cell name, a frame number. */
  evidence?: string;
  /** What the entrant can do about a warn or a fail. */
  advice?: string;
}

export function worstVerdict(findings: Pick<Finding, "verdict">[]): Verdict {
  if (findings.some((f) => f.verdict === "fail")) return "fail";
  if (findings.some((f) => f.verdict === "warn")) return "warn";
  return "pass";
}

import type { EntryCheck } from "~/conformance/report-types";
import { stepLabel } from "./steps";

const VERDICT: Record<string, string> = { pass: "bg-pass-soft text-pass", warn: "bg-warn-soft text-warn", fail: "bg-fail-soft text-fail" };

function waiting(run: NonNullable<EntryCheck["run"]>): string {
  if (run.state === "queued") return run.queue ? `queued, place ${run.queue.place} in line` : "queued";
  if (run.state === "running") return run.step ? `running: ${stepLabel(run.step)}` : "running";
  return run.state;
}

/** The one-line summary in the entry page's header card; it reads the same live state as the report panel. */
export function LatestCheckLine({ check }: { check: EntryCheck | null }) {
  if (!check) return <span data-testid="check-verdict">no upload yet</span>;
  const run = check.run;
  if (run?.verdict) {
    const fails = check.findings.filter((f) => f.verdict === "fail").length;
    const warns = check.findings.filter((f) => f.verdict === "warn").length;
    return (
      <span className={`rounded-full px-2 py-0.5 text-xs font-semibold ${VERDICT[run.verdict]}`} data-testid="check-verdict" data-state={run.state}>
        {run.verdict} · upload #{check.uploadNumber} · {fails} fail, {warns} warn
      </span>
    );
  }
  return (
    <span data-testid="check-verdict" data-state={run?.state ?? "none"}>
      {run ? waiting(run) : "not queued"} (upload #{check.uploadNumber})
    </span>
  );
}

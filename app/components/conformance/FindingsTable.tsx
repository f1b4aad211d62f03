import type { EntryCheck } from "~/conformance/report-types";
import { VerdictBadge } from "./VerdictBadge";

const STEP_TITLES: Record<string, string> = {
  intake: "Source bundle",
  precheck: "Pre-check (before any tool reads the source)",
  source: "Source checks (yosys)",
  layout: "Layout (GDSII)",
  simulation: "Reference capture: VGA timing",
  flash: "Flash safety of the reference capture",
  capture: "Your capture video",
};

/** One row per rule: verdict, what was measured against what limit, and what to do about a failure. */
export function FindingsTable({ findings }: { findings: EntryCheck["findings"] }) {
  const steps = [...new Set(findings.map((f) => f.step))];
  return (
    <div className="space-y-6">
      {steps.map((step) => (
        <section key={step} aria-labelledby={`step-${step}`}>
          <h3 id={`step-${step}`} className="mb-2 text-sm font-bold uppercase tracking-wide text-ink-soft">
            {STEP_TITLES[step] ?? step}
          </h3>
          <table className="w-full border-collapse text-sm">
            <thead className="sr-only">
              <tr>
                <th>Verdict</th>
                <th>Rule</th>
                <th>Measured</th>
                <th>Limit</th>
              </tr>
            </thead>
            <tbody>
              {findings
                .filter((f) => f.step === step)
                .map((f, i) => (
                  <tr key={`${f.rule}-${i}`} className="border-t border-line align-top" data-rule={f.rule} data-verdict={f.verdict}>
                    <td className="w-28 py-2 pr-2">
                      <VerdictBadge verdict={f.verdict} />
                    </td>
                    <td className="py-2 pr-2">
                      <div className="font-medium">{f.title}</div>
                      {f.evidence && <div className="mt-0.5 text-xs text-mute">{f.evidence}</div>}
                      {f.verdict !== "pass" && f.advice && <div className="mt-1 text-xs font-medium text-ink-soft">What to do: {f.advice}</div>}
                    </td>
                    <td className="py-2 pr-2 font-mono text-xs">{f.measured ?? "—"}</td>
                    <td className="py-2 font-mono text-xs text-mute">{f.limit ?? ""}</td>
                  </tr>
                ))}
            </tbody>
          </table>
        </section>
      ))}
    </div>
  );
}

import { Form } from "react-router";
import type { UploadComparison } from "~/entries/compare";
import { VerdictBadge } from "./conformance/VerdictBadge";

/** Two uploads side by side: pick them (a GET form, so the comparison has its own link), then figures and findings. */
export function UploadCompare({ uploads, comparison }: { uploads: number[]; comparison: UploadComparison | null }) {
  const [newest, previous] = uploads;
  return (
    <section className="card mt-8" aria-labelledby="compare-heading">
      <h2 id="compare-heading" className="mb-2 text-lg font-bold">Compare two uploads</h2>
      <Form method="get" className="flex flex-wrap items-end gap-3" preventScrollReset>
        <label className="text-sm">
          <span className="label">Upload</span>
          <select name="a" className="field" defaultValue={comparison?.a.number ?? previous}>
            {uploads.map((n) => <option key={n} value={n}>#{n}</option>)}
          </select>
        </label>
        <label className="text-sm">
          <span className="label">against upload</span>
          <select name="b" className="field" defaultValue={comparison?.b.number ?? newest}>
            {uploads.map((n) => <option key={n} value={n}>#{n}</option>)}
          </select>
        </label>
        <button type="submit" className="btn-quiet">Compare</button>
      </Form>
      {comparison && (
        <div className="mt-4 overflow-x-auto" data-testid="upload-comparison">
          <table className="w-full border-collapse text-sm">
            <caption className="mb-2 text-left text-ink-soft">
              Upload #{comparison.a.number} ({comparison.a.verdict ?? comparison.a.state ?? "not checked"}) against #{comparison.b.number} ({comparison.b.verdict ?? comparison.b.state ?? "not checked"}). Rows that differ are marked ≠.
            </caption>
            <thead>
              <tr className="text-left text-xs text-mute">
                <th scope="col" className="py-1 pr-2 font-medium">Figure or rule</th>
                <th scope="col" className="py-1 pr-2 font-medium">#{comparison.a.number}</th>
                <th scope="col" className="py-1 pr-2 font-medium">#{comparison.b.number}</th>
                <th scope="col" className="py-1 font-medium"><span className="sr-only">Changed</span></th>
              </tr>
            </thead>
            <tbody>
              {comparison.figures.map((f) => (
                <tr key={f.label} className={`border-t border-line ${f.changed ? "bg-warn-soft/40" : ""}`} data-figure={f.label}>
                  <th scope="row" className="py-1 pr-2 text-left font-medium">{f.label}</th>
                  <td className="py-1 pr-2 font-mono text-xs break-all">{f.a}</td>
                  <td className="py-1 pr-2 font-mono text-xs break-all">{f.b}</td>
                  <td className="py-1" aria-label={f.changed ? "changed" : "same"}>{f.changed ? "≠" : ""}</td>
                </tr>
              ))}
              {comparison.findings.map((f) => (
                <tr key={f.rule} className={`border-t border-line align-top ${f.changed ? "bg-warn-soft/40" : ""}`} data-rule={f.rule}>
                  <th scope="row" className="py-1 pr-2 text-left font-normal">
                    {f.title} <span className="block font-mono text-xs text-mute">{f.rule}</span>
                  </th>
                  {[f.a, f.b].map((side, i) => (
                    <td key={i} className="py-1 pr-2">
                      {side ? <><VerdictBadge verdict={side.verdict} /> <span className="text-xs">{side.measured ?? ""}</span></> : <span className="text-mute">—</span>}
                    </td>
                  ))}
                  <td className="py-1" aria-label={f.changed ? "changed" : "same"}>{f.changed ? "≠" : ""}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </section>
  );
}

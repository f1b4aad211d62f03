import type { StandingRow } from "~/results/shapes";

/** The standings table shared by the public results page and the organizer's preview. */

const f = (n: number | null, d = 3) => (n === null ? "—" : n.toFixed(d));

export function ShowcaseStandings({ rows, juryPct, audiencePct, caption }: { rows: StandingRow[]; juryPct: number; audiencePct: number; caption: string }) {
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-sm" data-testid="standings">
        <caption className="mb-2 text-left text-sm text-mute">{caption}</caption>
        <thead>
          <tr className="text-left text-xs uppercase tracking-wider text-mute">
            <th scope="col" className="py-2 pr-3">Place</th>
            <th scope="col" className="pr-3">Entry</th>
            <th scope="col" className="pr-3">Crew</th>
            <th scope="col" className="pr-3 text-right">Mixed</th>
            <th scope="col" className="pr-3 text-right">Jury ({juryPct} %)</th>
            <th scope="col" className="text-right">Audience ({audiencePct} %)</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.entryId} className="border-t border-line" data-testid="standing-row">
              <td className="py-2 pr-3 text-lg font-extrabold tabular-nums">
                {r.place}
                {r.tied && <span title="shared place">=</span>}
              </td>
              <td className="pr-3 font-semibold">{r.title}</td>
              <td className="pr-3 text-ink-soft">{r.crew}</td>
              <td className="pr-3 text-right font-semibold tabular-nums">{f(r.mixed)}</td>
              <td className="pr-3 text-right tabular-nums">
                {f(r.jury.score)} <span className="text-xs text-mute">({r.jury.place ?? "—"})</span>
              </td>
              <td className="text-right tabular-nums">
                {f(r.audience.score, 2)} <span className="text-xs text-mute">({r.audience.place ?? "—"})</span>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

export function PrizeCaution() {
  return (
    <p className="rounded-md border border-line bg-card p-3 text-sm text-ink-soft" data-testid="money-caution">
      <strong>Prizes and money:</strong> fees, refunds, taxes and prize rules follow local law. Gatecrash gives no legal advice.
    </p>
  );
}

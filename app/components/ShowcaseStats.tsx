import type { PublicStats } from "~/showcase/shapes";

/** The public figures of an entry, as a definition list. Values arrive from the loader; missing ones say so. */
const n = (v: number | null) => (v === null ? "not measured yet" : v.toLocaleString("en"));

export function ShowcaseStats({ stats, tone = "light", compact = false }: { stats: PublicStats; tone?: "light" | "dark"; compact?: boolean }) {
  const rows: [string, string][] = [
    ["Flip-flops", n(stats.flipFlops)],
    ["Cells", n(stats.cells)],
    ["Tile", stats.tileShape ?? (stats.tileSizeUm ? "—" : "not measured yet")],
    ["Size", stats.tileSizeUm ? `${stats.tileSizeUm.width.toFixed(0)} × ${stats.tileSizeUm.height.toFixed(0)} µm` : "not measured yet"],
    ["Tile use", stats.utilization === null ? "not measured yet" : `${(stats.utilization * 100).toFixed(1)} %`],
    ["Source lines", n(stats.sourceLines)],
  ];
  const dt = tone === "dark" ? "text-white/60" : "text-mute";
  return (
    <dl className={`grid ${compact ? "grid-cols-3 gap-3" : "grid-cols-2 gap-x-6 gap-y-2 sm:grid-cols-3"}`} data-testid="entry-stats">
      {rows.map(([k, v]) => (
        <div key={k}>
          <dt className={`text-xs font-semibold uppercase tracking-wider ${dt}`}>{k}</dt>
          <dd className="font-semibold tabular-nums">{v}</dd>
        </div>
      ))}
    </dl>
  );
}

export function VerdictPill({ verdict, state }: { verdict: "pass" | "warn" | "fail" | null; state: string }) {
  if (state !== "done" || verdict === null) {
    const label = state === "error" ? "Check could not finish" : state === "none" ? "Not checked yet" : "Check running";
    return <span className="inline-block rounded-full bg-line px-2.5 py-0.5 text-xs font-semibold text-ink-soft">{label}</span>;
  }
  const cls = verdict === "pass" ? "bg-pass-soft text-pass" : verdict === "warn" ? "bg-warn-soft text-warn" : "bg-fail-soft text-fail";
  const label = verdict === "pass" ? "Within the rules" : verdict === "warn" ? "Within the rules, with warnings" : "Breaks a rule";
  return <span className={`inline-block rounded-full px-2.5 py-0.5 text-xs font-semibold ${cls}`}>{label}</span>;
}

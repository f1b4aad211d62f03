const LABELS: Record<string, { label: string; cls: string }> = {
  draft: { label: "Draft", cls: "bg-line text-ink-soft" },
  open: { label: "Open for entries", cls: "bg-signal-soft text-signal" },
  closed: { label: "Closed", cls: "bg-line text-ink" },
  judging: { label: "Judging", cls: "bg-violet-soft text-violet" },
  results: { label: "Results out", cls: "bg-pass-soft text-pass" },
};

export function StateBadge({ state }: { state: string }) {
  const s = LABELS[state] ?? { label: state, cls: "bg-line text-ink" };
  return <span className={`inline-block rounded-full px-2.5 py-0.5 text-xs font-semibold ${s.cls}`}>{s.label}</span>;
}

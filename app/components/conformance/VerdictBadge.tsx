/** A verdict shown by word and shape as well as colour, so it reads without colour vision. */
const STYLE = {
  pass: { label: "Pass", glyph: "✓", cls: "bg-pass-soft text-pass border-pass" },
  warn: { label: "Warning", glyph: "!", cls: "bg-warn-soft text-warn border-warn" },
  fail: { label: "Fail", glyph: "✕", cls: "bg-fail-soft text-fail border-fail" },
} as const;

export type VerdictValue = keyof typeof STYLE;

export function VerdictBadge({ verdict, large }: { verdict: VerdictValue; large?: boolean }) {
  const s = STYLE[verdict];
  return (
    <span className={`inline-flex items-center gap-1 rounded-full border px-2 py-0.5 font-semibold ${large ? "text-base" : "text-xs"} ${s.cls}`}>
      <span aria-hidden="true">{s.glyph}</span>
      {s.label}
    </span>
  );
}

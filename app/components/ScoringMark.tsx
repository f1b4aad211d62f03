import type { SaveStatus } from "~/judging/autosave";

/**
 * The save mark beside a grid cell. Each state has its own glyph as well as its own colour, so it reads
 * without colour vision, and a text for screen readers.
 */
const MARKS: Record<SaveStatus, { glyph: string; text: string; cls: string }> = {
  saved: { glyph: "✓", text: "saved", cls: "text-pass" },
  saving: { glyph: "…", text: "saving", cls: "text-mute" },
  unsaved: { glyph: "○", text: "not saved yet, retrying", cls: "text-warn" },
  failed: { glyph: "!", text: "not saved: refused", cls: "text-fail" },
  conflict: { glyph: "⇄", text: "changed elsewhere", cls: "text-warn" },
};

export function ScoringMark({ status }: { status: SaveStatus }) {
  const m = MARKS[status];
  return (
    <span className={`inline-block w-3 text-center text-xs font-bold ${m.cls}`} title={m.text} data-mark={status}>
      <span aria-hidden="true">{m.glyph}</span>
      <span className="sr-only">{m.text}</span>
    </span>
  );
}

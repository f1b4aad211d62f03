/**
 * Reads the check run's figures for the judge's entry page, tolerant of steps that have not run yet. Pure.
 */
export const FIGURE_SECTIONS = [
  ["source", "Source"],
  ["layout", "Layout"],
  ["video", "Video timing"],
  ["audio", "Audio"],
  ["speed", "Simulation speed"],
] as const;

/** The primitive figures of one section as label/value pairs (nested objects and long lists are left out). */
export function figureRows(figures: Record<string, unknown> | null | undefined, section: string): { label: string; value: string }[] {
  const s = figures?.[section];
  if (!s || typeof s !== "object" || Array.isArray(s)) return [];
  const out: { label: string; value: string }[] = [];
  for (const [k, v] of Object.entries(s as Record<string, unknown>)) {
    if (typeof v === "number") out.push({ label: humanise(k), value: Number.isInteger(v) ? v.toLocaleString("en") : v.toFixed(3) });
    else if (typeof v === "string" && v.length < 80) out.push({ label: humanise(k), value: v });
    else if (typeof v === "boolean") out.push({ label: humanise(k), value: v ? "yes" : "no" });
  }
  return out;
}

function humanise(key: string): string {
  const spaced = key.replace(/([a-z0-9])([A-Z])/g, "$1 $2").replace(/[_-]+/g, " ");
  return spaced.charAt(0).toUpperCase() + spaced.slice(1).toLowerCase().replace(/\bum\b/g, "µm");
}

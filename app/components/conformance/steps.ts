/** The check's steps in order, with the short names the progress line and the header use. */
export const CHECK_STEPS = [
  ["intake", "Unpack"],
  ["precheck", "Pre-check"],
  ["source", "yosys"],
  ["layout", "Layout"],
  ["simulation", "Simulate"],
  ["capture", "Capture video"],
] as const;

export function stepLabel(step: string): string {
  return CHECK_STEPS.find(([id]) => id === step)?.[1] ?? step;
}

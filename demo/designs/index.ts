import { fileURLToPath } from "node:url";

/**
 * The demo scenario's entries for "Voltage Drop 2027" (an invented party; every crew,
 * handle, title and description here is invented demo data). Each entry is one
 * self-contained Verilog file in this folder with top module `gc_entry`.
 * Four entries obey every rule of DEMO_RULESET; four each break exactly one rule, so the
 * conformance check has something real to catch.
 */
export type DesignRuleBreak = "latch" | "hsync-polarity" | "system-task" | "extra-port";
export type DemoCompetition = "open" | "judging";

export interface DemoDesign {
  slug: string;
  title: string;
  crew: string;
  /** One or two sentences in the entrant's own voice. */
  description: string;
  /** What the picture does, for listings and alt text. */
  effect: string;
  /** The one rule this entry breaks on purpose, or null if it passes every rule. */
  breaks: DesignRuleBreak | null;
  competition: DemoCompetition;
}

export const DEMO_DESIGNS: DemoDesign[] = [
  {
    slug: "xor-tide",
    title: "Tidal XOR",
    crew: "Parity Goats",
    description: "We bent an XOR lattice over a swell and let three triangle waves paint it. Four chords of arpeggio, because goats like to climb.",
    effect: "XOR lattice warped by a travelling swell, coloured by a three-wave plasma",
    breaks: null,
    competition: "judging",
  },
  {
    slug: "copper-sine",
    title: "Copper Kelp",
    crew: "Kelp Logic",
    description: "Six shaded raster bars on a sine we grew from a parabola, over kelp columns that sway line by line. The bass line is a pulse wave, no samples harmed.",
    effect: "shaded raster bars on a sine curve over swaying columns",
    breaks: null,
    competition: "judging",
  },
  {
    slug: "checker-zoom",
    title: "Mole Floor Spin",
    crew: "Quartz Mole Society",
    description: "A checkerboard floor that spins and breathes, two adders walking texture space along the beam. It chimes every half second so you know it is still turning.",
    effect: "rotating and zooming checkerboard (rotozoomer without per-pixel multiplies)",
    breaks: null,
    competition: "judging",
  },
  {
    slug: "lfsr-stars",
    title: "Night Shift Orbit",
    crew: "Tinfoil Orchard",
    description: "Four layers of stars from one shift register drift past a banded planet. The triangle tune comes out of a one-bit sigma-delta, so filter it gently.",
    effect: "parallax LFSR starfield behind a shaded, banded planet",
    breaks: null,
    competition: "judging",
  },
  {
    slug: "ring-pond",
    title: "Oxbow Ripples",
    crew: "Oxbow Static",
    description: "Two stones wander across a pond and their rings cross into moire. Our bench monitor didn't mind which way hsync pointed.",
    effect: "interfering ripple rings from two moving centres, by squared distance",
    breaks: "hsync-polarity",
    competition: "judging",
  },
  {
    slug: "bounce-trail",
    title: "Salt Bounce",
    crew: "Brine Circuit",
    description: "A box bounces off every wall and drags a rainbow of ghosts behind it. Each bounce blips, higher off the sides than off the floor.",
    effect: "bouncing box with a four-ghost rainbow trail over a scrolling grid",
    breaks: "latch",
    competition: "open",
  },
  {
    slug: "block-scroller",
    title: "Ferret Mail",
    crew: "Lumen Ferrets",
    description: "A bouncing scroller in block letters we drew ourselves, mirrored in rippling water. Sixteen staccato notes, then round again.",
    effect: "sine-bobbing scroller of invented block letters with a water reflection",
    breaks: "system-task",
    competition: "open",
  },
  {
    slug: "munch-squares",
    title: "Munch Ado",
    crew: "Sleepy Carry Flag",
    description: "Munching squares eat the screen in nested XOR squares and then give it back. We added a beat lamp output for the stage.",
    effect: "munching-squares XOR threshold pattern, colour-cycled by age",
    breaks: "extra-port",
    competition: "open",
  },
];

/** Absolute path of a demo design's Verilog file. */
export function designPath(slug: string): string {
  if (!DEMO_DESIGNS.some((d) => d.slug === slug)) throw new Error(`unknown demo design "${slug}"`);
  return fileURLToPath(new URL(`./${slug}.v`, import.meta.url));
}

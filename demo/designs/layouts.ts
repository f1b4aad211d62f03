import { generateDemoLayout, type DemoLayout } from "../../tests/support/demo-layout";
import { DEMO_PINS, DEMO_RULESET, type Pin } from "../../app/rules/ruleset";
import { DEMO_DESIGNS } from "./index";

/**
 * The demo entries' layouts must be their designs: each places the flip-flops its Verilog synthesizes to
 * (yosys 0.23, `synth -flatten`, as the source checks run it) and labels exactly its top-level ports.
 * layouts.test.ts holds these numbers against yosys, so they cannot drift from the sources.
 */
export const DEMO_FLIP_FLOPS: Record<string, number> = {
  "xor-tide": 58,
  "copper-sine": 121,
  "checker-zoom": 149,
  "lfsr-stars": 87,
  "ring-pond": 61,
  "bounce-trail": 151,
  "block-scroller": 79,
  "munch-squares": 53,
};

/** Ports beyond the pin list (the extra-port breaker's stage lamp). */
const EXTRA_PORTS: Record<string, Pin[]> = {
  "munch-squares": [{ name: "beat_led", direction: "output", width: 1, role: "unused" }],
};

/** Mostly single tiles; one crew took two tiles side by side. */
const LAYOUT_SHAPES: Record<string, string> = { "copper-sine": "wide" };

export function demoPortsOf(slug: string): Pin[] {
  return [...DEMO_PINS, ...(EXTRA_PORTS[slug] ?? [])];
}

/** The GDSII layout a demo entry is seeded with. */
export function demoEntryLayout(slug: string): DemoLayout {
  const index = DEMO_DESIGNS.findIndex((d) => d.slug === slug);
  if (index < 0 || DEMO_FLIP_FLOPS[slug] === undefined) throw new Error(`unknown demo design "${slug}"`);
  return generateDemoLayout({
    ruleset: DEMO_RULESET,
    shape: LAYOUT_SHAPES[slug] ?? "single",
    flipFlops: DEMO_FLIP_FLOPS[slug],
    ports: demoPortsOf(slug),
    logicCells: 300 + 40 * index,
    seed: index + 1,
    libName: slug,
  });
}

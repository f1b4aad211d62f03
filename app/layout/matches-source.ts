import type { Finding } from "~/rules/findings";
import type { Ruleset } from "~/rules/ruleset";

/**
 * Is the layout the design the source describes? Held side by side: the flip-flops yosys counted against the
 * flip-flop cells the layout places (a place-and-route flow adds none, but may duplicate some for fan-out, so
 * the ruleset allows a share of difference), and the source's top-level ports against the labels on the pin
 * layer (every port labelled, no label that names no port). The top cell's name is checked with the layout.
 */
export interface SourceSide {
  flipFlops: number;
  ports: { name: string; width: number }[];
}

export interface LayoutSide {
  flipFlops: number;
  /** Distinct texts of the labels on the ruleset's pin layer. */
  pinLayerLabels: string[];
}

export function layoutMatchesSource(source: SourceSide, layout: LayoutSide, ruleset: Ruleset): Finding[] {
  return [flipFlopFinding(source.flipFlops, layout.flipFlops, ruleset.layoutMatch.flipFlopTolerancePct), portFinding(source.ports, layout.pinLayerLabels)];
}

function flipFlopFinding(fromSource: number, inLayout: number, tolerancePct: number): Finding {
  const allowed = (fromSource * tolerancePct) / 100;
  const difference = inLayout - fromSource;
  const ok = Math.abs(difference) <= allowed;
  const share = fromSource > 0 ? ` (${difference > 0 ? "+" : ""}${((difference / fromSource) * 100).toFixed(1)} %)` : "";
  return {
    step: "layout",
    rule: "layout.matches.flipflops",
    verdict: ok ? "pass" : "fail",
    title: "The layout places the flip-flops the source synthesizes to",
    measured: inLayout,
    limit: `${fromSource} ± ${tolerancePct} %`,
    evidence: `synthesis of the source: ${fromSource} flip-flops; flip-flop cells in the layout: ${inLayout}${share}`,
    advice: ok
      ? undefined
      : `Upload the layout made from this source: it should hold ${fromSource} flip-flops (within ${tolerancePct} %), not ${inLayout}.`,
  };
}

/** A port is labelled once by its name, or on every bit as name[i] (the convention of the layout checks). */
function portFinding(ports: SourceSide["ports"], labels: string[]): Finding {
  const present = new Set(labels);
  const expected = new Set<string>();
  const unlabelled: string[] = [];
  for (const port of ports) {
    const bits = port.width === 1 ? [] : Array.from({ length: port.width }, (_, i) => `${port.name}[${i}]`);
    expected.add(port.name);
    bits.forEach((b) => expected.add(b));
    const labelled = present.has(port.name) || (bits.length > 0 && bits.every((b) => present.has(b)));
    if (!labelled) unlabelled.push(port.name);
  }
  const extra = labels.filter((l) => !expected.has(l)).sort();
  const ok = unlabelled.length === 0 && extra.length === 0;
  const evidence = [
    unlabelled.length ? `ports of the source without a label: ${list(unlabelled)}` : "",
    extra.length ? `labels that name no port of the source: ${list(extra)}` : "",
  ].filter(Boolean);
  return {
    step: "layout",
    rule: "layout.matches.ports",
    verdict: ok ? "pass" : "fail",
    title: "The layout's pin labels are the source's top-level ports",
    measured: `${ports.length - unlabelled.length} of ${ports.length} ports labelled, ${extra.length} extra labels`,
    limit: "every port labelled, no other label",
    evidence: evidence.length ? evidence.join("; ") : undefined,
    advice: ok ? undefined : "Upload the layout made from this source, or make the source's ports and the layout's pin labels agree.",
  };
}

function list(names: string[]): string {
  return names.length > 20 ? `${names.slice(0, 20).join(", ")} …` : names.join(", ");
}

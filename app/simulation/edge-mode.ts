/**
 * Whether the harness may skip the model's evaluation on the falling clock edge.
 *
 * The harness samples outputs after each rising edge, so evaluating the model again with the clock low only
 * matters when something in the design reacts to the clock falling, or to a signal derived from the clock
 * (a gated or divided clock). Skipping that second evaluation saves a large share of each cycle on small
 * designs, so it is done only when the model verilator generated proves it safe: every activation trigger
 * is the clock's rising edge or an edge of the reset input (which the harness only changes between full
 * evaluations). Anything else — an unknown verilator version's wording included — keeps both evaluations.
 */
export type EdgeMode = "rising-only" | "both-edges";

const TRIGGER_FUNCTION = /void\s+\w+___eval_triggers__act\s*\(\s*\w+\*\s*vlSelf\s*\)\s*\{/g;

function squash(text: string): string {
  return text.replace(/\s+/g, "");
}

/** The body of the activation-trigger function, or null when there is not exactly one. */
function triggerBody(source: string): string | null {
  const starts = [...source.matchAll(TRIGGER_FUNCTION)];
  if (starts.length !== 1) return null;
  let depth = 1;
  const from = starts[0].index! + starts[0][0].length;
  for (let i = from; i < source.length; i++) {
    if (source[i] === "{") depth++;
    else if (source[i] === "}" && --depth === 0) return source.slice(from, i);
  }
  return null;
}

/**
 * `modelSource`: the concatenated fast-path C++ verilator wrote for the model (obj/*DepSet*.cpp without
 * the __Slow files). `clock` and `reset` are the top-level pin names.
 */
export function edgeModeOf(modelSource: string, clock: string, reset: string | null): EdgeMode {
  const body = triggerBody(modelSource);
  if (body === null) return "both-edges";
  const rising = squash(`((IData)(vlSelf->${clock}) & (~ (IData)(vlSelf->__Vtrigrprev__TOP__${clock})))`);
  const allowedSignals = new Set([clock, `__Vtrigrprev__TOP__${clock}`, "__VactTriggered"]);
  if (reset) allowedSignals.add(reset).add(`__Vtrigrprev__TOP__${reset}`);

  // verilator's boilerplate in every function body; what is left must be trigger assignments only
  const statements = body
    .replace(/#ifdef VL_DEBUG[\s\S]*?#endif/g, "")
    .replace(/\/\/[^\n]*/g, "")
    .replace(/^\s*VL_DEBUG_IF\(.*\);\s*$/gm, "")
    .replace(/if\s*\(\s*false\s*&&\s*vlSelf\s*\)\s*\{\s*\}/g, "")
    .replace(/\w+__Syms\*\s*const\s+__restrict\s+vlSymsp\s+VL_ATTR_UNUSED\s*=\s*vlSelf->vlSymsp\s*;/g, "")
    .split(";")
    .map(squash)
    .filter((stmt) => stmt !== "");

  let sawRising = false;
  for (const stmt of statements) {
    const signals = [...stmt.matchAll(/vlSelf->(\w+)/g)].map((m) => m[1]);
    if (signals.some((s) => !allowedSignals.has(s))) return "both-edges";
    const prevUpdate = /^vlSelf->__Vtrigrprev__TOP__(\w+)=vlSelf->(\w+)$/.exec(stmt);
    if (prevUpdate) {
      if (prevUpdate[1] !== prevUpdate[2]) return "both-edges";
      continue;
    }
    if (!/^vlSelf->__VactTriggered\.at\(\d+U\)=/.test(stmt)) return "both-edges";
    const withoutRising = stmt.split(rising).join("");
    if (withoutRising !== stmt) sawRising = true;
    // once the rising-edge terms are taken out, nothing may look at the clock any more
    const left = [...withoutRising.matchAll(/vlSelf->(\w+)/g)].map((m) => m[1]);
    if (left.includes(clock) || left.includes(`__Vtrigrprev__TOP__${clock}`)) return "both-edges";
  }
  return sawRising ? "rising-only" : "both-edges";
}

/** The header the harness includes to learn the mode. */
export function edgeModeHeader(mode: EdgeMode): string {
  return `// Written by Gatecrash after reading the generated model; see app/simulation/edge-mode.ts.\n#define GC_RISING_ONLY ${mode === "rising-only" ? 1 : 0}\n`;
}

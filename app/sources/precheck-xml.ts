import type { Finding } from "~/rules/findings";
import { ALLOWED_SYSTEM_FUNCTIONS } from "./precheck-rules";

/**
 * Element names that verilator 5.006 --xml-only writes for system tasks and functions, and for
 * `$c` C++ text. Observed by running it on a test design that used each of them (not from its manual).
 * The allowed functions ($signed, $unsigned, $clog2, $bits) are folded into constants or casts.
 */
const SYSTEM_ELEMENTS = new Set([
  "systemt", "systemf", "display", "sformat", "sformatf", "fopen", "fclose", "fflush", "feof", "fgetc", "fgets",
  "fscanf", "sscanf", "fread", "fseek", "ftell", "frewind", "fungetc", "readmem", "writemem", "finish", "stop",
  "dumpctl", "printtimescale", "timeformat", "testplusargs", "valueplusargs", "rand", "urandom", "urandomrange",
  "time", "timed", "countones", "onehot", "onehot0", "isunknown", "sqrtd", "istord", "rtois", "itord",
  "ucstmt", "ucfunc", "cstmt", "cmath", "cexpr", "text",
]);

const ALLOWED_LIST = ALLOWED_SYSTEM_FUNCTIONS.map((n) => `$${n}`).join(", ");

export function scanVerilatorXml(xml: string, fileName: (reported: string) => string): Finding[] {
  const files = new Map<string, string>();
  for (const m of xml.matchAll(/<file id="([^"]+)" filename="([^"]*)"/g)) files.set(m[1], fileName(unescapeXml(m[2])));
  const place = (loc: string | undefined) => {
    const [id, line] = (loc ?? "").split(",");
    return `${files.get(id) ?? "?"}:${line ?? "?"}`;
  };
  const findings: Finding[] = [];
  for (const m of xml.matchAll(/<([a-z_]+)((?:\s+[A-Za-z_]+="[^"]*")*)\s*\/?>/g)) {
    const [, element, attributes] = m;
    if (!SYSTEM_ELEMENTS.has(element)) continue;
    const loc = /\bloc="([^"]*)"/.exec(attributes)?.[1];
    const shown = /\bdisplaytype="([^"]*)"/.exec(attributes)?.[1] ?? element;
    findings.push({
      step: "precheck",
      rule: "precheck.elaborated-system-call",
      verdict: "fail",
      title: `The elaborated design still calls a system task or function (${shown})`,
      measured: shown,
      limit: ALLOWED_LIST,
      evidence: place(loc),
      advice: `Remove it: only ${ALLOWED_LIST} may appear in an entry.`,
    });
  }
  // A function or task with nothing but its port variables inside has no body: a foreign import.
  for (const m of xml.matchAll(/<(func|task)\s+([^>]*?)(?:\/>|>(?:\s*<var\s[^>]*\/>)*\s*<\/\1>)/g)) {
    const loc = /\bloc="([^"]*)"/.exec(m[2])?.[1];
    const name = /\bname="([^"]*)"/.exec(m[2])?.[1] ?? "?";
    findings.push({
      step: "precheck",
      rule: "precheck.foreign-function",
      verdict: "fail",
      title: `${m[1] === "func" ? "Function" : "Task"} ${name} has no body (a foreign import)`,
      measured: name,
      evidence: place(loc),
      advice: "Give the function a Verilog body; an entry may not call code outside the design.",
    });
  }
  return findings;
}

function unescapeXml(text: string): string {
  return text.replace(/&lt;/g, "<").replace(/&gt;/g, ">").replace(/&quot;/g, '"').replace(/&apos;/g, "'").replace(/&amp;/g, "&");
}

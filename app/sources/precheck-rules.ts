import type { Finding } from "~/rules/findings";
import { scanVerilog, type Token } from "./verilog-lexer";

/**
 * The text rules of the pre-check. Pure functions over source text, so they can run on the raw
 * upload and again on the preprocessed text with the same verdicts.
 */
export const ALLOWED_SYSTEM_FUNCTIONS = ["signed", "unsigned", "clog2", "bits"] as const;
const ALLOWED_SYSTEM = new Set<string>(ALLOWED_SYSTEM_FUNCTIONS);
const ALLOWED_LIST = ALLOWED_SYSTEM_FUNCTIONS.map((n) => `$${n}`).join(", ");

/** Directives that stay inside the bundle (IEEE 1800-2017 clause 22 lists them all). */
const ALLOWED_DIRECTIVES = new Set([
  "define", "undef", "undefineall", "ifdef", "ifndef", "elsif", "else", "endif",
  "timescale", "default_nettype", "resetall", "celldefine", "endcelldefine",
  "unconnected_drive", "nounconnected_drive", "begin_keywords", "end_keywords", "__FILE__", "__LINE__",
]);

export interface SourceLocation {
  file: string;
  line: number;
}

/** Maps a line of the scanned text back to a file and line of the upload. */
export type LineMapper = (line: number) => SourceLocation;

export interface TextScanOptions {
  /** Macro names defined anywhere in the bundle: `` `NAME `` is a use of one, not a directive. */
  macros: ReadonlySet<string>;
  /** "source" for the upload as written, "preprocessed" for verilator -E output. */
  stage: "source" | "preprocessed";
}

export function definedMacros(texts: string[]): Set<string> {
  const names = new Set<string>();
  for (const text of texts) {
    const tokens = scanVerilog(text).tokens;
    tokens.forEach((t, i) => {
      const next = tokens[i + 1];
      if (t.kind === "directive" && t.text === "define" && next?.kind === "identifier") names.add(next.text);
    });
  }
  return names;
}

export function scanText(text: string, where: LineMapper, options: TextScanOptions): Finding[] {
  const findings: Finding[] = [];
  const tokens = scanVerilog(text).tokens;
  const stageNote = options.stage === "preprocessed" ? " (after macro expansion)" : "";
  tokens.forEach((token, i) => {
    const at = where(token.line);
    const evidence = `${at.file}:${at.line}`;
    if (token.kind === "system" && !ALLOWED_SYSTEM.has(token.text)) {
      findings.push(systemCallFinding(token, evidence, stageNote));
    } else if (token.kind === "directive" && !ALLOWED_DIRECTIVES.has(token.text) && !options.macros.has(token.text)) {
      findings.push(directiveFinding(token.text, evidence, stageNote));
    } else if (token.kind === "backtick" || (token.kind === "paste" && !token.inDefine)) {
      findings.push({
        step: "precheck",
        rule: "precheck.directive",
        verdict: "fail",
        title: `A stray backtick${stageNote}`,
        measured: token.text,
        evidence,
        advice: "Use a backtick only for a directive or a macro from your own `define.",
      });
    } else if (token.kind === "identifier" && (token.text === "import" || token.text === "export")) {
      const next = tokens[i + 1];
      if (next?.kind === "string") {
        findings.push({
          step: "precheck",
          rule: "precheck.dpi",
          verdict: "fail",
          title: `A foreign-language ${token.text} ("${next.text}")${stageNote}`,
          measured: `${token.text} "${next.text}"`,
          evidence,
          advice: "Remove the DPI import or export: an entry is hardware only and may not call C code.",
        });
      }
    }
  });
  return findings;
}

function systemCallFinding(token: Token, evidence: string, stageNote: string): Finding {
  const name = token.text === "" ? "a lone $" : `$${token.text}`;
  return {
    step: "precheck",
    rule: "precheck.system-call",
    verdict: "fail",
    title: `System task or function ${name} is not allowed${stageNote}`,
    measured: name,
    limit: ALLOWED_LIST,
    evidence,
    advice: `Remove it: silicon cannot print, open files or run programs. Only ${ALLOWED_LIST} may appear in an entry.`,
  };
}

function directiveFinding(name: string, evidence: string, stageNote: string): Finding {
  const advice =
    name === "include"
      ? "Do not `include files: put shared definitions in a .vh file in the bundle; Gatecrash reads every .vh file first, in name order."
      : name.startsWith("systemc") || name.startsWith("verilator") || name === "verilog"
        ? "Remove it: this directive passes text to a tool's C++ or configuration, which an entry may not do."
        : `Remove \`${name}: only ${[...ALLOWED_DIRECTIVES].map((d) => "`" + d).join(", ")} and your own macros are allowed.`;
  return {
    step: "precheck",
    rule: "precheck.directive",
    verdict: "fail",
    title: `Compiler directive \`${name} is not allowed${stageNote}`,
    measured: `\`${name}`,
    evidence,
    advice,
  };
}

/**
 * Splits verilator -E output (with `line directives) into plain text and a line mapper.
 * IEEE 1800-2017 22.12: `line number "filename" level.
 */
export function mapPreprocessed(output: string, fileName: (reported: string) => string): { text: string; where: LineMapper } {
  const lines = output.split("\n");
  const origin: SourceLocation[] = [];
  let file = "?";
  let next = 1;
  const plain = lines.map((line) => {
    const directive = /^`line\s+(\d+)\s+"((?:[^"\\]|\\.)*)"\s+\d/.exec(line);
    if (directive) {
      next = Number(directive[1]);
      file = fileName(directive[2]);
      origin.push({ file, line: next });
      return "";
    }
    origin.push({ file, line: next });
    next++;
    return line;
  });
  return { text: plain.join("\n"), where: (line) => origin[line - 1] ?? { file, line } };
}

/** Keeps the first finding per rule, place and measured value. */
export function dedupeFindings(findings: Finding[]): Finding[] {
  const seen = new Set<string>();
  return findings.filter((f) => {
    const key = `${f.rule}|${f.evidence}|${f.measured}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}

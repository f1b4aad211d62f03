/**
 * A small Verilog token scanner: just enough to tell code from comments and strings, and to find
 * system names (`$name`), compiler directives (`` `name ``) and keywords with their line numbers.
 * It does not parse; the pre-check and the line counter only need tokens in context.
 */
export type TokenKind = "system" | "directive" | "paste" | "backtick" | "identifier" | "string" | "other";

export interface Token {
  kind: TokenKind;
  /** For system and directive tokens the name without `$` / `` ` ``; for strings the contents. */
  text: string;
  line: number;
  /** True when the token sits inside a `` `define `` body (to its end of line, with `\` continuations). */
  inDefine: boolean;
}

const IDENT_START = /[A-Za-z_]/;
const IDENT_CHAR = /[A-Za-z0-9_$]/;

export interface ScanResult {
  tokens: Token[];
  /** 1-based numbers of lines that hold at least one token that is not a comment. */
  codeLines: Set<number>;
}

export function scanVerilog(text: string): ScanResult {
  const tokens: Token[] = [];
  const codeLines = new Set<number>();
  let line = 1;
  let i = 0;
  let inDefine = false;
  const n = text.length;
  const push = (kind: TokenKind, value: string, at: number) => {
    tokens.push({ kind, text: value, line: at, inDefine });
    codeLines.add(at);
  };
  while (i < n) {
    const c = text[i];
    if (c === "\n") {
      line++;
      i++;
      inDefine = false;
      continue;
    }
    if (c === "\\" && text[i + 1] === "\n") {
      // Line continuation (inside a define body it keeps the body going).
      line++;
      i += 2;
      continue;
    }
    if (c === "\\" && text[i + 1] === "\r" && text[i + 2] === "\n") {
      line++;
      i += 3;
      continue;
    }
    if (c === " " || c === "\t" || c === "\r" || c === "\f" || c === "\v") {
      i++;
      continue;
    }
    if (c === "/" && text[i + 1] === "/") {
      while (i < n && text[i] !== "\n") i++;
      continue;
    }
    if (c === "/" && text[i + 1] === "*") {
      i += 2;
      while (i < n && !(text[i] === "*" && text[i + 1] === "/")) {
        if (text[i] === "\n") line++;
        i++;
      }
      i += 2;
      continue;
    }
    if (c === '"') {
      const start = line;
      let j = i + 1;
      let value = "";
      while (j < n && text[j] !== '"' && text[j] !== "\n") {
        if (text[j] === "\\" && j + 1 < n) {
          if (text[j + 1] === "\n") line++;
          value += text.slice(j, j + 2);
          j += 2;
          continue;
        }
        value += text[j];
        j++;
      }
      push("string", value, start);
      i = j + 1;
      if (text[j] === "\n") i = j; // unterminated: let the newline be counted
      continue;
    }
    if (c === "\\") {
      // Escaped identifier: runs to the next white space; `\$system ` is a name, not a call.
      let j = i + 1;
      while (j < n && !/\s/.test(text[j])) j++;
      push("identifier", text.slice(i + 1, j), line);
      i = j;
      continue;
    }
    if (c === "$") {
      let j = i + 1;
      while (j < n && IDENT_CHAR.test(text[j])) j++;
      push("system", text.slice(i + 1, j), line);
      i = j;
      continue;
    }
    if (c === "`") {
      const next = text[i + 1];
      if (next === "`") {
        push("paste", "``", line);
        i += 2;
        continue;
      }
      if (next === '"') {
        push("other", '`"', line);
        i += 2;
        continue;
      }
      if (next === "\\" && text[i + 2] === "`" && text[i + 3] === '"') {
        push("other", '`\\`"', line);
        i += 4;
        continue;
      }
      if (next !== undefined && IDENT_START.test(next)) {
        let j = i + 1;
        while (j < n && IDENT_CHAR.test(text[j])) j++;
        const name = text.slice(i + 1, j);
        push("directive", name, line);
        if (name === "define") inDefine = true;
        i = j;
        continue;
      }
      push("backtick", "`", line);
      i++;
      continue;
    }
    if (IDENT_START.test(c)) {
      let j = i + 1;
      while (j < n && IDENT_CHAR.test(text[j])) j++;
      push("identifier", text.slice(i, j), line);
      i = j;
      continue;
    }
    push("other", c, line);
    i++;
  }
  return { tokens, codeLines };
}

/** Lines of Verilog that hold code: not blank, not only comments. */
export function countSourceLines(text: string): number {
  return scanVerilog(text).codeLines.size;
}

export const VERILOG_EXTENSIONS = [".v", ".sv", ".vh"] as const;

export function isVerilogPath(path: string): boolean {
  const lower = path.toLowerCase();
  return VERILOG_EXTENSIONS.some((ext) => lower.endsWith(ext));
}

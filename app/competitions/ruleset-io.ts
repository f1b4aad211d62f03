import { windowProblem } from "~/rules/monitor";
import { patternProblem, rulesetSchema, type Ruleset } from "~/rules/ruleset";
import { VIDEO_MODES } from "~/rules/video-modes";

/** Ruleset JSON import/export: zod validation with every issue named by its path, plus checks zod cannot make. */
export type ParsedRuleset = { ok: true; ruleset: Ruleset } | { ok: false; errors: string[]; issues: { path: string; message: string }[] };

export function validateRuleset(input: unknown): ParsedRuleset {
  const parsed = rulesetSchema.safeParse(input);
  const issues: { path: string; message: string }[] = [];
  if (!parsed.success) {
    for (const i of parsed.error.issues) issues.push({ path: i.path.map(String).join(".") || "(top level)", message: i.message });
  } else {
    const r = parsed.data;
    const ff = patternProblem(r.flipFlopPattern);
    if (ff) issues.push({ path: "flipFlopPattern", message: `does not compile: ${ff}` });
    r.forbiddenCellPatterns.forEach((p, i) => {
      const problem = patternProblem(p);
      if (problem) issues.push({ path: `forbiddenCellPatterns.${i}`, message: `"${p}" does not compile: ${problem}` });
    });
    if (!(r.videoMode in VIDEO_MODES)) issues.push({ path: "videoMode", message: `unknown video mode; known: ${Object.keys(VIDEO_MODES).join(", ")}` });
    else {
      const problem = windowProblem(r);
      if (problem) issues.push({ path: "clock", message: `no design could pass: ${problem}` });
    }
    const names = r.pins.map((p) => p.name);
    names.forEach((n, i) => {
      if (names.indexOf(n) !== i) issues.push({ path: `pins.${i}.name`, message: `the pin name "${n}" appears twice` });
    });
  }
  if (issues.length || !parsed.success) return { ok: false, issues, errors: issues.map((i) => `${i.path}: ${i.message}`) };
  return { ok: true, ruleset: parsed.data };
}

export function parseRulesetJson(text: string): ParsedRuleset {
  if (!text.trim()) return { ok: false, issues: [{ path: "(file)", message: "empty" }], errors: ["Choose a file or paste the ruleset JSON."] };
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    const message = e instanceof SyntaxError ? e.message : "not JSON";
    return { ok: false, issues: [{ path: "(file)", message }], errors: [`This is not valid JSON: ${message}`] };
  }
  return validateRuleset(raw);
}

export function rulesetJson(r: Ruleset): string {
  return JSON.stringify(r, null, 2) + "\n";
}

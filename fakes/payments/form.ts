// Parses Stripe-style form bodies and query strings, where nesting lives in the keys:
// `line_items[0][price_data][unit_amount]=500`, `metadata[entry]=e1`, `expand[]=payment_intent`.
// The nesting itself is the `qs` package's (the bracket syntax it defines is the one the stripe SDK writes);
// this module only refuses, before qs sees them, the names a real payments API would answer 400 to, naming the
// parameter, instead of letting qs quietly reshape them (a value and nested values under one name, unbalanced
// brackets, prototype names, too deep, too many).
import qs from "qs";
import { invalidRequest } from "./errors";

export type FormValue = string | FormValue[] | FormObject;
export interface FormObject {
  [key: string]: FormValue;
}

const MAX_PAIRS = 2000;
const MAX_DEPTH = 8;
const MAX_INDEX = 9999;
const FORBIDDEN_SEGMENTS = new Set(["__proto__", "prototype", "constructor"]);
const KEY_SHAPE = /^([^[\]]+)((?:\[[^[\]]*\])*)$/;
const ARRAY_INDEX = /^\d+$/;

function badKey(key: string, why: string): Error {
  return invalidRequest(`Invalid parameter name ${JSON.stringify(key)}: ${why}.`, {
    code: "parameter_invalid",
    param: key,
  });
}

function segmentsOf(key: string): string[] {
  const match = KEY_SHAPE.exec(key);
  if (!match) throw badKey(key, "brackets must be balanced, as in a[b][0]");
  const segments = [match[1]];
  for (const part of match[2].matchAll(/\[([^[\]]*)\]/g)) segments.push(part[1]);
  if (segments.length > MAX_DEPTH) throw badKey(key, `nesting deeper than ${MAX_DEPTH} levels`);
  for (const [index, segment] of segments.entries()) {
    if (FORBIDDEN_SEGMENTS.has(segment)) throw badKey(key, `"${segment}" is not an allowed name`);
    if (segment === "" && index !== segments.length - 1) throw badKey(key, "[] may only come last");
    if (ARRAY_INDEX.test(segment) && Number(segment) > MAX_INDEX) throw badKey(key, "array index too large");
  }
  if (ARRAY_INDEX.test(segments[0])) throw invalidRequest("Parameter names must not be bare numbers.");
  return segments;
}

/** Refuses names that qs would merge into something the sender did not write. */
function checkNames(pairs: Iterable<[string, string]>): void {
  const leaves = new Set<string>();
  const branches = new Set<string>();
  let count = 0;
  for (const [key] of pairs) {
    if (++count > MAX_PAIRS) throw invalidRequest(`Too many parameters (more than ${MAX_PAIRS}).`);
    if (key === "") continue;
    const segments = segmentsOf(key);
    // `a[]` appends: the list is a branch, never a leaf
    const leafPath = segments.at(-1) === "" ? null : segments.join("\u0000");
    for (let i = 1; i < segments.length; i++) {
      const prefix = segments.slice(0, i).join("\u0000");
      if (leaves.has(prefix)) throw badKey(key, "a value and nested values share one name");
      branches.add(prefix);
    }
    if (leafPath !== null) {
      if (branches.has(leafPath)) throw badKey(key, "a value and nested values share one name");
      leaves.add(leafPath);
    }
  }
}

const QS_OPTIONS = {
  depth: MAX_DEPTH,
  strictDepth: true,
  arrayLimit: MAX_INDEX,
  parameterLimit: MAX_PAIRS,
  allowPrototypes: false,
  // the names were checked above; a repeated plain name keeps its last value, as form posts mean
  duplicates: "last",
} satisfies qs.IParseOptions;

export function parseFormBody(body: string): FormObject {
  checkNames(new URLSearchParams(body));
  return qs.parse(body, QS_OPTIONS) as FormObject;
}

/** A query string (`?expand[]=x`), read the same way. */
export function parseFormQuery(search: string): FormObject {
  return parseFormBody(search.startsWith("?") ? search.slice(1) : search);
}

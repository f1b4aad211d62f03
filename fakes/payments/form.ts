// Parses Stripe-style form bodies and query strings, where nesting lives in the keys:
// `line_items[0][price_data][unit_amount]=500`, `metadata[entry]=e1`, `expand[]=payment_intent`.
import { invalidRequest } from "./errors";

export type FormValue = string | FormValue[] | FormObject;
export interface FormObject {
  [key: string]: FormValue;
}

const MAX_PAIRS = 2000;
const MAX_DEPTH = 8;
const MAX_INDEX = 9999;
// Assigning these as plain keys would touch the prototype chain of the result.
const FORBIDDEN_SEGMENTS = new Set(["__proto__", "prototype", "constructor"]);
const KEY_SHAPE = /^([^[\]]+)((?:\[[^[\]]*\])*)$/;
const ARRAY_INDEX = /^\d+$/;

type Node = { kind: "leaf"; value: string } | { kind: "branch"; children: Map<string, Node>; pushed: number };

function badKey(key: string, why: string): Error {
  return invalidRequest(`Invalid parameter name ${JSON.stringify(key)}: ${why}.`, {
    code: "parameter_invalid",
    param: key,
  });
}

function splitKey(key: string): string[] {
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
  return segments;
}

function insert(root: Node & { kind: "branch" }, key: string, value: string): void {
  const segments = splitKey(key);
  let branch = root;
  for (const [index, rawSegment] of segments.entries()) {
    // `a[]` appends: give each pushed value the next free position.
    const segment = rawSegment === "" ? String(branch.pushed++) : rawSegment;
    const isLast = index === segments.length - 1;
    const existing = branch.children.get(segment);
    if (isLast) {
      if (existing?.kind === "branch") throw badKey(key, "a value and nested values share one name");
      branch.children.set(segment, { kind: "leaf", value });
      return;
    }
    if (existing?.kind === "leaf") throw badKey(key, "a value and nested values share one name");
    if (existing) {
      branch = existing;
    } else {
      const child: Node & { kind: "branch" } = { kind: "branch", children: new Map(), pushed: 0 };
      branch.children.set(segment, child);
      branch = child;
    }
  }
}

function materialize(node: Node): FormValue {
  if (node.kind === "leaf") return node.value;
  const keys = [...node.children.keys()];
  if (keys.every((key) => ARRAY_INDEX.test(key))) {
    // Indices give the order; gaps are closed, as a form cannot express holes usefully.
    return keys
      .sort((a, b) => Number(a) - Number(b))
      .map((key) => materialize(node.children.get(key) as Node));
  }
  const result: FormObject = {};
  for (const key of keys) result[key] = materialize(node.children.get(key) as Node);
  return result;
}

export function parseFormPairs(pairs: Iterable<[string, string]>): FormObject {
  const root: Node & { kind: "branch" } = { kind: "branch", children: new Map(), pushed: 0 };
  let count = 0;
  for (const [key, value] of pairs) {
    if (++count > MAX_PAIRS) throw invalidRequest(`Too many parameters (more than ${MAX_PAIRS}).`);
    if (key === "") continue;
    insert(root, key, value);
  }
  if (root.children.size === 0) return {};
  const result = materialize(root);
  // Top-level keys that are all digits would come out as an array; Stripe bodies never mean that.
  if (Array.isArray(result)) throw invalidRequest("Parameter names must not be bare numbers.");
  return result as FormObject;
}

export function parseFormBody(body: string): FormObject {
  return parseFormPairs(new URLSearchParams(body));
}

import { createHash } from "node:crypto";

/**
 * Canonical JSON for hashing published results: object keys sorted by UTF-16 code units, no whitespace,
 * numbers as JavaScript prints them, undefined members left out. PostgreSQL's jsonb reorders keys, so the
 * hash is always taken over this form, never over the stored text.
 */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== "object") {
    if (typeof value === "number" && !Number.isFinite(value)) throw new TypeError(`cannot hash a non-finite number (${value})`);
    return JSON.stringify(value);
  }
  if (Array.isArray(value)) return `[${value.map((v) => (v === undefined ? "null" : canonicalJson(v))).join(",")}]`;
  const obj = value as Record<string, unknown>;
  const keys = Object.keys(obj)
    .filter((k) => obj[k] !== undefined)
    .sort();
  return `{${keys.map((k) => `${JSON.stringify(k)}:${canonicalJson(obj[k])}`).join(",")}}`;
}

export function sha256Hex(text: string): string {
  return createHash("sha256").update(text, "utf8").digest("hex");
}

export function payloadHash(payload: unknown): string {
  return sha256Hex(canonicalJson(payload));
}

import { createHash } from "node:crypto";
import canonicalize from "canonicalize";

/**
 * The hash of published results. Since the switch to RFC 8785 (JSON Canonicalization Scheme, JCS) the SHA-256 is
 * taken over the JCS form of the payload, made by the `canonicalize` package, so anyone can check a published
 * hash with any JCS tool (`canonicalize < results.json | sha256sum`). PostgreSQL's jsonb reorders keys, so the
 * hash is never taken over the stored text.
 *
 * Every stored version carries the tag of the scheme it was hashed with (`results_snapshots.hash_scheme`), and
 * is verified by that scheme: versions published before the switch keep `gatecrash-json/1`, Gatecrash's own
 * earlier canonical form, kept here frozen for them.
 */
export const HASH_SCHEMES = ["rfc8785-sha256", "gatecrash-json/1"] as const;
export type HashScheme = (typeof HASH_SCHEMES)[number];
export const CURRENT_HASH_SCHEME: HashScheme = "rfc8785-sha256";
/** What the column holds for versions published before schemes were tagged. */
export const LEGACY_HASH_SCHEME: HashScheme = "gatecrash-json/1";

export function isHashScheme(v: unknown): v is HashScheme {
  return (HASH_SCHEMES as readonly unknown[]).includes(v);
}

/** RFC 8785 canonical JSON of a value; throws for what I-JSON cannot carry (NaN, ±Infinity, lone surrogates). */
export function canonicalJson(value: unknown): string {
  const out = canonicalize(value);
  if (out === undefined) throw new TypeError("cannot canonicalize undefined");
  return out;
}

/**
 * `gatecrash-json/1`, frozen: keys sorted by UTF-16 code units, no whitespace, numbers and strings as
 * JSON.stringify prints them, undefined members left out. Only for verifying versions published under it.
 */
export function legacyCanonicalJson(value: unknown): string {
  if (value === null || typeof value !== "object") {
    if (typeof value === "number" && !Number.isFinite(value)) throw new TypeError(`cannot hash a non-finite number (${value})`);
    return JSON.stringify(value);
  }
  if (Array.isArray(value)) return `[${value.map((v) => (v === undefined ? "null" : legacyCanonicalJson(v))).join(",")}]`;
  const obj = value as Record<string, unknown>;
  const keys = Object.keys(obj)
    .filter((k) => obj[k] !== undefined)
    .sort();
  return `{${keys.map((k) => `${JSON.stringify(k)}:${legacyCanonicalJson(obj[k])}`).join(",")}}`;
}

export function sha256Hex(text: string): string {
  return createHash("sha256").update(text, "utf8").digest("hex");
}

export function payloadHash(payload: unknown, scheme: HashScheme = CURRENT_HASH_SCHEME): string {
  return sha256Hex(scheme === "rfc8785-sha256" ? canonicalJson(payload) : legacyCanonicalJson(payload));
}

/** How a page or file names the scheme of a hash. */
export function hashSchemeLabel(scheme: HashScheme): string {
  return scheme === "rfc8785-sha256" ? "SHA-256 of the RFC 8785 (JCS) canonical JSON" : "SHA-256 of Gatecrash's earlier canonical JSON (gatecrash-json/1)";
}

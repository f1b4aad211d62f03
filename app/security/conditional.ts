/**
 * Conditional GET by entity tag (RFC 9110, section 13.1.2 If-None-Match and 8.8.3 ETag; section 15.4.5 304).
 * Pure: no request object needed, so pages, media and artifacts share one reading of the header.
 */

/** An entity tag's opaque part: printable ASCII except the double quote and space (RFC 9110, 8.8.3 etagc). */
const OPAQUE = /^[\x21\x23-\x7e]+$/;

/** A strong entity tag for an opaque value (the caller makes it from a hash). */
export function strongEtag(opaque: string): string {
  if (!OPAQUE.test(opaque)) throw new Error(`not an entity-tag value: ${opaque}`);
  return `"${opaque}"`;
}

/**
 * Whether If-None-Match matches `etag`, i.e. the client's copy is current and a GET may answer 304.
 * "*" matches any current representation; otherwise the weak comparison (RFC 9110, 8.8.3.2: W/ ignored on either
 * side) against each tag of the comma-separated list. A header that is absent or unreadable never matches.
 */
export function ifNoneMatchMatches(header: string | null, etag: string): boolean {
  if (header === null) return false;
  const value = header.trim();
  if (value === "*") return true;
  const opaque = (tag: string) => (tag.startsWith("W/") ? tag.slice(2) : tag);
  const mine = opaque(etag);
  // Tags are quoted and cannot hold a quote, so a comma inside quotes is part of a tag.
  for (const m of value.matchAll(/(?:W\/)?"[\x21\x23-\x7e\x80-\xff]*"/g)) if (opaque(m[0]) === mine) return true;
  return false;
}

/**
 * The 304 answer: only the headers RFC 9110 (15.4.5) asks a 304 to repeat — ETag, Cache-Control, Vary (and
 * Content-Location, Date, Expires, which Gatecrash does not set per response) — so a cache updating its stored
 * response learns nothing that would no longer match the stored body.
 */
export function notModified(etag: string, from: Headers): Response {
  const headers = new Headers({ ETag: etag });
  for (const name of ["Cache-Control", "Vary"]) {
    const v = from.get(name);
    if (v !== null) headers.set(name, v);
  }
  return new Response(null, { status: 304, headers });
}

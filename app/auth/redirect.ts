/**
 * The one check for every redirect target that comes from a request (`?next=`, a form's `next`): only a path on
 * this site is followed. It must start with exactly one "/", and neither it nor its percent-decoded form may hold a
 * backslash (browsers read "/\evil.test" as another host), a control character (tab and newline are dropped by URL
 * parsers, so "/\t/evil.test" becomes "//evil.test"), or a second leading slash; after resolving it against a
 * placeholder origin it must still be on that origin. Anything else gives `fallback` (the role's home).
 */
const PLACEHOLDER = "http://gatecrash.invalid";
// eslint-disable-next-line no-control-regex
const UNSAFE = /[\\\u0000-\u001f\u007f]/;

function looksSafe(path: string): boolean {
  return path.startsWith("/") && !path.startsWith("//") && !UNSAFE.test(path);
}

function decodedOnce(path: string): string | null {
  try {
    return decodeURIComponent(path);
  } catch {
    return null;
  }
}

export function safeRedirect<F extends string | null>(next: unknown, fallback: F): string | F {
  if (typeof next !== "string" || next.length > 2048 || !looksSafe(next)) return fallback;
  // Twice: "%252f" decodes to "%2f", which a later hop might decode again.
  const once = decodedOnce(next);
  const twice = once === null ? null : decodedOnce(once);
  if (once === null || twice === null || !looksSafe(once) || !looksSafe(twice)) return fallback;
  const url = new URL(next, PLACEHOLDER);
  if (url.origin !== PLACEHOLDER) return fallback;
  return url.pathname + url.search + url.hash;
}

import { env } from "~/env.server";

/**
 * Cross-site request forgery guard: a mutation (any method but GET, HEAD, OPTIONS) must come from a page of our
 * own origin, as told by its Origin header or, missing that, its Referer. A request with neither is refused
 * too: browsers send Origin on every cross-origin and same-origin POST, so only a forged or scripted call lacks it.
 * One path is exempt: the payments webhook, authenticated by its signature. better-auth's routes under /api/auth
 * are checked here too: better-auth checks the origin itself only when the request carries cookies, so a
 * cross-site sign-in without cookies (login CSRF) would pass it.
 */
const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

export function isExemptFromOriginCheck(pathname: string): boolean {
  const p = pathname.replace(/\.data$/, "");
  return p === "/api/payments/webhook";
}

export function allowedOrigins(request: Request): Set<string> {
  const e = env();
  const set = new Set<string>([new URL(e.APP_URL).origin, new URL(request.url).origin]);
  for (const o of e.TRUSTED_ORIGINS.split(",").map((s) => s.trim()).filter(Boolean)) if (URL.canParse(o)) set.add(new URL(o).origin);
  return set;
}

export type OriginVerdict = { ok: true } | { ok: false; reason: string };

export function checkMutationOrigin(request: Request): OriginVerdict {
  if (SAFE_METHODS.has(request.method.toUpperCase())) return { ok: true };
  if (isExemptFromOriginCheck(new URL(request.url).pathname)) return { ok: true };
  const allowed = allowedOrigins(request);
  const origin = request.headers.get("origin");
  if (origin && origin !== "null") {
    return allowed.has(origin) ? { ok: true } : { ok: false, reason: `origin ${origin} is not this site` };
  }
  const referer = request.headers.get("referer");
  if (referer && URL.canParse(referer)) {
    const o = new URL(referer).origin;
    return allowed.has(o) ? { ok: true } : { ok: false, reason: `referer ${o} is not this site` };
  }
  return { ok: false, reason: "the request names no origin" };
}

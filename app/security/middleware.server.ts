import { data, type MiddlewareFunction } from "react-router";
import { apiError } from "~/api/json.server";
import { readSessionOnce } from "~/auth/guards.server";
import { databaseAway } from "~/health/middleware.server";
import { nonceContext } from "./context";
import { applySecurityHeaders, newNonce } from "./headers.server";
import { bodyLimitFor, tooLargeMessage } from "./body-limits";
import { checkMutationOrigin } from "./origin.server";

/**
 * The root route's server middleware (React Router `future.v8_middleware`), run around every page, data and
 * resource request before any loader or action:
 * 1. `securityHeaders` hands a fresh CSP nonce to entry.server through the router context and puts the security
 *    headers on whatever response comes back (error pages included: `next()` turns a thrown error into a response);
 * 2. `sameOriginMutations` refuses a cross-site mutation with 403 before the action runs, and a page action's
 *    body that is not a form with 415.
 */
export const securityHeaders: MiddlewareFunction<Response> = async ({ context }, next) => {
  const nonce = newNonce();
  context.set(nonceContext, nonce);
  const res = await next();
  // A fresh response: one built by fetch() (a proxied body) has immutable headers.
  const out = new Response(res.body, { status: res.status, statusText: res.statusText, headers: new Headers(res.headers) });
  // A non-HTML response that set its own policy keeps it (the SVG artifact's `default-src 'none'`): the page policy
  // with its nonce is for documents, and would loosen that one.
  const ownPolicy = !/^text\/html/i.test(out.headers.get("content-type") ?? "") ? out.headers.get("Content-Security-Policy") : null;
  applySecurityHeaders(out.headers, nonce, { dev: import.meta.env.DEV });
  if (ownPolicy) out.headers.set("Content-Security-Policy", ownPolicy);
  // A 304 (a public page the browser holds: app/security/public-page.server.ts) must not bring a policy whose nonce
  // differs from the one in the page it keeps: a cache updates the stored headers from a 304 (RFC 9111, 4.3.4).
  if (out.status === 304) out.headers.delete("Content-Security-Policy");
  // The error page React Router renders for a thrown 503 (database away) does not keep the thrown headers.
  if (out.status === 503 && !out.headers.has("Retry-After")) out.headers.set("Retry-After", "5");
  return out;
};

const FORM_TYPES = ["application/x-www-form-urlencoded", "multipart/form-data"];

export const sameOriginMutations: MiddlewareFunction<Response> = async ({ request }, next) => {
  const verdict = checkMutationOrigin(request);
  const isApi = new URL(request.url).pathname.startsWith("/api/");
  if (!verdict.ok) {
    const message = "This request did not come from a Gatecrash page, so it was refused. Reload the page and try again.";
    if (isApi) return apiError(403, "cross_origin", message);
    throw data({ message }, { status: 403 });
  }
  // A declared body over the route's limit is refused before anything reads it (the production server also counts
  // bodies that declare no length while they stream: server/body-limit.ts).
  const declared = Number(request.headers.get("content-length") ?? "");
  const limit = bodyLimitFor(new URL(request.url).pathname);
  if (Number.isFinite(declared) && declared > limit) {
    if (isApi) return withHeader(apiError(413, "body_too_large", tooLargeMessage(limit)), "Connection", "close");
    throw data({ message: tooLargeMessage(limit) }, { status: 413, headers: { Connection: "close" } });
  }
  // Page actions read forms: any other body (JSON, text/plain) is a 415, not a crash inside request.formData().
  const type = request.headers.get("content-type");
  if (!isApi && type && !["GET", "HEAD", "OPTIONS"].includes(request.method.toUpperCase()) && !FORM_TYPES.some((t) => type.toLowerCase().startsWith(t))) {
    throw data({ message: "Pages accept form submissions only." }, { status: 415 });
  }
  return next();
};

function withHeader(res: Response, name: string, value: string): Response {
  res.headers.set(name, value);
  return res;
}

/**
 * In order: headers around everything, then the 503 for a database that is away, then the origin rule, then the
 * session, read once for the whole request (app/auth/guards.server.ts).
 */
export const rootMiddleware = [securityHeaders, databaseAway, sameOriginMutations, readSessionOnce];

import { randomBytes } from "node:crypto";
import { env } from "~/env.server";

/**
 * Security headers for every response Gatecrash renders. The content security policy allows scripts only with
 * the per-request nonce (React Router's hydration script and streamed data are inline), media and pictures from
 * our own origin and blob: (artifact players, layout pictures), direct multipart uploads to the S3 endpoint,
 * and form posts to our own origin plus the payments service (checkout redirects follow a form post).
 */
export function newNonce(): string {
  return randomBytes(18).toString("base64");
}

function originOf(url: string): string | null {
  const u = URL.canParse(url) ? new URL(url) : null;
  return u ? u.origin : null;
}

export function paymentsOrigin(): string {
  const e = env();
  const defaultPort = e.STRIPE_API_PROTOCOL === "https" ? 443 : 80;
  const port = e.STRIPE_API_PORT === defaultPort ? "" : `:${e.STRIPE_API_PORT}`;
  return `${e.STRIPE_API_PROTOCOL}://${e.STRIPE_API_HOST}${port}`;
}

export function contentSecurityPolicy(nonce: string, opts: { dev?: boolean } = {}): string {
  const e = env();
  const s3 = originOf(e.S3_ENDPOINT);
  const connect = ["'self'", s3, ...(opts.dev ? ["ws:", "wss:"] : [])].filter(Boolean);
  const directives: Record<string, string[]> = {
    "default-src": ["'self'"],
    "script-src": ["'self'", `'nonce-${nonce}'`],
    // The Vite dev server injects the CSS as <style> elements; built pages load it as files.
    "style-src": opts.dev ? ["'self'", "'unsafe-inline'"] : ["'self'"],
    // React renders a few computed positions and sizes as style attributes; no style elements from outside.
    "style-src-attr": ["'unsafe-inline'"],
    "img-src": ["'self'", "blob:", "data:"],
    "media-src": ["'self'", "blob:"],
    "font-src": ["'self'"],
    "connect-src": connect as string[],
    "object-src": ["'none'"],
    "base-uri": ["'self'"],
    "frame-ancestors": ["'none'"],
    "form-action": ["'self'", paymentsOrigin()],
  };
  return Object.entries(directives)
    .map(([k, v]) => `${k} ${v.join(" ")}`)
    .join("; ");
}

export const PERMISSIONS_POLICY = "camera=(), microphone=(), geolocation=(), payment=(), usb=(), fullscreen=(self), autoplay=(self)";

/** Sets the security headers on a response's headers (replacing any the route set for the same names). */
export function applySecurityHeaders(headers: Headers, nonce: string, opts: { dev?: boolean } = {}): void {
  headers.set("Content-Security-Policy", contentSecurityPolicy(nonce, opts));
  headers.set("X-Content-Type-Options", "nosniff");
  headers.set("Referrer-Policy", "strict-origin-when-cross-origin");
  headers.set("Permissions-Policy", PERMISSIONS_POLICY);
  headers.set("X-Frame-Options", "DENY");
  headers.set("Cross-Origin-Opener-Policy", "same-origin");
}

import type { RouterContextProvider } from "react-router";
import { getSession } from "~/auth/guards.server";
import { publicPageContext } from "./context";
import { newNonce } from "./headers.server";

/**
 * Public pages rendered once per version (React Router's entry.server uses this): a page whose loader called
 * `markPublicPage` for an anonymous request is rendered with a placeholder nonce, kept, and served to every other
 * anonymous request for the same address and version with that request's own fresh nonce put in its place — the
 * CSP nonce stays per response (the nonce is 18 random bytes, so the placeholder cannot occur in page text).
 */

/** Marks this request's page as public at `version`, when nobody is signed in; a signed-in page is never cached. */
export function markPublicPage(context: Readonly<RouterContextProvider>, version: string): void {
  if (getSession(context) === null) (context as RouterContextProvider).set(publicPageContext, version);
}

export const PLACEHOLDER_NONCE = newNonce();

const MAX_PAGES = 100;
const MAX_BYTES = 32 * 1024 * 1024;
const pages = new Map<string, string>();
let bytes = 0;

/** The page kept for `key` (address, version and build), or renders and keeps it. */
export async function renderedOnce(key: string, render: () => Promise<string>): Promise<string> {
  const hit = pages.get(key);
  if (hit !== undefined) {
    pages.delete(key);
    pages.set(key, hit);
    return hit;
  }
  const html = await render();
  if (pages.has(key)) return html; // rendered meanwhile by a request alongside
  pages.set(key, html);
  bytes += html.length;
  while (pages.size > MAX_PAGES || bytes > MAX_BYTES) {
    const [oldest, page] = pages.entries().next().value!;
    pages.delete(oldest);
    bytes -= page.length;
  }
  return html;
}

/** The kept page with this response's nonce. */
export function withNonce(html: string, nonce: string): string {
  return html.replaceAll(PLACEHOLDER_NONCE, nonce);
}

import { createContext } from "react-router";

/** The per-request CSP nonce, set by the root middleware and read by entry.server when it renders HTML. */
export const nonceContext = createContext<string>("");

/**
 * The client's network address as the production server determined it (the socket's peer, or the address the
 * trusted proxy forwarded: TRUSTED_PROXIES); null where no such server runs (the Vite dev server).
 */
export const clientAddressContext = createContext<string | null>(null);

/**
 * Set by a loader whose page is public and cacheable for this request (no session: the page is the same for every
 * anonymous visitor): the version of what the page shows (e.g. the published showcase's). entry.server then gives
 * the page an ETag, answers If-None-Match with 304 and renders each version once (app/security/public-page.server.ts).
 */
export const publicPageContext = createContext<string | null>(null);

import { createContext } from "react-router";

/** The per-request CSP nonce, set by the root middleware and read by entry.server when it renders HTML. */
export const nonceContext = createContext<string>("");

/**
 * The client's network address as the production server determined it (the socket's peer, or the address the
 * trusted proxy forwarded: TRUSTED_PROXIES); null where no such server runs (the Vite dev server).
 */
export const clientAddressContext = createContext<string | null>(null);

import { createContext } from "react-router";

/** The per-request CSP nonce, set by the root middleware and read by entry.server when it renders HTML. */
export const nonceContext = createContext<string>("");

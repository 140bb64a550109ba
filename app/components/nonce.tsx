import { createContext, useContext } from "react";

/** The per-response CSP nonce, provided by entry.server; empty in the browser. */
export const NonceContext = createContext("");
export const useNonce = () => useContext(NonceContext);

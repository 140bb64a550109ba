import { createContext, type RouterContext } from "react-router";

declare global {
  var __tidewireClientAddress: RouterContext<string | null> | undefined;
}

/**
 * The client's network address, set by the production server (scripts/serve.ts), null in the
 * dev server. Kept on globalThis so the server, outside the bundle, sets the same context key.
 */
export const clientAddressContext: RouterContext<string | null> = (globalThis.__tidewireClientAddress ??= createContext<string | null>(null));

/** Header the production server sets from the socket (and overwrites if a client sends it). */
export const CLIENT_ADDRESS_HEADER = "x-tidewire-client-address";

/**
 * Header the production server sets on every request (overwriting any copy a client sends):
 * "document" for a GET or HEAD of a page itself, "other" for everything else — React Router's
 * data requests (…/.data) reach the app under the page's own URL, and the page cache must not
 * answer them with a document.
 */
export const REQUEST_KIND_HEADER = "x-tidewire-request-kind";

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

import {
  createContext,
  type RouterContext,
  type RouterContextProvider,
} from "react-router";

/**
 * The socket address of the client, set by the server (`server.mjs`) for each
 * request. The Fetch API request React Router builds does not carry it.
 */
export const socketAddressContext = createContext<string | null>(null);

/** The nonce of this response's Content-Security-Policy, read by the server entry. */
export const cspNonceContext = createContext<string | undefined>(undefined);

/** Reads a value from the router context, tolerating callers that pass a plain object. */
export function readContext<T>(
  context: unknown,
  key: RouterContext<T>,
): T | undefined {
  const provider = context as Partial<RouterContextProvider> | null | undefined;
  if (!provider || typeof provider.get !== "function") return undefined;
  try {
    return provider.get(key);
  } catch {
    return undefined;
  }
}

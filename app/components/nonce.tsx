import { createContext, useContext } from "react";

/**
 * The page's CSP nonce. The server provides it; in the browser it is read back from the scripts the
 * server sent (browsers hide the attribute but keep the property), so hydration renders the same.
 */
export const NonceContext = createContext<string | undefined>(undefined);

export function useNonce(): string | undefined {
  const fromServer = useContext(NonceContext);
  if (fromServer !== undefined) return fromServer;
  if (typeof document === "undefined") return undefined;
  return document.querySelector<HTMLScriptElement>("script[nonce]")?.nonce || undefined;
}

// The CSP nonce of the page. entry.server.tsx provides it around the app on the server; in the
// browser it is read once from a script of the page (the `nonce` property keeps the value that the
// browser hides from the attribute), so hydration renders the same nonce the server did.
import { createContext, useContext } from "react";

export const NonceContext = createContext<string | undefined>(undefined);

let pageNonce: string | undefined;

export function useNonce(): string | undefined {
  const provided = useContext(NonceContext);
  if (provided !== undefined || typeof document === "undefined") return provided;
  return (pageNonce ??= document.querySelector<HTMLScriptElement>("script[nonce]")?.nonce || undefined);
}

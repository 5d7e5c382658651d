import { createContext, useContext } from "react";
import { z } from "zod";

/**
 * The browser's side of the Content-Security-Policy (app/services/http/security-headers.server.ts).
 * Imported first by app/root.tsx, so it runs before any route module builds a schema.
 */

// The policy forbids eval. zod compiles object parsers with `new Function` where it can, and even
// its probe for that is reported as a violation; in the browser it parses without compiling.
if (typeof document !== "undefined") z.config({ jitless: true });

/** The request's nonce, provided around the server render by app/entry.server.tsx. */
export const CspNonce = createContext<string | undefined>(undefined);

let browserNonce: string | undefined;

/**
 * In the browser, the nonce the server rendered, read once from its first element that carries one
 * (browsers hide the attribute's value but keep the `nonce` property), so hydration renders the same
 * attributes as the server did.
 */
function nonceInDocument(): string | undefined {
  if (typeof document === "undefined") return undefined;
  browserNonce ??= document.querySelector<HTMLElement>("[nonce]")?.nonce || undefined;
  return browserNonce;
}

export const useCspNonce = () => useContext(CspNonce) ?? nonceInDocument();

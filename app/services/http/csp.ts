import { createContext, useContext } from "react";
import { z } from "zod";

/**
 * The browser's side of the Content-Security-Policy (app/services/http/security-headers.server.ts).
 * Imported first by app/root.tsx, so it runs before any route module builds a schema.
 */

// The policy forbids eval. zod compiles object parsers with `new Function` where it can, and even
// its probe for that is reported as a violation; in the browser it parses without compiling.
if (typeof document !== "undefined") z.config({ jitless: true });

/**
 * The request's nonce, provided around the server render by app/entry.server.tsx. In the browser it
 * is undefined: the nonce only matters for the scripts in the server's HTML, and browsers hide it
 * from the page once the policy has been applied.
 */
export const CspNonce = createContext<string | undefined>(undefined);

export const useCspNonce = () => useContext(CspNonce);

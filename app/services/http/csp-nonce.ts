import { createContext, useContext } from "react";

/**
 * The request's Content-Security-Policy nonce, provided around the server render by
 * app/entry.server.tsx. In the browser it is undefined: the nonce only matters for the scripts in
 * the server's HTML, and browsers hide it from the page once the policy has been applied.
 */
export const CspNonce = createContext<string | undefined>(undefined);

export const useCspNonce = () => useContext(CspNonce);

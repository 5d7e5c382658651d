import { createContext, type RouterContextProvider } from "react-router";

/** HTML fragments for this request's server render only (see app/components/document-html.tsx). */
export const documentFragmentsContext = createContext<Map<string, string> | null>(null);

/** The fragments a loader set for this document, if any. */
export function documentFragments(context: Readonly<RouterContextProvider> | undefined): Map<string, string> | undefined {
  try {
    return context?.get(documentFragmentsContext) ?? undefined;
  } catch {
    return undefined;
  }
}

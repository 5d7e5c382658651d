import { useEffect } from "react";
import { startOffline } from "~/utils/offline-client";
import type { ReaderId } from "~/utils/offline-protocol";

/**
 * Starts offline support once the page has hydrated: the service worker (in the built app; the
 * development server has no /sw.js), who is signed in, and sending queued changes. Renders nothing.
 */
export function OfflineSupport({ reader }: { reader: ReaderId }) {
  useEffect(() => startOffline(reader, import.meta.env.PROD), [reader]);
  return null;
}

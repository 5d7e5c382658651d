import { useEffect, useState } from "react";
import { REFUSED_EVENT, startOffline } from "~/utils/offline-client";
import type { ReaderId, Refusal } from "~/utils/offline-protocol";

/** The page a refused change belongs to, for the reader to look at it again. */
function pageOf(path: string): { href: string; label: string } | null {
  const checklist = /^\/api\/checklists\/(\d{1,10})\//.exec(path);
  if (checklist) return { href: `/me/checklists/${checklist[1]}`, label: "Open the checklist" };
  const guide = /^\/api\/guides\/([^/]+)\/step-ticks$/.exec(path);
  if (guide) return { href: `/guides/${guide[1]}`, label: "Open the guide" };
  return null;
}

/**
 * Starts offline support once the page has hydrated: the service worker (in the built app; the
 * development server has no /sw.js), who is signed in, and sending queued changes. Shows the
 * changes made without signal that the server refused when they were sent, with its reasons.
 */
export function OfflineSupport({ reader }: { reader: ReaderId }) {
  const [refused, setRefused] = useState<Refusal[]>([]);
  useEffect(() => startOffline(reader, import.meta.env.PROD), [reader]);
  useEffect(() => {
    const heard = (event: Event) =>
      setRefused((shown) => [...shown, ...((event as CustomEvent<Refusal[]>).detail ?? [])].slice(-5));
    window.addEventListener(REFUSED_EVENT, heard);
    return () => window.removeEventListener(REFUSED_EVENT, heard);
  }, []);
  if (refused.length === 0) return null;
  return (
    <div role="alert" className="no-print fixed inset-x-0 bottom-0 z-40 border-t-2 border-brass-500 bg-brass-50 p-4 shadow-lg">
      <div className="mx-auto flex max-w-3xl flex-col gap-3 sm:flex-row sm:items-start sm:justify-between">
        <div>
          <p className="font-semibold text-ink">
            {refused.length === 1
              ? "A change you made without signal was not saved."
              : `${refused.length} changes you made without signal were not saved.`}
          </p>
          <ul className="mt-1 space-y-1 text-sm text-ink-soft">
            {refused.map((r, i) => {
              const page = pageOf(r.path);
              return (
                <li key={`${i}:${r.path}`}>
                  {r.message}{" "}
                  {page ? (
                    <a href={page.href} className="inline-flex min-h-11 items-center text-spruce-700 underline">
                      {page.label}
                    </a>
                  ) : null}
                </li>
              );
            })}
          </ul>
        </div>
        <button
          type="button"
          onClick={() => setRefused([])}
          className="inline-flex min-h-11 shrink-0 items-center justify-center rounded-md border border-rule px-4 text-sm font-medium text-spruce-800 hover:bg-paper-deep"
        >
          Dismiss
        </button>
      </div>
    </div>
  );
}

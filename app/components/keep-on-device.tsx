import { useEffect, useState } from "react";
import type { ShownGuide } from "~/components/guide-article";
import { askWorker } from "~/utils/offline-client";
import { keptVariant, type ReaderId } from "~/utils/offline-protocol";
import { useRootData } from "~/utils/root-data";

/**
 * "Keep on this device": asks the service worker to store this guide page, its data, its photos at
 * one width and the app's assets, so it opens in the garage without signal. Only what the reader
 * asks for is kept, and only for them (see app/service-worker/worker.ts).
 */

/** The app's files this page loaded: its scripts, style sheets and fonts, and the installable app's files. */
function loadedAssets(): string[] {
  const urls = new Set<string>(["/manifest.webmanifest", "/favicon.svg", "/icons/icon-192.png"]);
  const add = (href: string | null | undefined) => {
    if (!href) return;
    const url = new URL(href, window.location.href);
    if (url.origin === window.location.origin && url.pathname.startsWith("/assets/")) urls.add(url.pathname);
  };
  for (const el of document.querySelectorAll<HTMLLinkElement>("link[rel=modulepreload], link[rel=stylesheet]")) add(el.href);
  for (const el of document.querySelectorAll<HTMLScriptElement>("script[src]")) add(el.src);
  for (const entry of performance.getEntriesByType("resource")) add(entry.name);
  return [...urls];
}

/** React Router's route discovery requests this page made (`/__manifest?paths=…`): offline it asks for the same. */
function discoveryRequests(): string[] {
  return performance
    .getEntriesByType("resource")
    .map((entry) => new URL(entry.name))
    .filter((url) => url.origin === window.location.origin && url.pathname === "/__manifest")
    .map((url) => `${url.pathname}${url.search}`)
    .slice(-50);
}

/** The build's id the kept app files are stored under (React Router's manifest version). */
export function buildId(): string {
  const version = (window as { __reactRouterManifest?: { version?: string } }).__reactRouterManifest?.version;
  return version && /^[\w-]{1,64}$/.test(version) ? version : "current";
}

type State = { kind: "idle" | "busy" | "kept" | "failed"; text: string };

export function KeepOnDevice({ guide }: { guide: Pick<ShownGuide, "slug" | "steps"> }) {
  const reader: ReaderId = useRootData()?.user?.id ?? null;
  const page = `/guides/${encodeURIComponent(guide.slug)}`;
  const [state, setState] = useState<State>({ kind: "idle", text: "" });

  useEffect(() => {
    void askWorker({ type: "is-kept", reader, page }).then((reply) => {
      if (reply?.ok && reply.kept) setState({ kind: "kept", text: "Kept on this device: it opens here without signal." });
    });
  }, [reader, page]);

  async function keep() {
    setState({ kind: "busy", text: "Keeping the guide and its photos on this device…" });
    const photos = guide.steps.flatMap((step) => step.photos.map((photo) => keptVariant(photo.variants)?.url ?? ""));
    const reply = await askWorker({
      type: "keep",
      reader,
      page,
      photos: photos.filter(Boolean),
      assets: loadedAssets(),
      build: buildId(),
      discovery: discoveryRequests(),
    });
    if (!reply) {
      setState({
        kind: "failed",
        text: "This browser cannot keep pages for offline use (or is still setting it up: try again).",
      });
    } else if (!reply.ok) {
      setState({ kind: "failed", text: `Not kept: ${reply.message}` });
    } else {
      setState({ kind: "kept", text: "Kept on this device: it opens here without signal." });
    }
  }

  return (
    <span className="inline-flex flex-wrap items-center gap-x-3 gap-y-1">
      <button
        type="button"
        onClick={keep}
        disabled={state.kind === "busy"}
        className="inline-flex min-h-11 items-center rounded-md border border-spruce-700 bg-spruce-700 px-4 font-medium text-white hover:bg-spruce-800 disabled:opacity-60"
      >
        Keep on this device
      </button>
      <span role="status" className={state.kind === "failed" ? "text-brass-700" : "text-ink-soft"}>
        {state.text}
      </span>
    </span>
  );
}

/**
 * On a checklist page: if the reader kept the guide it was copied from on this device, the
 * checklist is kept with it (and refreshed while there is signal), whether it was saved before
 * or after the guide was kept. Says so when it is.
 */
export function KeptWithGuide({ checklist, guideSlug }: { checklist: number; guideSlug: string }) {
  const reader: ReaderId = useRootData()?.user?.id ?? null;
  const [kept, setKept] = useState(false);
  useEffect(() => {
    if (reader === null || !guideSlug) return;
    let current = true;
    const ask = () =>
      askWorker({
        type: "keep-checklist",
        reader,
        checklist,
        guide: `/guides/${encodeURIComponent(guideSlug)}`,
        build: buildId(),
        discovery: discoveryRequests(),
      }).then((reply) => {
        const yes = Boolean(reply?.ok && reply.kept);
        if (current) setKept(yes);
        return yes;
      });
    // Asked again a little later with the route discovery the page has made by then, so its links
    // work without signal too (the worker keeps later ones itself once the page is kept).
    let again: ReturnType<typeof setTimeout> | undefined;
    void ask().then((yes) => {
      if (yes && current) again = setTimeout(() => void ask(), 2000);
    });
    return () => {
      current = false;
      clearTimeout(again);
    };
  }, [reader, checklist, guideSlug]);
  if (!kept) return null;
  return (
    <p role="status" className="mt-2 text-sm text-ink-soft print:hidden">
      Kept on this device with its guide: it opens here without signal.
    </p>
  );
}

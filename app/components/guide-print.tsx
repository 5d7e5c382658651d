import { type RefObject, useEffect } from "react";
import { Link } from "react-router";
import { formatDate, isoDateTime } from "~/utils/format";

/**
 * Opens every closed `<details>` under `root` while the page is printed, so "how these numbers were
 * worked out" reaches the paper, and closes the ones it opened afterwards. Browsers tell a page it
 * is about to print through `beforeprint` and through the `print` media query (the one a print
 * preview or an emulated print medium changes). In the print view (`keepOpen`) they stay open.
 * app.css opens them for print by style as well, for a page printed before its script has run.
 */
export function useDetailsOpenForPrint(root: RefObject<HTMLElement | null>, keepOpen: boolean) {
  useEffect(() => {
    const element = root.current;
    if (!element) return;
    const opened = new Set<HTMLDetailsElement>();
    const open = () => {
      for (const details of element.querySelectorAll("details")) {
        if (details.open) continue;
        details.open = true;
        opened.add(details);
      }
    };
    const restore = () => {
      if (keepOpen) return;
      for (const details of opened) details.open = false;
      opened.clear();
    };
    const print = window.matchMedia("print");
    const onMediaChange = () => (print.matches ? open() : restore());
    if (keepOpen || print.matches) open();
    print.addEventListener("change", onMediaChange);
    window.addEventListener("beforeprint", open);
    window.addEventListener("afterprint", restore);
    return () => {
      print.removeEventListener("change", onMediaChange);
      window.removeEventListener("beforeprint", open);
      window.removeEventListener("afterprint", restore);
    };
  }, [root, keepOpen]);
}

type Revision = { number: number; reviewedAt: Date | string | null };

function RevisionLine({ revision }: { revision: Revision }) {
  return (
    <>
      Revision {revision.number}
      {revision.reviewedAt ? (
        <>
          , reviewed{" "}
          <time dateTime={isoDateTime(revision.reviewedAt)} className="whitespace-nowrap">
            {formatDate(revision.reviewedAt)}
          </time>
        </>
      ) : (
        ", not yet reviewed"
      )}
    </>
  );
}

/**
 * Where a printed guide came from: the site, the guide's address, its revision and review date. On
 * paper only, except in the print view, which shows the page as it will print.
 */
export function PrintMasthead({ url, revision, onScreen }: { url: string; revision: Revision; onScreen: boolean }) {
  return (
    <div
      data-testid="print-masthead"
      className={`${onScreen ? "" : "print-only "}mb-6 flex flex-wrap items-baseline justify-between gap-x-6 gap-y-1 border-b-2 border-spruce-800 pb-2 text-sm`}
    >
      <p className="font-serif text-lg font-semibold text-spruce-900">Torqueleaf</p>
      <p className="min-w-0 break-all font-mono text-xs">{url}</p>
      <p className="w-full text-ink-soft">
        <RevisionLine revision={revision} />. Check this address for a newer revision before you start.
      </p>
    </div>
  );
}

/** The last lines of a printed guide, so a loose last page still names its guide. */
export function PrintFooter({
  title,
  url,
  revision,
  onScreen,
}: {
  title: string;
  url: string;
  revision: Revision;
  onScreen: boolean;
}) {
  return (
    <div className={`${onScreen ? "" : "print-only "}mt-10 border-t border-rule pt-2 text-xs text-ink-soft`}>
      <p>
        {title}. Torqueleaf, <span className="break-all font-mono">{url}</span>. <RevisionLine revision={revision} />.
      </p>
    </div>
  );
}

/** The print view's own controls, on screen only: print it, or go back to the guide. */
export function PrintViewBar({ slug }: { slug: string }) {
  return (
    <div className="screen-only mb-6 flex flex-wrap items-center gap-3 rounded-lg border border-rule bg-white p-3 text-sm">
      <Link
        to={`/guides/${slug}`}
        className="inline-flex min-h-11 items-center rounded-md px-3 font-medium text-spruce-700 hover:bg-paper-deep hover:underline"
      >
        ← Back to the guide
      </Link>
      <button
        type="button"
        onClick={() => window.print()}
        className="inline-flex min-h-11 items-center rounded-md bg-spruce-700 px-4 font-semibold text-paper hover:bg-spruce-800"
      >
        Print this guide
      </button>
      <p className="text-ink-soft">Photos, cautions and the working behind each number print in full.</p>
    </div>
  );
}

/**
 * A wiring diagram that is wider than a phone scrolls sideways inside its frame (app.css), and a
 * keyboard must be able to scroll it too (WCAG 2.2 §2.1.1): such a frame becomes a focusable,
 * named group while it scrolls, and an ordinary block again when the window is wide enough.
 */
export function useScrollableFiguresFocusable(root: RefObject<HTMLElement | null>) {
  useEffect(() => {
    const element = root.current;
    if (!element) return;
    const update = () => {
      for (const frame of element.querySelectorAll<HTMLElement>("figure.tl-figure > .tl-figure")) {
        if (frame.scrollWidth > frame.clientWidth + 1) {
          const title = frame.querySelector("svg title")?.textContent?.trim() || "Wiring diagram";
          frame.tabIndex = 0;
          frame.setAttribute("role", "group");
          frame.setAttribute("aria-label", `${title}, scrolls sideways`);
        } else {
          frame.removeAttribute("tabindex");
          frame.removeAttribute("role");
          frame.removeAttribute("aria-label");
        }
      }
    };
    update();
    const observer = new ResizeObserver(update);
    observer.observe(element);
    return () => observer.disconnect();
  }, [root]);
}

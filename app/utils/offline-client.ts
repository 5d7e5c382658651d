import type { OfflineMessage, OfflineReply, ReaderId, Refusal } from "./offline-protocol";

/**
 * The page's side of the service worker (app/service-worker/worker.ts): registering it, telling it
 * who is signed in, asking it to keep a guide or to send the changes it queued.
 */

/** The event the page hears when queued changes may have reached the server: screens read their data again. */
export const SYNCED_EVENT = "tl:synced";

/** The event the page hears when the server refused changes made without signal (its `detail`: the refusals). */
export const REFUSED_EVENT = "tl:refused";

const LAST_READER_KEY = "tl-reader";

/** Where a reader's step ticks are kept in this browser; signed-in readers' copies are dropped on sign-out. */
export const localTicksPrefix = (reader: ReaderId) => `tl-ticks:${reader === null ? "anon" : `u${reader}`}:`;

function workerSupported() {
  return typeof navigator !== "undefined" && "serviceWorker" in navigator;
}

/** The message's answer from the active worker, or null without one (no support, not registered, or no answer in time). */
export async function askWorker(
  message: OfflineMessage & Record<string, unknown>,
  timeoutMs = 20_000,
): Promise<OfflineReply | null> {
  if (!workerSupported()) return null;
  const registration = await navigator.serviceWorker.getRegistration("/");
  const worker = navigator.serviceWorker.controller ?? registration?.active ?? null;
  if (!worker) return null;
  return new Promise((resolve) => {
    const channel = new MessageChannel();
    const timer = setTimeout(() => resolve(null), timeoutMs);
    channel.port1.onmessage = (event) => {
      clearTimeout(timer);
      resolve(event.data as OfflineReply);
    };
    worker.postMessage(message, [channel.port2]);
  });
}

let syncing: Promise<void> | null = null;

/** Asks the worker to send what it queued (once at a time), then tells the screens to read their data again. */
export function syncQueued(reader: ReaderId): Promise<void> {
  syncing ??= askWorker({ type: "replay", reader })
    .then((reply) => {
      window.dispatchEvent(new Event(SYNCED_EVENT));
      const refused = reply?.ok ? (reply.refused ?? []) : [];
      if (refused.length) window.dispatchEvent(new CustomEvent<Refusal[]>(REFUSED_EVENT, { detail: refused }));
    })
    .finally(() => {
      syncing = null;
    });
  return syncing;
}

/** Drops this browser's copies of a reader's ticks when someone else (or nobody) is signed in now. */
function forgetPreviousReader(reader: ReaderId) {
  const previous = window.localStorage.getItem(LAST_READER_KEY);
  const now = reader === null ? "anon" : String(reader);
  if (previous && previous !== now && previous !== "anon") {
    const prefix = localTicksPrefix(Number(previous));
    for (const key of Object.keys(window.localStorage)) if (key.startsWith(prefix)) window.localStorage.removeItem(key);
  }
  window.localStorage.setItem(LAST_READER_KEY, now);
}

/**
 * Once per page load: registers the worker (built app only), tells it who is signed in and sends
 * the queued changes, now and whenever the signal comes back. Returns the clean-up.
 */
export function startOffline(reader: ReaderId, register: boolean): () => void {
  try {
    forgetPreviousReader(reader);
  } catch {
    // Storage refused (private mode with storage off): nothing of a previous reader can be there either.
  }
  if (!workerSupported()) return () => {};
  if (register) {
    navigator.serviceWorker.register("/sw.js", { scope: "/" }).catch(() => {
      // Without a worker the app works as before, online only.
    });
  }
  void navigator.serviceWorker.ready.then(() => askWorker({ type: "reader", reader })).then(() => syncQueued(reader));
  // Sent as the signal returns, and once more a moment later: the worker's own network may come
  // back a little after the page hears it, and a change that could not be sent waits in the queue.
  let again: ReturnType<typeof setTimeout> | undefined;
  const online = () => {
    void syncQueued(reader);
    clearTimeout(again);
    again = setTimeout(() => void syncQueued(reader), 3000);
  };
  window.addEventListener("online", online);
  return () => {
    clearTimeout(again);
    window.removeEventListener("online", online);
  };
}

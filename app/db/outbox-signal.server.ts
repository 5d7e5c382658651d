/**
 * "The outbox has new mail" within one process. The worker sleeps between polls; a change that
 * writes an outbox row wakes it at once, after the row's transaction commits (see `batch`).
 *
 * The state sits on globalThis under a registered symbol: the dev and test servers load the app's
 * modules through Vite while the server script and the tests load their own copies, and a wake from
 * any copy must reach the one worker of the process.
 */
type Signal = { listeners: Set<() => void>; writes: WeakSet<object> };

const KEY = Symbol.for("torqueleaf.outbox-signal");
const holder = globalThis as typeof globalThis & { [KEY]?: Signal };
holder[KEY] ??= { listeners: new Set(), writes: new WeakSet() };
const signal: Signal = holder[KEY];

/** Marks a query as one that writes outbox rows, so the batch that runs it wakes the worker. */
export function markOutboxWrite<Q extends object>(query: Q): Q {
  signal.writes.add(query);
  return query;
}

export const isOutboxWrite = (query: unknown) => typeof query === "object" && query !== null && signal.writes.has(query);

/** Wakes every worker of this process (there is one at most in practice). */
export function outboxChanged() {
  for (const listener of signal.listeners) listener();
}

/** Subscribes a worker; returns the unsubscribe. */
export function onOutboxChanged(listener: () => void): () => void {
  signal.listeners.add(listener);
  return () => signal.listeners.delete(listener);
}

import { createContext, type ReactNode, useCallback, useContext, useEffect, useMemo, useState } from "react";
import { localTicksPrefix, SYNCED_EVENT, syncQueued } from "~/utils/offline-client";
import { QUEUED_HEADER, type ReaderId } from "~/utils/offline-protocol";
import { useRootData } from "~/utils/root-data";
import { type StepTicks, stepTicksPath, TICK_READER_HEADER } from "~/utils/step-ticks";

/**
 * Work-through mode: a "done" tick on every step and a progress bar. The page itself is the same
 * for everyone (it is cached for readers who are not signed in), so ticks are never rendered by the
 * server: they come after hydration, from this browser for a reader who is not signed in and from
 * the step-tick API (private, never cached) for one who is, with a copy in this browser so they
 * still show without signal. A tick made without signal is queued by the service worker and sent
 * when the signal returns.
 */

type WorkThrough = {
  done: ReadonlySet<number>;
  toggle: (position: number) => void;
  stepCount: number;
  message: string | null;
};

const WorkThroughContext = createContext<WorkThrough | null>(null);

function readLocal(key: string): Set<number> {
  try {
    const parsed: unknown = JSON.parse(window.localStorage.getItem(key) ?? "[]");
    return new Set(Array.isArray(parsed) ? parsed.filter((n): n is number => Number.isInteger(n) && n >= 0) : []);
  } catch {
    return new Set();
  }
}

function writeLocal(key: string, done: ReadonlySet<number>) {
  try {
    window.localStorage.setItem(key, JSON.stringify([...done].sort((a, b) => a - b)));
  } catch {
    // Storage full or refused: the ticks still show until the page is left.
  }
}

async function errorMessage(response: Response) {
  try {
    const body = (await response.json()) as { error?: { message?: string } };
    return body.error?.message ?? `The server answered ${response.status}.`;
  } catch {
    return `The server answered ${response.status}.`;
  }
}

export function WorkThroughProvider({
  slug,
  revision,
  stepCount,
  children,
}: {
  slug: string;
  revision: number;
  stepCount: number;
  children: ReactNode;
}) {
  const reader: ReaderId = useRootData()?.user?.id ?? null;
  const key = `${localTicksPrefix(reader)}${slug}:r${revision}`;
  const [done, setDone] = useState<ReadonlySet<number>>(() => new Set());
  const [message, setMessage] = useState<string | null>(null);

  const apply = useCallback(
    (next: ReadonlySet<number>) => {
      setDone(next);
      writeLocal(key, next);
    },
    [key],
  );

  const fromServer = useCallback(async () => {
    if (reader === null) return;
    try {
      const response = await fetch(stepTicksPath(slug), { headers: { accept: "application/json" } });
      if (!response.ok) return;
      const body = (await response.json()) as StepTicks;
      if (body.revision === revision) apply(new Set(body.done));
    } catch {
      // No signal: the copy in this browser stands.
    }
  }, [reader, slug, revision, apply]);

  useEffect(() => {
    setDone(readLocal(key));
    if (reader === null) return;
    // Queued ticks go first, so the server's answer already has them.
    void syncQueued(reader).then(fromServer);
    const again = () => void fromServer();
    window.addEventListener(SYNCED_EVENT, again);
    return () => window.removeEventListener(SYNCED_EVENT, again);
  }, [key, reader, fromServer]);

  const toggle = useCallback(
    (position: number) => {
      const wasDone = done.has(position);
      const next = new Set(done);
      if (wasDone) next.delete(position);
      else next.add(position);
      apply(next);
      setMessage(null);
      if (reader === null) return;
      const rollback = (why: string) => {
        setDone((current) => {
          const back = new Set(current);
          if (wasDone) back.add(position);
          else back.delete(position);
          writeLocal(key, back);
          return back;
        });
        setMessage(why);
      };
      fetch(stepTicksPath(slug), {
        method: "PUT",
        headers: { "content-type": "application/json", accept: "application/json", [TICK_READER_HEADER]: String(reader) },
        body: JSON.stringify({ revision, position, done: !wasDone }),
      }).then(
        async (response) => {
          if (response.status === 202 && response.headers.get(QUEUED_HEADER)) {
            setMessage("No signal: the tick is kept on this device and sent when the signal returns.");
          } else if (response.ok) {
            apply(new Set(((await response.json()) as StepTicks).done));
          } else {
            rollback(`The tick was not saved: ${await errorMessage(response)}`);
          }
        },
        () => rollback("The tick was not saved: the server could not be reached. Try again when you have signal."),
      );
    },
    [done, apply, reader, slug, revision, key],
  );

  const value = useMemo(() => ({ done, toggle, stepCount, message }), [done, toggle, stepCount, message]);
  return <WorkThroughContext.Provider value={value}>{children}</WorkThroughContext.Provider>;
}

function useWorkThrough() {
  return useContext(WorkThroughContext);
}

/** How far through the guide the reader is: a bar and the count, announced as it changes. */
export function WorkThroughProgress() {
  const work = useWorkThrough();
  if (!work) return null;
  const count = work.done.size;
  return (
    <section aria-label="Your progress" className="no-print mb-8 rounded-xl border border-rule bg-white p-4 shadow-sm">
      <div className="flex flex-wrap items-baseline justify-between gap-x-4 text-sm">
        <p className="font-semibold text-spruce-900" id="work-through-label">
          Work through it
        </p>
        <p aria-live="polite" className="tabular-nums text-ink-soft">
          {count} of {work.stepCount} steps done
        </p>
      </div>
      {/* A native progress bar: its width needs no style attribute, which the Content-Security-Policy refuses. */}
      <progress
        aria-labelledby="work-through-label"
        aria-valuetext={`${count} of ${work.stepCount} steps done`}
        max={work.stepCount}
        value={count}
        className="mt-2 block h-2.5 w-full appearance-none overflow-hidden rounded-full border-0 bg-paper-deep [&::-moz-progress-bar]:bg-spruce-500 [&::-webkit-progress-bar]:bg-paper-deep [&::-webkit-progress-value]:rounded-full [&::-webkit-progress-value]:bg-spruce-500"
      />
      <p className="mt-2 text-xs text-ink-soft">
        Tick each step as you finish it; the ticks stay on this device and, when you are signed in, on your account.
      </p>
      {work.message ? (
        <p role="status" className="mt-2 text-sm text-brass-700">
          {work.message}
        </p>
      ) : null}
    </section>
  );
}

/** The "done" tick at the end of a step. */
export function StepDoneTick({ index }: { index: number }) {
  const work = useWorkThrough();
  if (!work) return null;
  const done = work.done.has(index);
  return (
    <p className="no-print mt-5">
      <button
        type="button"
        aria-pressed={done}
        onClick={() => work.toggle(index)}
        className={`inline-flex min-h-11 items-center gap-2 rounded-full border px-4 text-sm font-semibold ${
          done ? "border-spruce-700 bg-spruce-700 text-white" : "border-rule bg-white text-spruce-800 hover:bg-paper-deep"
        }`}
      >
        <span aria-hidden="true" className="inline-flex h-5 w-5 items-center justify-center rounded border border-current">
          {done ? "✓" : ""}
        </span>
        Step {index + 1} done
      </button>
    </p>
  );
}

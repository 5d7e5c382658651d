import { getDb, type Db } from "~/db/client.server";
import { onOutboxChanged } from "~/db/outbox-signal.server";
import {
  claimDueMail,
  hasOptedOut,
  markAttemptFailed,
  markSent,
  markSkipped,
  nextDueAt,
  type OutboxRow,
} from "~/models/outbox.server";
import { SMTP_TIMEOUT_MS, sendMail } from "~/services/mail.server";
import { isOptionalMailKind } from "~/utils/mail-kinds";
import { optOutUrl } from "./opt-out-token.server";

/**
 * The outbox worker: sends what changes wrote to the outbox table, one row at a time, each under a
 * claim (see claimDueMail). Delivery is at least once in one narrow case only: a process killed
 * after the SMTP server took a message but before the row was marked sent sends it again once the
 * claim runs out. Nothing committed is lost, and nothing is sent twice while a claim is live.
 */
export const OUTBOX_DEFAULTS = {
  /** Longer than the longest send (three SMTP waits), so a live send never loses its claim. */
  leaseMs: 4 * SMTP_TIMEOUT_MS,
  /** The first retry waits this long, each next one twice as long, up to `maxDelayMs`, plus up to 20 % jitter. */
  baseDelayMs: 5_000,
  maxDelayMs: 30 * 60_000,
  /** Attempts in all: about 1.7 hours of retries with the delays above. */
  maxAttempts: 12,
  /** How often to look while mail is due or soon due, and at most how long to sleep otherwise (mail from other processes). */
  busyPollMs: 250,
  idlePollMs: 2_000,
};
export type OutboxOptions = typeof OUTBOX_DEFAULTS;

/** When attempt `attempts + 1` may run, after `attempts` failures. */
export function retryDelayMs(attempts: number, options: Pick<OutboxOptions, "baseDelayMs" | "maxDelayMs">, random = Math.random) {
  const plain = Math.min(options.maxDelayMs, options.baseDelayMs * 2 ** Math.max(0, attempts - 1));
  return Math.round(plain * (1 + 0.2 * random()));
}

export type OutboxLog = { warn: (message: string) => void; error: (message: string) => void };

/** The List-Unsubscribe headers of RFC 2369 and RFC 8058 (one-click) for a mail someone may turn off. */
export function optOutHeaders(row: Pick<OutboxRow, "kind" | "userId">): Record<string, string> | undefined {
  if (!row.userId || !isOptionalMailKind(row.kind)) return undefined;
  return {
    "List-Unsubscribe": `<${optOutUrl(row.userId, row.kind)}>`,
    "List-Unsubscribe-Post": "List-Unsubscribe=One-Click",
  };
}

const messageOf = (error: unknown) => (error instanceof Error ? error.message : String(error));

/** Gives one send its time and no more: past it the attempt counts as failed and the row is tried again later. */
async function sendWithin(row: OutboxRow, ms: number) {
  let timer: NodeJS.Timeout | undefined;
  const late = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new Error(`no answer from the mail server within ${ms / 1000} s`)), ms);
  });
  try {
    await Promise.race([
      sendMail({ to: row.to, subject: row.subject, text: row.text, html: row.html }, optOutHeaders(row)),
      late,
    ]);
  } finally {
    clearTimeout(timer);
  }
}

/**
 * One pass: claims, sends and marks due rows until none is due (or `shouldStop`). Returns how many
 * rows it handled. `now` is read afresh for every row; tests pass a clock.
 */
export async function runOutboxPass(
  db: Db,
  options: Partial<OutboxOptions> & { now?: () => Date; log?: OutboxLog; shouldStop?: () => boolean } = {},
): Promise<number> {
  const o = { ...OUTBOX_DEFAULTS, ...options };
  const now = options.now ?? (() => new Date());
  const log = options.log ?? console;
  let handled = 0;
  while (!options.shouldStop?.()) {
    const row = await claimDueMail(db, now(), o.leaseMs);
    if (!row) break;
    handled++;
    if (row.userId && row.kind !== "account" && (await hasOptedOut(db, row.userId, row.kind))) {
      await markSkipped(db, row);
      continue;
    }
    try {
      await sendWithin(row, o.leaseMs / 2);
    } catch (error) {
      const attempts = row.attempts + 1;
      const last = attempts >= o.maxAttempts;
      const retryAt = last ? null : new Date(now().getTime() + retryDelayMs(attempts, o));
      await markAttemptFailed(db, row, messageOf(error), retryAt);
      const what = `Mail ${row.id} ("${row.subject}") to ${row.to}`;
      if (last) log.error(`${what} failed ${attempts} times and is given up: ${messageOf(error)}`);
      else log.warn(`${what} was not sent (attempt ${attempts}, next at ${retryAt?.toISOString()}): ${messageOf(error)}`);
      continue;
    }
    await markSent(db, row, now());
  }
  return handled;
}

export type OutboxWorker = { stop: () => Promise<void>; wake: () => void };

/**
 * Runs passes for as long as the process serves: a few times a second while mail is due, at once
 * when a change in this process writes to the outbox, and every `idlePollMs` otherwise (mail written
 * by another process). `stop` lets the send in progress finish and resolves when the worker is idle.
 */
export function startOutboxWorker(
  options: Partial<OutboxOptions> & { db?: () => Promise<Db>; log?: OutboxLog } = {},
): OutboxWorker {
  const o = { ...OUTBOX_DEFAULTS, ...options };
  const log = options.log ?? console;
  const database = options.db ?? getDb;
  let stopped = false;
  let timer: NodeJS.Timeout | undefined;
  let running: Promise<void> | undefined;
  let again = false;

  const schedule = (ms: number) => {
    clearTimeout(timer);
    if (!stopped) timer = setTimeout(tick, ms).unref();
  };

  async function pass() {
    const db = await database();
    await runOutboxPass(db, { ...o, log, shouldStop: () => stopped });
    const next = await nextDueAt(db);
    const wait = next ? next.getTime() - Date.now() : o.idlePollMs;
    return Math.min(o.idlePollMs, Math.max(o.busyPollMs, wait));
  }

  function tick() {
    if (stopped) return;
    if (running) {
      again = true; // a wake during a pass: look once more right after it
      return;
    }
    running = pass()
      .then(
        (wait) => schedule(again ? 0 : wait),
        (error: unknown) => {
          log.warn(`The outbox worker could not read the outbox: ${messageOf(error)}`);
          schedule(o.idlePollMs);
        },
      )
      .finally(() => {
        running = undefined;
        again = false;
      });
  }

  const unsubscribe = onOutboxChanged(() => schedule(0));
  schedule(0);
  return {
    wake: () => schedule(0),
    stop: async () => {
      stopped = true;
      clearTimeout(timer);
      unsubscribe();
      await running;
    },
  };
}

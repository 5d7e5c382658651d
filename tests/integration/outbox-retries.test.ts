import { eq } from "drizzle-orm";
import { SMTPServer } from "smtp-server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { batch } from "~/db/batch.server";
import { createDb, type Db, getDb } from "~/db/client.server";
import { outbox } from "~/db/schema";
import { claimDueMail, markSent, outboxInsert } from "~/models/outbox.server";
import { OUTBOX_DEFAULTS, retryDelayMs, runOutboxPass } from "~/services/mail/outbox-worker.server";
import { useTestDatabase } from "../support/base-db";

/**
 * Retries and claims, driven pass by pass with a clock of the test's own, against a real SMTP
 * server (smtp-server from npm) that refuses every recipient with 550. No app server here, so no
 * other worker touches these rows.
 */

let refusing: SMTPServer;
let file = "";
let db: Db;

beforeAll(async () => {
  refusing = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    logger: false,
    onRcptTo(_address, _session, callback) {
      // RFC 5321 §4.2.2: 550, mailbox unavailable.
      callback(Object.assign(new Error("Mailbox unavailable"), { responseCode: 550 }));
    },
  });
  await new Promise<void>((resolve) => refusing.listen(0, "127.0.0.1", resolve));
  const { port } = refusing.server.address() as { port: number };
  Object.assign(process.env, { SMTP_HOST: "127.0.0.1", SMTP_PORT: String(port) });
  file = useTestDatabase("outbox-retries");
  db = await getDb();
});

afterAll(async () => {
  await new Promise<void>((resolve) => refusing.close(() => resolve()));
});

const mail = (to: string) => ({ kind: "account" as const, to, subject: `For ${to}`, text: "Hello", html: "<p>Hello</p>" });
const rowOf = async (to: string) => (await db.select().from(outbox).where(eq(outbox.to, to)))[0];

describe("a mail the server keeps refusing", () => {
  it("is retried later each time, twice as late as before plus at most 20 % jitter, and given up as failed after the maximum", async () => {
    const to = "refused@example.test";
    await batch(db, [outboxInsert(db, mail(to))]);
    const options = { baseDelayMs: 1000, maxDelayMs: 60_000, maxAttempts: 5 };
    const errors: string[] = [];
    const warnings: string[] = [];
    const log = { warn: (m: string) => warnings.push(m), error: (m: string) => errors.push(m) };
    let clock = Date.now();
    const delays: number[] = [];
    for (let attempt = 1; attempt <= options.maxAttempts; attempt++) {
      // Not due yet: a pass before nextAttemptAt leaves the row alone.
      const waiting = await rowOf(to);
      if (attempt > 1) {
        clock = waiting.nextAttemptAt.getTime() - 1;
        expect(await runOutboxPass(db, { ...options, now: () => new Date(clock), log })).toBe(0);
        clock += 1;
      }
      expect(await runOutboxPass(db, { ...options, now: () => new Date(clock), log })).toBe(1);
      const row = await rowOf(to);
      expect(row.attempts).toBe(attempt);
      expect(row.lastError).toMatch(/550/);
      expect(row.claimedUntil).toBeNull();
      if (attempt < options.maxAttempts) {
        expect(row.state).toBe("pending");
        delays.push(row.nextAttemptAt.getTime() - clock);
      } else {
        expect(row.state).toBe("failed");
      }
    }
    // 1 s, 2 s, 4 s, 8 s, each up to 20 % later.
    delays.forEach((delay, i) => {
      const plain = 1000 * 2 ** i;
      expect(delay).toBeGreaterThanOrEqual(plain);
      expect(delay).toBeLessThanOrEqual(plain * 1.2);
    });
    expect(warnings).toHaveLength(options.maxAttempts - 1);
    expect(errors).toHaveLength(1);
    expect(errors[0]).toMatch(/failed 5 times and is given up/);
    // A failed row is never picked up again.
    clock += 24 * 60 * 60_000;
    expect(await runOutboxPass(db, { ...options, now: () => new Date(clock), log })).toBe(0);
  });

  it("waits at most maxDelayMs between attempts, and the defaults retry for over an hour", () => {
    const cap = { baseDelayMs: 1000, maxDelayMs: 5000 };
    expect(retryDelayMs(10, cap, () => 0)).toBe(5000);
    expect(retryDelayMs(10, cap, () => 1)).toBe(6000);
    let total = 0;
    for (let n = 1; n < OUTBOX_DEFAULTS.maxAttempts; n++) total += retryDelayMs(n, OUTBOX_DEFAULTS, () => 0);
    expect(total).toBeGreaterThan(60 * 60_000);
  });
});

describe("claims", () => {
  it("give a due row to one of two workers (two connections, as two processes) while the claim is live, and to the next after it runs out", async () => {
    const to = "claimed@example.test";
    await batch(db, [outboxInsert(db, mail(to))]);
    const other = createDb(`file:${file}`);
    try {
      const now = new Date();
      const [a, b] = await Promise.all([claimDueMail(db, now, 60_000), claimDueMail(other.db, now, 60_000)]);
      const winners = [a, b].filter((r) => r?.to === to);
      expect(winners).toHaveLength(1);
      // Still claimed a second later; free again once the lease is over.
      expect(await claimDueMail(other.db, new Date(now.getTime() + 1000), 60_000)).toBeNull();
      const later = new Date(now.getTime() + 60_001);
      const retaken = await claimDueMail(other.db, later, 60_000);
      expect(retaken?.id).toBe(winners[0]?.id);
      // The first worker's outcome no longer counts: its claim was taken over.
      await markSent(db, winners[0]!, new Date());
      expect((await rowOf(to)).state).toBe("pending");
      await markSent(other.db, retaken!, new Date());
      expect(await rowOf(to)).toMatchObject({ state: "sent", attempts: 1, claimedUntil: null });
    } finally {
      other.client.close();
    }
  });
});

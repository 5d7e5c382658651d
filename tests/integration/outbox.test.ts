import { createServer, type Socket } from "node:net";
import { setTimeout as sleep } from "node:timers/promises";
import { and, desc, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { batch } from "~/db/batch.server";
import { createDb, type Db, getDb } from "~/db/client.server";
import { auditLog, mailOptOuts, outbox } from "~/db/schema";
import { outboxInsert } from "~/models/outbox.server";
import { findUserByEmail } from "~/models/users.server";
import { type CaughtMail, startMailFake } from "~/services/fakes/mail";
import { changesRequestedNotice, guidePublishedNotice, type Recipient } from "~/services/mail/notices.server";
import { startAppServer } from "../support/app-server";
import { useTestDatabase } from "../support/base-db";
import { TestClient } from "../support/http-client";
import { ensureBuild, sharedServices, startBuiltApp } from "./built-app";

/**
 * The outbox against a real SMTP catcher of this file's own, which the tests stop and start again
 * (the run's shared one serves every other file): mail written while it is down, or before the
 * server process is killed, arrives once it is back, exactly once. Opt-out links over real HTTP.
 */

// This file's catcher, on ports that stay the same across its restarts; the app here sends to it.
const first = await startMailFake({ smtpPort: 0, httpPort: 0 });
const ports = { smtpPort: first.smtpPort, httpPort: Number(new URL(first.inboxUrl).port) };
let catcher: Awaited<ReturnType<typeof startMailFake>> | null = first;
Object.assign(process.env, { SMTP_HOST: "127.0.0.1", SMTP_PORT: String(ports.smtpPort), MAIL_INBOX_URL: first.inboxUrl });

async function catcherDown() {
  await catcher?.stop();
  catcher = null;
}
async function catcherUp() {
  catcher ??= await startMailFake(ports);
}
async function caughtTo(address: string): Promise<CaughtMail[]> {
  const response = await fetch(`http://127.0.0.1:${ports.httpPort}/messages`);
  const { messages } = (await response.json()) as { messages: CaughtMail[] };
  return messages.filter((m) => m.to.includes(address));
}

/** Polls until `check` gives a value (not null/undefined/false), or fails after `ms`. */
async function until<T>(what: string, check: () => Promise<T | null | undefined | false>, ms = 15_000): Promise<T> {
  const deadline = Date.now() + ms;
  for (;;) {
    const value = await check();
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await sleep(100);
  }
}

const rowsTo = (db: Db, address: string) => db.select().from(outbox).where(eq(outbox.to, address)).orderBy(outbox.id);

let app: Awaited<ReturnType<typeof startAppServer>>;
let db: Db;

async function recipient(email: string): Promise<Recipient> {
  const user = (await findUserByEmail(db, email))!;
  return { userId: user.id, email: user.email, name: user.name };
}

const published = (to: Recipient, title: string) =>
  guidePublishedNotice({
    to,
    guideTitle: title,
    editorName: "Tamsin Oakridge",
    revisionNumber: 2,
    guideUrl: `${app.origin}/guides/x`,
  });

beforeAll(async () => {
  useTestDatabase("outbox");
  app = await startAppServer();
  db = await getDb();
  // The development server compiles a route on its first request: done here, outside the timings below.
  for (const path of ["/reset", "/mail/opt-out/x", "/login"]) await (await fetch(`${app.origin}${path}`)).arrayBuffer();
}, 90_000);

afterAll(async () => {
  await app?.stop();
  await catcher?.stop();
});

describe("mail written while the mail server is down", () => {
  it("is kept, retried and, once the server is back, delivered exactly once: account mail and a notice alike", async () => {
    const email = "author2@torqueleaf.test";
    const to = await recipient(email);
    await catcherDown();
    // An account action writes its mail with the reset token; a notice goes in through outboxInsert.
    const client = new TestClient(app.origin);
    expect((await client.post("/reset", { email })).status).toBe(200);
    await batch(db, [outboxInsert(db, published(to, "Roof bars on the Fjell F3"))]);

    // The worker tried both, was refused, and scheduled the next attempt.
    const tried = await until("two refused attempts", async () => {
      const rows = await rowsTo(db, email);
      return rows.length === 2 && rows.every((r) => r.attempts === 1 && r.lastError) && rows;
    });
    for (const row of tried) {
      expect(row.state).toBe("pending");
      expect(row.sentAt).toBeNull();
      expect(row.nextAttemptAt.getTime()).toBeGreaterThan(Date.now() - 1000);
    }
    expect(tried.map((r) => r.kind)).toEqual(["account", "guide-published"]);
    await catcherUp();
    const mails = await until("both mails", async () => {
      const got = await caughtTo(email);
      return got.length >= 2 && got;
    });
    // Time for a second copy to show up, if the worker were to send one.
    await sleep(1500);
    expect((await caughtTo(email)).map((m) => m.subject).sort()).toEqual([
      "Choose a new Torqueleaf password",
      "Published: Roof bars on the Fjell F3",
    ]);
    const rows = await rowsTo(db, email);
    expect(rows.map((r) => [r.state, r.attempts])).toEqual([
      ["sent", 2],
      ["sent", 2],
    ]);
    expect(rows.every((r) => r.sentAt && r.claimedUntil === null)).toBe(true);

    // Only the notice may be turned off, so only it carries the one-click headers (RFC 8058 §3.1).
    const notice = mails.find((m) => m.subject.startsWith("Published"))!;
    const reset = mails.find((m) => m.subject.startsWith("Choose"))!;
    expect(notice.headers["list-unsubscribe-post"]).toBe("List-Unsubscribe=One-Click");
    expect(notice.headers["list-unsubscribe"]).toMatch(/^<http:\/\/localhost:\d+\/mail\/opt-out\/[\w.-]+>$/);
    expect(reset.headers["list-unsubscribe"]).toBeUndefined();
    // The header and the footer link are the same link.
    expect(notice.text).toContain(notice.headers["list-unsubscribe"].slice(1, -1));
  }, 60_000);
});

describe("a server killed after the commit and before the send", () => {
  beforeAll(ensureBuild, 240_000);

  it("sends the mail after the restart, once its dead claim runs out, and never twice", async () => {
    const email = "reader@torqueleaf.test";
    // In place of the catcher, a mail server that accepts the connection and never answers: the
    // worker has claimed the row and is in the middle of sending it when the process is killed.
    await catcherDown();
    const stalled: Socket[] = [];
    let onConnection = () => {};
    const connected = new Promise<void>((resolve) => {
      onConnection = resolve;
    });
    const staller = createServer((socket) => {
      stalled.push(socket);
      onConnection();
    });
    await new Promise<void>((resolve) => staller.listen(ports.smtpPort, "127.0.0.1", resolve));
    const settings = {
      ...sharedServices(),
      SMTP_HOST: "127.0.0.1",
      SMTP_PORT: String(ports.smtpPort),
      NODE_ENV: "production",
      SESSION_SECRET: "a-long-production-secret-for-the-outbox-test",
      LOCAL_FAKES: "0",
      DEMO_DATA: "0",
    };
    const before = await startBuiltApp(settings, { database: "demo" });
    const reset = await new TestClient(before.url).post("/reset", { email }, { origin: `http://localhost:${before.port}` });
    expect(reset.status).toBe(200);
    await connected;
    await before.kill();
    for (const socket of stalled) socket.destroy();
    await new Promise((resolve) => staller.close(resolve));

    // What the killed process committed: the mail, unsent, under the dead process's claim.
    const file = createDb(`file:${before.database}`);
    const [row] = await rowsTo(file.db, email);
    expect(row).toMatchObject({ kind: "account", state: "pending", attempts: 0, sentAt: null });
    const claimEnds = row.claimedUntil!.getTime();
    expect(claimEnds).toBeGreaterThan(Date.now());

    await catcherUp();
    const after = await startBuiltApp(settings, { databaseFile: before.database });
    try {
      const [mail] = await until(
        "the reset mail after the restart",
        async () => {
          const got = await caughtTo(email);
          return got.length > 0 && got;
        },
        claimEnds - Date.now() + 15_000,
      );
      // The new process could not tell the old one was dead, so it waited for the claim to run out.
      expect(Date.parse(mail.receivedAt)).toBeGreaterThanOrEqual(claimEnds);
      await sleep(1500);
      expect(await caughtTo(email)).toHaveLength(1);
      expect(mail.subject).toBe("Choose a new Torqueleaf password");
      const [sent] = await rowsTo(file.db, email);
      expect(sent).toMatchObject({ state: "sent", attempts: 1 });
      // The token was committed with its mail: the link opens the form on the restarted server.
      const path = new URL(mail.text.match(/https?:\/\/\S+\/reset\/[\w-]+/)![0]).pathname;
      const page = await (await fetch(`${after.url}${path}`)).text();
      expect(page).toContain("Choose a new password");
      expect(page).not.toContain("expired");
    } finally {
      file.client.close();
      await after.stop();
    }
  }, 180_000);
});

describe("the one-click opt-out link", () => {
  const linkIn = (mail: CaughtMail) => new URL(mail.text.match(/https?:\/\/\S+\/mail\/opt-out\/\S+/)![0]).pathname;

  async function mailedLink(to: Recipient, title: string) {
    await batch(db, [outboxInsert(db, published(to, title))]);
    const mail = await until(`the mail "${title}"`, async () =>
      (await caughtTo(to.email)).find((m) => m.subject.endsWith(title)),
    );
    return linkIn(mail);
  }
  const optOuts = (userId: number) => db.select().from(mailOptOuts).where(eq(mailOptOuts.userId, userId));

  it("works without signing in, for its own recipient only, and the next mail of that kind is skipped", async () => {
    await catcherUp();
    const author = await recipient("author@torqueleaf.test");
    const reader = await recipient("reader@torqueleaf.test");
    const path = await mailedLink(author, "Hood lamps revision 2");

    const anonymous = new TestClient(app.origin);
    const page = await anonymous.get(path);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain("Turn off these mails?");
    expect(html).toContain("a…@torqueleaf.test");
    // Opening the link changes nothing (mail scanners open links).
    expect(await optOuts(author.userId)).toEqual([]);

    // Signed in as someone else, the link still acts for its recipient, never for the signed-in reader.
    const signedIn = new TestClient(app.origin);
    expect((await signedIn.signIn(reader.email, "torqueleaf-demo")).status).toBe(302);
    const done = await signedIn.post(path, {});
    expect(done.status).toBe(200);
    expect(await done.text()).toContain("These mails are off");
    expect((await optOuts(author.userId)).map((o) => o.kind)).toEqual(["guide-published"]);
    expect(await optOuts(reader.userId)).toEqual([]);
    const [audit] = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.action, "user.mail-opt-out"), eq(auditLog.subjectId, String(author.userId))));
    expect(audit).toMatchObject({ actorId: author.userId, data: { kind: "guide-published", via: "page" } });

    // The next mail of that kind is not sent, and its row says why.
    const before = (await caughtTo(author.email)).length;
    await batch(db, [outboxInsert(db, published(author, "Hood lamps revision 3"))]);
    const skipped = await until("the skipped row", async () => {
      const rows = await rowsTo(db, author.email);
      const last = rows.at(-1);
      return last?.subject.endsWith("revision 3") && last.state !== "pending" && last;
    });
    expect(skipped).toMatchObject({ state: "skipped", sentAt: null, attempts: 0 });
    // Other kinds still come.
    await batch(db, [
      outboxInsert(
        db,
        changesRequestedNotice({
          to: author,
          guideTitle: "Hood lamps",
          editorName: "Tamsin Oakridge",
          revisionNumber: 3,
          note: "Name the fuse.",
          workbenchUrl: `${app.origin}/workbench`,
        }),
      ),
    ]);
    await until("the changes-requested mail", async () =>
      (await caughtTo(author.email)).find((m) => m.subject.startsWith("Changes requested")),
    );
    expect((await caughtTo(author.email)).filter((m) => m.subject.endsWith("revision 3"))).toEqual([]);
    expect((await caughtTo(author.email)).length).toBe(before + 1);
  }, 30_000);

  it("takes a mail client's one-click POST (RFC 8058 §3.2: no cookies, not from our pages)", async () => {
    const editor = await recipient("editor@torqueleaf.test");
    const path = await mailedLink(editor, "Dash camera hardwire");
    // A mail provider's server posts the fixed body with neither our Origin nor Sec-Fetch-Site.
    const response = await fetch(`${app.origin}${path}`, {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded", origin: "https://mail.example.net" },
      body: "List-Unsubscribe=One-Click",
    });
    expect(response.status).toBe(200);
    expect((await optOuts(editor.userId)).map((o) => o.kind)).toEqual(["guide-published"]);
    const [audit] = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.action, "user.mail-opt-out"), eq(auditLog.subjectId, String(editor.userId))))
      .orderBy(desc(auditLog.id));
    expect(audit.data).toEqual({ kind: "guide-published", via: "one-click" });
    // A second post changes nothing and is not audited again.
    expect(
      (
        await fetch(`${app.origin}${path}`, {
          method: "POST",
          headers: { "content-type": "application/x-www-form-urlencoded" },
          body: "List-Unsubscribe=One-Click",
        })
      ).status,
    ).toBe(200);
    const audits = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.action, "user.mail-opt-out"), eq(auditLog.subjectId, String(editor.userId))));
    expect(audits).toHaveLength(1);
    // Other writes from elsewhere are still refused.
    const other = await fetch(`${app.origin}/reset`, {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded", origin: "https://mail.example.net" },
      body: "email=editor%40torqueleaf.test",
    });
    expect(other.status).toBe(403);
  });

  it("refuses a tampered token with a 400 page that says so, and changes nothing", async () => {
    const admin = await recipient("admin@torqueleaf.test");
    const reader = await recipient("reader@torqueleaf.test");
    const path = await mailedLink(admin, "Winch mount");
    const token = path.split("/").at(-1)!;
    const [, kind, signature] = token.split(".");
    const tampered = [
      // Another account's id with the admin's signature: would turn off someone else's mail.
      `/mail/opt-out/${reader.userId}.${kind}.${signature}`,
      `/mail/opt-out/${admin.userId}.changes-requested.${signature}`,
      `/mail/opt-out/${token.slice(0, -1)}${token.endsWith("A") ? "B" : "A"}`,
      `/mail/opt-out/${token.slice(0, 20)}`,
    ];
    const client = new TestClient(app.origin);
    for (const bad of tampered) {
      const page = await client.get(bad);
      expect(page.status, bad).toBe(400);
      expect(await page.text()).toContain("This opt-out link is incomplete or was changed");
      expect((await client.post(bad, { "List-Unsubscribe": "One-Click" })).status, bad).toBe(400);
    }
    expect(await optOuts(admin.userId)).toEqual([]);
    expect(await optOuts(reader.userId)).toEqual([]);
  });
});

describe("the Mail section of the account page", () => {
  it("shows each kind that can reach the member, saves the choices and audits them", async () => {
    const email = "author2@torqueleaf.test";
    const author = await recipient(email);
    const client = new TestClient(app.origin);
    expect((await client.signIn(email, "torqueleaf-demo")).status).toBe(302);
    const page = await (await client.get("/me/account")).text();
    expect(page).toContain('id="mail"');
    for (const label of [
      "An editor asks for changes",
      "Your guide is published",
      "Your guide is taken down",
      "A reader reports on fitment",
    ]) {
      expect(page).toContain(label);
    }
    // Review notices go to editors only.
    expect(page).not.toContain("A revision waits for review");

    // Everything but "published" ticked: that one is turned off.
    const saved = await client.post("/me/account", {
      intent: "mail",
      "mail-changes-requested": "on",
      "mail-guide-unpublished": "on",
      "mail-fitment-report": "on",
    });
    expect(saved.status).toBe(302);
    expect((await db.select().from(mailOptOuts).where(eq(mailOptOuts.userId, author.userId))).map((o) => o.kind)).toEqual([
      "guide-published",
    ]);
    const after = await (await client.get("/me/account")).text();
    const box = (name: string) => after.match(new RegExp(`<input type="checkbox"[^>]*name="${name}"[^>]*>`))?.[0] ?? "";
    expect(box("mail-guide-published")).not.toContain("checked");
    expect(box("mail-changes-requested")).toContain('checked=""');

    // Turned on again.
    await client.post("/me/account", {
      intent: "mail",
      "mail-changes-requested": "on",
      "mail-guide-published": "on",
      "mail-guide-unpublished": "on",
      "mail-fitment-report": "on",
    });
    expect(await db.select().from(mailOptOuts).where(eq(mailOptOuts.userId, author.userId))).toEqual([]);
    const audits = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.action, "user.mail-preferences"), eq(auditLog.actorId, author.userId)))
      .orderBy(auditLog.id);
    expect(audits.map((a) => a.data)).toEqual([
      { off: ["guide-published"], on: [] },
      { off: [], on: ["guide-published"] },
    ]);

    // A value that is not a tick is refused by name, and nothing changes.
    const bad = await client.post("/me/account", { intent: "mail", "mail-guide-published": "yes" });
    expect(bad.status).toBe(400);
    expect(await db.select().from(mailOptOuts).where(eq(mailOptOuts.userId, author.userId))).toEqual([]);
  });
});

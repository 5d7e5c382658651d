import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startAppServer } from "../support/app-server";
import { useTestDatabase } from "../support/base-db";
import { TestClient, uniqueEmail } from "../support/http-client";
import { LoopbackClient } from "../support/loopback-client";

let app: Awaited<ReturnType<typeof startAppServer>>;
const DEMO_PASSWORD = "torqueleaf-demo";
/** Each attempt costs a full scrypt check, and these tests make dozens of them. */
const MANY_ATTEMPTS = 120_000;
// An ordinary desktop browser's User-Agent string (the format of RFC 9110 §10.1.5; this value is invented).
const GUESSER_AGENT = "Mozilla/5.0 (X11; Linux x86_64; rv:128.0) Gecko/20100101 Firefox/128.0";

beforeAll(async () => {
  useTestDatabase("auth-throttling");
  app = await startAppServer();
  // The first request compiles the routes; pay for it here rather than inside a test's time limit.
  await new TestClient(app.origin).get("/login");
});
afterAll(async () => app?.stop());

const from = (address: string, agent?: string) => {
  const client = new LoopbackClient(app.origin, address);
  return { client, signIn: (email: string, password: string) => client.post("/login", { email, password }, withAgent(agent)) };
};
const withAgent = (agent?: string) => (agent ? { headers: { "user-agent": agent } } : {});

/** The account page's section on failed attempts, from its heading to the end of the section. */
function failedSection(html: string) {
  const start = html.indexOf("Failed attempts");
  expect(start, "the account page has a section on failed attempts").toBeGreaterThan(-1);
  return html.slice(start, html.indexOf("</section>", start));
}

/** Ten wrong passwords from one address: the most that address may try on one account in the window. */
async function guessTenTimes(signIn: (email: string, password: string) => Promise<Response>, email: string, label: string) {
  for (let i = 0; i < 10; i++) expect((await signIn(email, `${label} wrong guess ${i}`)).status, `${label} #${i}`).toBe(401);
}

describe("password guessing cannot lock the owner out", () => {
  it(
    "slows a guesser per address while the owner's right password still works from another address",
    async () => {
      const owner = "editor@torqueleaf.test";
      for (const address of ["127.0.0.2", "127.0.0.3", "127.0.0.4"]) {
        const guesser = from(address, GUESSER_AGENT);
        await guessTenTimes(guesser.signIn, owner, address);
        // That address has used its allowance on this account: refused for a while, even with the right password.
        const limited = await guesser.signIn(owner, DEMO_PASSWORD);
        expect(limited.status).toBe(429);
        expect(Number(limited.headers.get("retry-after"))).toBeGreaterThan(0);
        expect(await limited.text()).toContain("Too many sign-in attempts");
      }

      // Thirty wrong passwords later, the owner signs in from a fresh address at once.
      const ownerDevice = from("127.0.0.9");
      const signedIn = await ownerDevice.signIn(owner, DEMO_PASSWORD);
      expect(signedIn.status).toBe(302);
      expect((await ownerDevice.client.me())?.email).toBe(owner);

      // The account page shows the owner what happened: when, from where, with what browser.
      const page = await ownerDevice.client.get("/me/account");
      expect(page.status).toBe(200);
      const html = (await page.text()).replace(/<!-- -->/g, "");
      const failed = failedSection(html);
      expect(failed).toContain("30 failed attempts in the last 30 days");
      // Every address that tried, with its count, and the newest attempts one by one.
      expect(failed).toContain("127.0.0.2 (10), 127.0.0.3 (10), 127.0.0.4 (10)");
      expect(failed).toContain("from 127.0.0.4 · Firefox on Linux");
      expect(failed).toContain("Firefox on Linux");
      // The owner's own successful sign-in is not a failed attempt.
      expect(failed).not.toContain("127.0.0.9");
    },
    MANY_ATTEMPTS,
  );

  it(
    "lets a device that signed in before through, even when a guesser shares its address",
    async () => {
      const owner = "author2@torqueleaf.test";
      const device = from("127.0.0.5");
      const first = await device.signIn(owner, DEMO_PASSWORD);
      expect(first.status).toBe(302);
      const deviceHeader = first.headers.getSetCookie().find((c) => c.includes("tl_device="));
      expect(deviceHeader).toBeDefined();
      expect(deviceHeader).toMatch(/HttpOnly/i);
      expect(deviceHeader).toMatch(/SameSite=Lax/i);
      expect(deviceHeader).toMatch(/Max-Age=\d{6,}/i);
      // Nothing readable about the account in it: a signed random id.
      expect(decodeURIComponent(deviceHeader!)).not.toContain("author2");
      expect((await device.client.post("/logout", {})).status).toBe(302);
      expect(device.client.cookies.has("tl_device")).toBe(true);

      // Someone on the same address (a shared network) guesses until that address is limited.
      const guesser = from("127.0.0.5", GUESSER_AGENT);
      await guessTenTimes(guesser.signIn, owner, "shared");
      expect((await guesser.signIn(owner, DEMO_PASSWORD)).status).toBe(429);

      // The owner's device is recognised and signs in.
      expect((await device.signIn(owner, DEMO_PASSWORD)).status).toBe(302);
      // A forged device cookie is worth nothing.
      const forger = from("127.0.0.5");
      forger.client.cookies.set("tl_device", device.client.cookies.get("tl_device")!.replace(/.{4}$/, "AAAA"));
      expect((await forger.signIn(owner, DEMO_PASSWORD)).status, "forged device cookie").toBe(429);
      // The device cookie is for that account only: it does not lift the limit for another one.
      const other = "admin@torqueleaf.test";
      await guessTenTimes(guesser.signIn, other, "other");
      expect((await device.client.post("/logout", {})).status).toBe(302);
      expect((await device.signIn(other, DEMO_PASSWORD)).status, "another account").toBe(429);
    },
    MANY_ATTEMPTS,
  );

  it(
    "a known device is itself limited when it keeps guessing",
    async () => {
      const owner = "author@torqueleaf.test";
      const device = from("127.0.0.8");
      expect((await device.signIn(owner, DEMO_PASSWORD)).status).toBe(302);
      expect((await device.client.post("/logout", {})).status).toBe(302);
      await guessTenTimes(device.signIn, owner, "device");
      expect((await device.signIn(owner, DEMO_PASSWORD)).status).toBe(429);
    },
    MANY_ATTEMPTS,
  );

  it(
    "stops one address spraying many accounts",
    async () => {
      const sprayer = from("127.0.0.6");
      // Five at a time (each one costs a full scrypt check), fifty in all: the address's allowance.
      for (let round = 0; round < 10; round++) {
        const answers = await Promise.all(Array.from({ length: 5 }, () => sprayer.signIn(uniqueEmail("spray"), "some guess")));
        expect(answers.map((a) => a.status)).toEqual([401, 401, 401, 401, 401]);
      }
      const limited = await sprayer.signIn("reader@torqueleaf.test", DEMO_PASSWORD);
      expect(limited.status).toBe(429);
      // Another address is not affected.
      expect((await from("127.0.0.10").signIn("reader@torqueleaf.test", DEMO_PASSWORD)).status).toBe(302);
    },
    MANY_ATTEMPTS,
  );
});

describe("the current-password check on the account page", () => {
  it("answers 429 with Retry-After after a few wrong current passwords, even for the right one", async () => {
    const member = new TestClient(app.origin);
    expect((await member.signIn("reader@torqueleaf.test", DEMO_PASSWORD)).status).toBe(302);
    const change = (currentPassword: string) =>
      member.post(
        "/me/account",
        { intent: "password", currentPassword, newPassword: "a different long phrase" },
        { headers: { "user-agent": GUESSER_AGENT } },
      );
    for (let i = 0; i < 5; i++) {
      const wrong = await change(`not it ${i}`);
      expect(wrong.status, `guess ${i}`).toBe(400);
      expect(await wrong.text()).toContain("That is not your current password.");
    }
    const limited = await change(`not it 5`);
    expect(limited.status).toBe(429);
    expect(Number(limited.headers.get("retry-after"))).toBeGreaterThan(0);
    expect(await limited.text()).toContain("Too many password checks");
    const right = await change(DEMO_PASSWORD);
    expect(right.status).toBe(429);
    // The password did not change.
    expect((await new TestClient(app.origin).signIn("reader@torqueleaf.test", DEMO_PASSWORD)).status).toBe(302);

    const html = (await (await member.get("/me/account")).text()).replace(/<!-- -->/g, "");
    expect(failedSection(html)).toContain("Wrong current password");
  });
});

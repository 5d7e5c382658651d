import type { BrowserContext, Page } from "playwright-core";
import { afterEach, expect, inject, it } from "vitest";
import { launchBrowser, openPage, screenshot } from "./browser";

/**
 * Work-through mode and the guide kept for the garage, in Chromium against the built app with its
 * service worker (build/client/sw.js): keep a guide, lose the signal, reload, tick steps, get the
 * signal back, and the server has the ticks.
 */

const origin = inject("origin");
const SLUG = "kestrel-hood-auxiliary-lamps";
const GUIDE = `${origin}/guides/${SLUG}`;
const TICKS = `${origin}/api/guides/${SLUG}/step-ticks`;

let context: BrowserContext | undefined;
afterEach(async () => {
  await context?.close();
  context = undefined;
});

async function settle(page: Page) {
  await page.waitForLoadState("networkidle");
  await page.waitForFunction(() => document.readyState === "complete");
}

async function signIn(page: Page, email: string) {
  await page.goto(`${origin}/login`);
  await page.getByLabel("E-mail address", { exact: true }).fill(email);
  await page.getByLabel("Password", { exact: true }).fill("torqueleaf-demo");
  await page.getByRole("button", { name: "Sign in", exact: true }).click();
  await page.waitForURL((url) => !url.pathname.startsWith("/login"));
}

/** Until the service worker controls the page (it claims the page that installed it). */
async function controlled(page: Page) {
  await page.waitForFunction(() => navigator.serviceWorker.controller !== null, undefined, { timeout: 20_000 });
}

/** Every photo of the article, scrolled into view in turn, has loaded with pixels. */
async function photosShown(page: Page): Promise<{ count: number; broken: string[] }> {
  const photos = page.locator("article figure.tl-photo img");
  const count = await photos.count();
  for (let i = 0; i < count; i++) {
    const photo = photos.nth(i);
    await photo.scrollIntoViewIfNeeded();
    await photo.evaluate((img: HTMLImageElement) =>
      img.complete && img.naturalWidth > 0
        ? undefined
        : new Promise((resolve) => {
            img.addEventListener("load", resolve, { once: true });
            img.addEventListener("error", resolve, { once: true });
          }),
    );
  }
  const broken = await photos.evaluateAll((all) =>
    (all as HTMLImageElement[]).filter((img) => !(img.complete && img.naturalWidth > 0)).map((img) => img.currentSrc),
  );
  return { count, broken };
}

/** The changes the worker still has to send (Serwist keeps its queue in the "serwist-background-sync" IndexedDB). */
const queuedCount = (page: Page) =>
  page.evaluate(
    () =>
      new Promise<number>((resolve, reject) => {
        const open = indexedDB.open("serwist-background-sync");
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const db = open.result;
          const stores = [...db.objectStoreNames];
          if (!stores.length) return resolve(0);
          const count = db.transaction(stores).objectStore(stores[0]).count();
          count.onsuccess = () => resolve(count.result);
          count.onerror = () => reject(count.error);
        };
      }),
  );

const stepDone = (page: Page, n: number) => page.getByRole("button", { name: `Step ${n} done`, exact: true });

for (const viewport of [
  { width: 360, height: 780 },
  { width: 1366, height: 900 },
]) {
  it(`at ${viewport.width} px a signed-in reader keeps a guide, opens it without signal with its photos, and ticks made offline reach the server`, async () => {
    const browser = await launchBrowser({ viewport });
    context = browser;
    const { page, errors } = await openPage(browser);
    await signIn(page, "reader@torqueleaf.test");
    // Start from no ticks, whatever an earlier run left.
    const before = (await (await context.request.get(TICKS)).json()) as { revision: number; done: number[] };
    for (const position of before.done) {
      await context.request.put(TICKS, {
        headers: { origin },
        data: { revision: before.revision, position, done: false },
      });
    }

    await page.goto(GUIDE);
    await settle(page);
    await controlled(page);
    await expect.poll(() => page.getByRole("progressbar").getAttribute("aria-valuetext")).toMatch(/^0 of \d+ steps done$/);
    await page.getByRole("button", { name: "Keep on this device", exact: true }).click();
    await page.getByText("Kept on this device: it opens here without signal.").waitFor();
    await screenshot(page, `offline-kept-${viewport.width}`);

    await context.setOffline(true);
    await page.reload();
    await settle(page);
    await expect.poll(() => page.locator("h1").textContent()).toContain("auxiliary lamps on a fused relay harness");
    const shown = await photosShown(page);
    expect(shown.count).toBeGreaterThan(0);
    expect(shown.broken).toEqual([]);

    await stepDone(page, 1).click();
    await page.getByText("No signal: the tick is kept on this device").waitFor();
    await stepDone(page, 2).click();
    await page.reload();
    await settle(page);
    await expect.poll(() => stepDone(page, 1).getAttribute("aria-pressed")).toBe("true");
    expect(await stepDone(page, 2).getAttribute("aria-pressed")).toBe("true");
    expect(await stepDone(page, 3).getAttribute("aria-pressed")).toBe("false");
    await screenshot(page, `offline-ticked-${viewport.width}`);

    // The signal returns: the page hears `online` and the worker sends the queued ticks.
    await context.setOffline(false);
    await expect
      .poll(async () => ((await (await browser.request.get(TICKS)).json()) as { done: number[] }).done, { timeout: 20_000 })
      .toEqual([0, 1]);
    // Online again, the page shows what the server has.
    await page.reload();
    await settle(page);
    await expect.poll(() => page.getByRole("progressbar").getAttribute("aria-valuetext")).toMatch(/^2 of \d+ steps done$/);

    // Nothing went wrong on the kept page, offline or online: no console error, no broken request but the offline ones.
    expect(errors.filter((e) => !/Failed to load resource|ERR_INTERNET_DISCONNECTED/.test(e))).toEqual([]);
    errors.length = 0;

    // Signing out drops the reader's kept pages and this browser's copy of their ticks.
    await page.evaluate(async () => {
      const form = document.querySelector<HTMLFormElement>("form[action='/logout']");
      form?.requestSubmit();
    });
    await page.waitForURL(/\/login/);
    await settle(page);
    await expect
      .poll(() => page.evaluate(async () => (await caches.keys()).filter((name) => /^tl-pages-u/.test(name))))
      .toEqual([]);
    expect(await page.evaluate(() => Object.keys(localStorage).filter((key) => key.startsWith("tl-ticks:u")))).toEqual([]);
    // Nor does an anonymous reader get the signed-in page from the worker without signal.
    await context.setOffline(true);
    const offline = await page.goto(GUIDE).catch(() => null);
    expect(offline?.ok() ?? false).toBe(false);
    await context.setOffline(false);
    // A page that was not kept cannot discover the app's routes without signal (React Router logs that); nothing else.
    expect(
      errors.filter((e) => !/Failed to load resource|ERR_INTERNET_DISCONNECTED|Failed to fetch manifest patches/.test(e)),
    ).toEqual([]);
  });
}

it("an anonymous reader's ticks stay in the browser and the guide page stays publicly cacheable", async () => {
  context = await launchBrowser({ viewport: { width: 360, height: 780 } });
  const { page, errors } = await openPage(context);
  const sent: string[] = [];
  page.on("request", (request) => {
    if (request.url().includes("/step-ticks")) sent.push(request.method());
  });
  const response = await page.goto(GUIDE);
  expect(response?.headers()["cache-control"]).toMatch(/public/);
  await settle(page);
  await stepDone(page, 1).click();
  await expect.poll(() => stepDone(page, 1).getAttribute("aria-pressed")).toBe("true");
  await page.reload();
  await settle(page);
  await expect.poll(() => stepDone(page, 1).getAttribute("aria-pressed")).toBe("true");
  await expect.poll(() => page.getByRole("progressbar").getAttribute("aria-valuetext")).toMatch(/^1 of \d+ steps done$/);
  // The page as served is the same for every anonymous reader: no tick is in its markup.
  const html = await (await fetch(GUIDE)).text();
  expect(html).not.toMatch(/aria-pressed="true"/);
  expect(sent).toEqual([]);
  await screenshot(page, "work-through-anonymous-360");
  expect(errors).toEqual([]);
});

it("serves the web app manifest with its type and PNG icons a phone can install", async () => {
  const response = await fetch(`${origin}/manifest.webmanifest`);
  expect(response.status).toBe(200);
  // The media type the Web App Manifest specification registers (W3C Web App Manifest, §"Media type registration").
  expect(response.headers.get("content-type")).toMatch(/^application\/manifest\+json/);
  const manifest = (await response.json()) as {
    name: string;
    start_url: string;
    display: string;
    icons: { src: string; sizes: string; type: string }[];
  };
  expect(manifest).toMatchObject({ start_url: "/", display: "standalone" });
  for (const size of [192, 512]) {
    const icon = manifest.icons.find((i) => i.sizes === `${size}x${size}` && i.type === "image/png");
    expect(icon, `a ${size} px PNG icon`).toBeDefined();
    const png = Buffer.from(await (await fetch(new URL(icon?.src ?? "", origin))).arrayBuffer());
    // PNG signature and the IHDR chunk's width and height (W3C PNG specification, §5.2 and §11.2.2).
    expect(png.subarray(0, 8).toString("hex")).toBe("89504e470d0a1a0a");
    expect([png.readUInt32BE(16), png.readUInt32BE(20)]).toEqual([size, size]);
  }
  const page = await (await fetch(GUIDE)).text();
  expect(page).toContain('rel="manifest" href="/manifest.webmanifest"');
  const worker = await fetch(`${origin}/sw.js`);
  expect(worker.status).toBe(200);
  expect(worker.headers.get("content-type")).toMatch(/javascript/);
});

/** Start from no checklist of this guide, whatever an earlier test or run left (GET /api/checklists, design/api.md). */
async function dropChecklistsOfGuide(browser: BrowserContext) {
  const listed = (await (await browser.request.get(`${origin}/api/checklists`)).json()) as {
    checklists: { id: number; guide: { slug: string } }[];
  };
  for (const old of listed.checklists.filter((c) => c.guide.slug === SLUG)) {
    await browser.request.delete(`${origin}/api/checklists/${old.id}`, { headers: { origin } });
  }
}

it("checklist item ticks made without signal are queued and the server has both once the signal returns", async () => {
  const browser = await launchBrowser({ viewport: { width: 360, height: 780 } });
  context = browser;
  const { page, errors } = await openPage(browser);
  await signIn(page, "reader@torqueleaf.test");
  await dropChecklistsOfGuide(browser);
  // A parts checklist copied from the guide (POST /api/checklists, design/api.md).
  const created = await browser.request.post(`${origin}/api/checklists`, { headers: { origin }, data: { guideSlug: SLUG } });
  expect(created.status()).toBe(201);
  const { id } = (await created.json()) as { id: number };
  const read = async () =>
    (
      (await (await browser.request.get(`${origin}/api/checklists/${id}`)).json()) as {
        items: { id: number; checked: boolean }[];
      }
    ).items;
  const [first, second] = await read();
  expect(first.checked || second.checked).toBe(false);

  await page.goto(GUIDE);
  await settle(page);
  await controlled(page);
  await page.getByRole("button", { name: "Keep on this device", exact: true }).click();
  await page.getByText("Kept on this device: it opens here without signal.").waitFor();
  await browser.setOffline(true);
  // The page's own requests, as a checklist screen makes them: PATCH { checked } per item.
  const answers = await page.evaluate(
    async ({ id, items }) => {
      const statuses: string[] = [];
      for (const itemId of items) {
        const response = await fetch(`/api/checklists/${id}/items/${itemId}`, {
          method: "PATCH",
          headers: { "content-type": "application/json" },
          body: JSON.stringify({ checked: true }),
        });
        statuses.push(`${response.status} ${response.headers.get("X-Torqueleaf-Queued")}`);
      }
      return statuses;
    },
    { id, items: [first.id, second.id] },
  );
  expect(answers).toEqual(["202 1", "202 1"]);
  // The queue lives in the worker's IndexedDB: it survives a reload without signal, and nothing has reached the server yet.
  await page.reload();
  await settle(page);
  expect((await read()).filter((item) => item.checked)).toEqual([]);
  await browser.setOffline(false);
  await expect
    .poll(async () => (await read()).filter((item) => item.checked).map((item) => item.id), { timeout: 20_000 })
    .toEqual([first.id, second.id]);
  await browser.request.delete(`${origin}/api/checklists/${id}`, { headers: { origin } });
  expect(errors.filter((e) => !/Failed to load resource|ERR_INTERNET_DISCONNECTED/.test(e))).toEqual([]);
});

it("a tick queued by one reader is never sent with the session of whoever signs in next", async () => {
  const browser = await launchBrowser({ viewport: { width: 360, height: 780 } });
  context = browser;
  const first = await openPage(browser);
  await signIn(first.page, "reader@torqueleaf.test");
  await first.page.goto(GUIDE);
  await settle(first.page);
  await controlled(first.page);
  const last = (await (await browser.request.get(TICKS)).json()) as { revision: number; done: number[] };
  const position = 7;
  await browser.request.put(TICKS, { headers: { origin }, data: { revision: last.revision, position, done: false } });
  await browser.setOffline(true);
  await stepDone(first.page, position + 1).click();
  await first.page.getByText("No signal: the tick is kept on this device").waitFor();
  // The reader's session ends without signal (cookies cleared, the page closed); another person signs in.
  await first.page.close();
  await browser.clearCookies();
  // Signed in while the browser has no signal (the API client shares its cookie jar but not its
  // network), so when the signal returns the worker's background sync sends the queue under their session.
  const signedIn = await browser.request.post(`${origin}/login`, {
    headers: { origin },
    form: { email: "author@torqueleaf.test", password: "torqueleaf-demo" },
    maxRedirects: 0,
  });
  expect(signedIn.status()).toBe(302);
  await browser.setOffline(false);
  const second = await openPage(browser);
  await second.page.goto(GUIDE);
  await settle(second.page);
  await expect.poll(() => second.page.getByRole("progressbar").getAttribute("aria-valuetext")).toMatch(/ of \d+ steps done$/);
  // The worker has dealt with its queue: nothing is left to send.
  await expect.poll(() => queuedCount(second.page), { timeout: 20_000 }).toBe(0);
  const authorTicks = (await (await browser.request.get(TICKS)).json()) as { done: number[] };
  expect(authorTicks.done).not.toContain(position);
  expect(await stepDone(second.page, position + 1).getAttribute("aria-pressed")).toBe("false");
  expect(second.errors).toEqual([]);
});

/** The demo reader, signed in at 360 px with no checklist of the guide, on the guide page the worker controls. */
async function readerOnGuide() {
  const browser = await launchBrowser({ viewport: { width: 360, height: 780 } });
  context = browser;
  const { page, errors } = await openPage(browser);
  await signIn(page, "reader@torqueleaf.test");
  await dropChecklistsOfGuide(browser);
  await page.goto(GUIDE);
  await settle(page);
  await controlled(page);
  return { browser, page, errors };
}

it("the checklist page is kept with its guide: ticks and notes made on it without signal survive a reload and reach the server in order", async () => {
  const { browser, page, errors } = await readerOnGuide();
  await page.getByRole("button", { name: "Save a parts checklist", exact: true }).click();
  await page.waitForURL(/\/me\/checklists\/\d+$/);
  const id = Number(new URL(page.url()).pathname.split("/").at(-1));
  const read = async () =>
    (
      (await (await browser.request.get(`${origin}/api/checklists/${id}`)).json()) as {
        items: { id: number; name: string; checked: boolean; quantity: number; note: string | null }[];
      }
    ).items;
  const items = await read();
  expect(items.length).toBeGreaterThanOrEqual(3);
  expect(items.filter((item) => item.checked)).toEqual([]);
  const [first, second, third] = items;

  await page.goto(GUIDE);
  await settle(page);
  await page.getByRole("button", { name: "Keep on this device", exact: true }).click();
  await page.getByText("Kept on this device: it opens here without signal.").waitFor();

  await browser.setOffline(true);
  const checklistPage = `${origin}/me/checklists/${id}`;
  const opened = await page.goto(checklistPage);
  expect(opened?.ok()).toBe(true);
  await settle(page);
  await expect.poll(() => page.locator("h1").textContent()).toContain("auxiliary lamps on a fused relay harness");
  const tick = (itemId: number) => page.locator(`li[data-item="${itemId}"]`).getByRole("button", { name: /^Ticked off: / });
  const row = (itemId: number) => page.locator(`li[data-item="${itemId}"]`);
  const saved = /No signal: saved on this device, and sent to your account when the signal returns\./;

  await tick(first.id).click();
  await row(first.id).getByText(saved).waitFor();
  await tick(second.id).click();
  await row(second.id).getByText(saved).waitFor();
  // Ticked and unticked again without signal: the last word is "not ticked".
  await tick(third.id).click();
  await row(third.id).getByText(saved).waitFor();
  await expect.poll(() => tick(third.id).getAttribute("aria-pressed")).toBe("true");
  await tick(third.id).click();
  await expect.poll(() => tick(third.id).getAttribute("aria-pressed")).toBe("false");
  expect(await tick(first.id).getAttribute("aria-pressed")).toBe("true");
  expect(await tick(second.id).getAttribute("aria-pressed")).toBe("true");
  await expect.poll(() => page.getByText(/^\d+ of \d+ ticked$/).textContent()).toMatch(/^2 of /);
  // A quantity and a note changed without signal are queued the same way.
  await row(second.id).getByText("Quantity and note").click();
  await row(second.id).getByLabel("Quantity").fill("3");
  await row(second.id).getByLabel("Note").fill("one spare for the trailer");
  await row(second.id).getByRole("button", { name: "Save", exact: true }).click();
  await expect.poll(() => row(second.id).getByText("3×").count()).toBe(1);
  await expect.poll(() => queuedCount(page)).toBe(5);

  // Reloaded without signal: the kept page, with the queued changes over it.
  await page.reload();
  await settle(page);
  await expect.poll(() => tick(first.id).getAttribute("aria-pressed")).toBe("true");
  expect(await tick(second.id).getAttribute("aria-pressed")).toBe("true");
  expect(await tick(third.id).getAttribute("aria-pressed")).toBe("false");
  await row(first.id).getByText(saved).waitFor();
  expect(await row(second.id).getByText("3×").count()).toBe(1);
  expect(await row(second.id).getByText("one spare for the trailer").count()).toBe(1);
  await screenshot(page, "offline-checklist-ticked-360");
  expect((await read()).filter((item) => item.checked)).toEqual([]);

  // The signal returns: the worker sends the four changes in the order they were made.
  await browser.setOffline(false);
  await expect.poll(() => queuedCount(page), { timeout: 20_000 }).toBe(0);
  await expect
    .poll(async () => (await read()).filter((item) => item.checked).map((item) => item.id), { timeout: 20_000 })
    .toEqual([first.id, second.id]);
  expect((await read()).find((item) => item.id === second.id)).toMatchObject({ quantity: 3, note: "one spare for the trailer" });
  // The page reads its data again and no row says it waits for the signal any more.
  await expect.poll(() => page.getByText(saved).count(), { timeout: 20_000 }).toBe(0);
  expect(await tick(first.id).getAttribute("aria-pressed")).toBe("true");
  expect(await tick(third.id).getAttribute("aria-pressed")).toBe("false");

  await browser.request.delete(`${origin}/api/checklists/${id}`, { headers: { origin } });
  expect(
    errors.filter((e) => !/Failed to load resource|ERR_INTERNET_DISCONNECTED|Failed to fetch manifest patches/.test(e)),
  ).toEqual([]);
});

it("a checklist saved after its guide was kept is kept with it, and a change the server refused when it was sent later is shown with the reason", async () => {
  const { browser, page, errors } = await readerOnGuide();
  await page.getByRole("button", { name: "Keep on this device", exact: true }).click();
  await page.getByText("Kept on this device: it opens here without signal.").waitFor();

  // Saved after the guide was kept: the checklist page keeps itself with the guide.
  await page.getByRole("button", { name: "Save a parts checklist", exact: true }).click();
  await page.waitForURL(/\/me\/checklists\/\d+$/);
  const id = Number(new URL(page.url()).pathname.split("/").at(-1));
  await page.getByText("Kept on this device with its guide: it opens here without signal.").waitFor();
  await screenshot(page, "offline-checklist-kept-after-save");

  await browser.setOffline(true);
  await page.reload();
  await settle(page);
  await expect.poll(() => page.locator("h1").textContent()).toContain("auxiliary lamps on a fused relay harness");
  const firstRow = page.locator("li[data-item]").first();
  await firstRow.getByRole("button", { name: /^Ticked off: / }).click();
  await firstRow.getByText(/No signal: saved on this device/).waitFor();
  await expect.poll(() => queuedCount(page)).toBe(1);
  await page.goto(GUIDE);
  await settle(page);

  // The checklist is deleted elsewhere before the signal returns (the API client has its own network):
  // the queued tick then gets a 404, which cannot succeed later.
  const deleted = await browser.request.delete(`${origin}/api/checklists/${id}`, { headers: { origin } });
  expect(deleted.status()).toBe(204);
  await browser.setOffline(false);
  const alert = page.getByRole("alert").filter({ hasText: "A change you made without signal was not saved." });
  await alert.waitFor({ timeout: 20_000 });
  // The server's own reason (design/api.md's error message), and the way to the checklist it was for.
  expect(await alert.textContent()).toMatch(/checklist/i);
  expect(await alert.getByRole("link", { name: "Open the checklist" }).getAttribute("href")).toBe(`/me/checklists/${id}`);
  await screenshot(page, "offline-refused-change");
  expect(await queuedCount(page)).toBe(0);
  await alert.getByRole("button", { name: "Dismiss", exact: true }).click();
  await expect.poll(() => alert.count()).toBe(0);
  // Offline, the checklist page's first load asks React Router's route discovery about its links
  // (a different question from the one its client-side visit asked online), which cannot be answered
  // without signal: a network failure like the others, which the page survives.
  const offlineNetwork =
    /Failed to load resource|ERR_INTERNET_DISCONNECTED|^Failed to fetch manifest patches TypeError: Failed to fetch/;
  expect(errors.filter((e) => !offlineNetwork.test(e))).toEqual([]);
});

import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { chromium, type Page } from "playwright-core";
import { expect, inject, it } from "vitest";
import { openPage, screenshot, sharedBrowser } from "./browser";

const origin = inject("origin");
const browser = sharedBrowser();
const SLUG = "kestrel-hood-auxiliary-lamps";
const GUIDE = `${origin}/guides/${SLUG}`;

/** A browser whose clock reads in `timezoneId`, otherwise as launchBrowser in ./browser.ts. */
function browserIn(timezoneId: string) {
  return chromium.launchPersistentContext(mkdtempSync(join(tmpdir(), "torqueleaf-chromium-")), {
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    headless: true,
    viewport: { width: 1366, height: 900 },
    timezoneId,
    args: ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking"],
  });
}

/** Until React has hydrated the page: the print view's button only works then, so wait for the whole app to settle. */
async function settle(page: Page) {
  await page.waitForLoadState("networkidle");
  await page.waitForFunction(() => document.readyState === "complete");
}

// Honolulu is UTC−10 and Tokyo UTC+9; Kiritimati (UTC+14) adds the hours of the day in which a date
// written in the server's zone would still agree with both (IANA time zone database).
for (const timezoneId of ["Pacific/Honolulu", "Asia/Tokyo", "Pacific/Kiritimati"]) {
  it(`hydrates the guide page without an error for a reader in ${timezoneId}`, async () => {
    const context = await browserIn(timezoneId);
    try {
      const { page, errors } = await openPage(context);
      await page.goto(GUIDE);
      await settle(page);
      expect(await page.evaluate(() => Intl.DateTimeFormat().resolvedOptions().timeZone)).toBe(timezoneId);
      // The review date reads as the server wrote it (UTC), and a hydration mismatch (React #418) would be a console error.
      const reviewed = page.locator("header time").first();
      const shown = (await reviewed.textContent()) ?? "";
      expect(shown).toMatch(/^\d{1,2} [A-Z][a-z]{2} \d{4}$/);
      // The calendar day in UTC of the instant in its datetime attribute (ISO 8601), whatever the reader's zone.
      const day = new Date((await reviewed.getAttribute("datetime")) ?? "");
      const months = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];
      expect(shown).toBe(`${day.getUTCDate()} ${months[day.getUTCMonth()]} ${day.getUTCFullYear()}`);
      // A client-side navigation renders the page in the browser alone: the same text again.
      await page.getByRole("link", { name: "Print view" }).click();
      await page.waitForURL(/print=1/);
      await settle(page);
      expect(await page.getByTestId("print-masthead").textContent()).toContain(`reviewed ${shown}`);
      expect(errors).toEqual([]);
    } finally {
      await context.close();
    }
  });
}

it("on a desktop the sidebar fits in the window and scrolls within itself", async () => {
  const { page, errors } = await openPage(browser());
  await page.setViewportSize({ width: 1366, height: 900 });
  await page.goto(GUIDE);
  await settle(page);
  // Halfway down the article the parts list is still on screen.
  await page.locator("#step-5").scrollIntoViewIfNeeded();
  const kit = page.getByRole("complementary", { name: "Fitment, parts and tools" });
  const box = await kit.boundingBox();
  expect(box).not.toBeNull();
  expect(box?.height ?? Number.POSITIVE_INFINITY).toBeLessThanOrEqual(900);
  expect(box?.y ?? -1).toBeGreaterThanOrEqual(0);
  await page.locator("#tools").scrollIntoViewIfNeeded();
  expect(await page.locator("#tools").isVisible()).toBe(true);
  expect(errors).toEqual([]);
});

it("at 360 px: no sideways scroll, parts and tools reachable from the top, Step N on one line, 44 px controls", async () => {
  const { page, errors } = await openPage(browser());
  await page.setViewportSize({ width: 360, height: 780 });
  await page.goto(GUIDE);
  await settle(page);
  const widths = await page.evaluate(() => ({
    scroll: document.documentElement.scrollWidth,
    client: document.documentElement.clientWidth,
  }));
  expect(widths.scroll).toBeLessThanOrEqual(widths.client);

  // The parts list comes before the first step, and a link near the top jumps to it.
  const jump = page.getByRole("navigation", { name: "On this page" }).getByRole("link", { name: "Parts and tools" });
  const jumpBox = await jump.boundingBox();
  const firstStep = await page.locator("#step-1").boundingBox();
  const parts = await page.locator("#parts").boundingBox();
  expect(jumpBox && firstStep && parts).toBeTruthy();
  expect(jumpBox?.y ?? Number.POSITIVE_INFINITY).toBeLessThan(firstStep?.y ?? 0);
  expect(parts?.y ?? Number.POSITIVE_INFINITY).toBeLessThan(firstStep?.y ?? 0);
  await jump.click();
  await page.waitForURL(/#parts$/);
  await expect
    .poll(() => page.evaluate(() => document.getElementById("parts")?.getBoundingClientRect().top ?? -1))
    .toBeLessThan(80);
  expect(await page.locator("#tools").count()).toBe(1);

  const layout = await page.evaluate(() => {
    const article = document.querySelector("article.tl-guide");
    if (!article) return null;
    // WCAG 2.2 §2.5.5 (enhanced target size, 44 × 44 CSS px) for the page's own controls; links inside
    // a sentence of a step's text are inline targets, which the criterion exempts.
    const small = [...article.querySelectorAll("a, button, summary")]
      .filter((el) => !el.closest(".prose"))
      .map((el) => ({ text: (el.textContent ?? "").trim().slice(0, 40), height: el.getBoundingClientRect().height }))
      .filter((c) => c.height > 0 && c.height < 44);
    // "Step N" is one line: one box, no taller than its line.
    const stepLabels = [...article.querySelectorAll("li[id^='step-'] > h3 > span:first-child")].map((el) => ({
      text: el.textContent,
      lines: el.getClientRects().length,
      height: el.getBoundingClientRect().height,
      lineHeight: Number.parseFloat(getComputedStyle(el).lineHeight),
    }));
    // The page's own text joins each number to its unit with a no-break space.
    const own = [
      ...article.querySelectorAll("header, .tl-guide-kit, li[id^='step-'] > h3, li[id^='step-'] > .prose, [role='note'] p"),
    ];
    const broken = own.map((el) => el.textContent ?? "").flatMap((t) => t.match(/\d (?:A|V|W|mm|AWG|N·m|min|h|°C)\b/g) ?? []);
    return { small, stepLabels, broken };
  });
  expect(layout).not.toBeNull();
  expect(layout?.small).toEqual([]);
  expect(layout?.stepLabels.length).toBeGreaterThan(3);
  for (const label of layout?.stepLabels ?? []) {
    expect(label.lines, `${label.text} on one line`).toBe(1);
    expect(label.height).toBeLessThanOrEqual(label.lineHeight + 1);
  }
  expect(layout?.broken).toEqual([]);
  // A wiring diagram (640 units wide, app/engine/diagram.ts) keeps a readable size, its 11-unit labels
  // at 85 % or more (about 9 px and up), and scrolls inside its frame, which a keyboard can focus.
  const frames = await page.locator("figure.tl-figure > .tl-figure").evaluateAll((all) =>
    all.map((frame) => ({
      scale: (frame.querySelector("svg")?.getBoundingClientRect().width ?? 0) / 640,
      scrolls: frame.scrollWidth > frame.clientWidth,
      tabIndex: (frame as HTMLElement).tabIndex,
    })),
  );
  expect(frames.length).toBeGreaterThan(0);
  for (const frame of frames) {
    expect(frame.scale).toBeGreaterThanOrEqual(0.85);
    expect(frame.scrolls).toBe(true);
    expect(frame.tabIndex).toBe(0);
  }
  await screenshot(page, "guide-phone");
  expect(errors).toEqual([]);
});

it("prints the address, revision and review date, opens the working, and keeps the WARNING label readable", async () => {
  const { page, errors } = await openPage(browser());
  await page.setViewportSize({ width: 1366, height: 900 });
  await page.goto(GUIDE);
  await settle(page);
  const details = page.locator("article details");
  expect(await details.count()).toBeGreaterThan(0);
  expect(await details.evaluateAll((all) => all.every((d) => !(d as HTMLDetailsElement).open))).toBe(true);

  await page.emulateMedia({ media: "print" });
  const masthead = page.getByTestId("print-masthead");
  await expect.poll(() => masthead.isVisible()).toBe(true);
  const text = (await masthead.textContent()) ?? "";
  expect(text).toContain("Torqueleaf");
  expect(text).toContain(GUIDE);
  expect(text).toMatch(/Revision \d+, reviewed \d{1,2} [A-Z][a-z]{2} \d{4}/);
  // The site's own header and the screen-only controls stay off the paper.
  expect(await page.getByRole("link", { name: "Print view" }).isVisible()).toBe(false);

  await expect.poll(() => details.evaluateAll((all) => all.every((d) => (d as HTMLDetailsElement).open))).toBe(true);
  expect(await page.getByText("How these numbers were worked out").first().isVisible()).toBe(true);
  expect(await details.first().locator("li").first().isVisible()).toBe(true);

  const label = await page
    .locator("[data-signal-word='WARNING']")
    .first()
    .evaluate((el) => {
      const s = getComputedStyle(el);
      return { color: s.color, background: s.backgroundColor, border: s.borderBottomWidth, borderColor: s.borderBottomColor };
    });
  const white = "rgb(255, 255, 255)";
  expect(label.color).not.toBe(white);
  // Printed without background graphics the label needs no background: dark text over a coloured rule.
  expect(label.background).toBe("rgba(0, 0, 0, 0)");
  expect(Number.parseFloat(label.border)).toBeGreaterThanOrEqual(2);
  expect(label.borderColor).not.toBe(white);

  // Back on screen, the working that printing opened closes again.
  await page.emulateMedia({ media: "screen" });
  await expect.poll(() => details.evaluateAll((all) => all.every((d) => !(d as HTMLDetailsElement).open))).toBe(true);
  expect(errors).toEqual([]);
});

it("the print view has a print button and a way back, and prints with its working open", async () => {
  const { page, errors } = await openPage(browser());
  await page.goto(`${GUIDE}?print=1`);
  await settle(page);
  expect(await page.getByRole("button", { name: "Print this guide" }).isVisible()).toBe(true);
  expect(await page.getByRole("link", { name: /Back to the guide/ }).isVisible()).toBe(true);
  expect(await page.getByTestId("print-masthead").textContent()).toContain(GUIDE);
  await expect
    .poll(() => page.locator("article details").evaluateAll((all) => all.every((d) => (d as HTMLDetailsElement).open)))
    .toBe(true);

  await page.emulateMedia({ media: "print" });
  expect(await page.getByRole("button", { name: "Print this guide" }).isVisible()).toBe(false);
  expect(await page.getByTestId("print-masthead").isVisible()).toBe(true);
  await page.emulateMedia({ media: "screen" });

  await page.getByRole("link", { name: /Back to the guide/ }).click();
  await page.waitForURL(GUIDE);
  expect(errors).toEqual([]);
});

import { mkdirSync, mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { type BrowserContext, chromium, type Page } from "playwright-core";
import { afterAll, afterEach, beforeAll, expect } from "vitest";

export const SCREENSHOT_DIR = join(process.cwd(), "test-results", "screenshots");

/**
 * Debian's Chromium, headless, in a fresh user-data-dir, with the flags that keep it off the
 * network and out of first-run prompts.
 */
export async function launchBrowser(
  options: { viewport?: { width: number; height: number }; javaScriptEnabled?: boolean; timezoneId?: string } = {},
): Promise<BrowserContext> {
  return chromium.launchPersistentContext(mkdtempSync(join(tmpdir(), "torqueleaf-chromium-")), {
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    headless: true,
    viewport: options.viewport ?? { width: 1280, height: 900 },
    javaScriptEnabled: options.javaScriptEnabled ?? true,
    timezoneId: options.timezoneId,
    args: [
      "--headless",
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
  });
}

/** Content-Security-Policy violations on every page opened by the running test; never cleared by a test. */
const violations: string[] = [];

/**
 * A page that records console errors and failed page loads, so a test can fail on them. A
 * Content-Security-Policy violation is reported by the browser only to the page itself (as a
 * `securitypolicyviolation` event), so an init script passes each one back; it lands in `errors`
 * and in a list that `sharedBrowser` checks after every test.
 */
export async function openPage(context: BrowserContext): Promise<{ page: Page; errors: string[] }> {
  const page = await context.newPage();
  const errors: string[] = [];
  page.on("console", (message) => {
    if (message.type() === "error") errors.push(message.text());
  });
  page.on("pageerror", (error) => errors.push(error.message));
  await page.exposeFunction("__reportCspViolation", (text: string) => {
    const line = `CSP violation: ${text}`;
    violations.push(line);
    errors.push(line);
  });
  await page.addInitScript(() => {
    document.addEventListener("securitypolicyviolation", (event) => {
      const report = (window as unknown as { __reportCspViolation: (text: string) => void }).__reportCspViolation;
      report(
        `${event.effectiveDirective} refused ${event.blockedURI || "inline code"} on ${event.documentURI} ` +
          `(${event.sourceFile || "the document"}:${event.lineNumber}) ${event.sample}`,
      );
    });
  });
  return { page, errors };
}

export async function screenshot(page: Page, name: string) {
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  await page.screenshot({ path: join(SCREENSHOT_DIR, `${name}.png`), fullPage: true });
}

/**
 * One browser for the calling test file, opened before its tests and closed after them. After each
 * test, no page opened with `openPage` may have broken the Content-Security-Policy.
 */
export function sharedBrowser(): () => BrowserContext {
  let context: BrowserContext | undefined;
  beforeAll(async () => {
    context = await launchBrowser();
  });
  afterEach(() => {
    const seen = violations.splice(0);
    expect(seen, "Content-Security-Policy violations").toEqual([]);
  });
  afterAll(async () => {
    await context?.close();
  });
  return () => {
    if (!context) throw new Error("the browser is not open yet");
    return context;
  };
}

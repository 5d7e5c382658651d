import { mkdirSync, mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { type BrowserContext, chromium, type Page } from "playwright-core";
import { afterAll, beforeAll } from "vitest";

export const SCREENSHOT_DIR = join(process.cwd(), "test-results", "screenshots");

/**
 * Debian's Chromium, headless, in a fresh user-data-dir, with the flags that keep it off the
 * network and out of first-run prompts.
 */
export async function launchBrowser(
  options: { viewport?: { width: number; height: number }; javaScriptEnabled?: boolean } = {},
): Promise<BrowserContext> {
  return chromium.launchPersistentContext(mkdtempSync(join(tmpdir(), "torqueleaf-chromium-")), {
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    headless: true,
    viewport: options.viewport ?? { width: 1280, height: 900 },
    javaScriptEnabled: options.javaScriptEnabled ?? true,
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

/** A page that records console errors and failed page loads, so a test can fail on them. */
export async function openPage(context: BrowserContext): Promise<{ page: Page; errors: string[] }> {
  const page = await context.newPage();
  const errors: string[] = [];
  page.on("console", (message) => {
    if (message.type() === "error") errors.push(message.text());
  });
  page.on("pageerror", (error) => errors.push(error.message));
  return { page, errors };
}

export async function screenshot(page: Page, name: string) {
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  await page.screenshot({ path: join(SCREENSHOT_DIR, `${name}.png`), fullPage: true });
}

/** One browser for the calling test file, opened before its tests and closed after them. */
export function sharedBrowser(): () => BrowserContext {
  let context: BrowserContext | undefined;
  beforeAll(async () => {
    context = await launchBrowser();
  });
  afterAll(async () => {
    await context?.close();
  });
  return () => {
    if (!context) throw new Error("the browser is not open yet");
    return context;
  };
}

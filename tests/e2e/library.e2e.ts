import { expect, inject, it } from "vitest";
import { openPage, screenshot, sharedBrowser } from "./browser";

const origin = inject("origin");
const browser = sharedBrowser();

it("a reader filters the Library by powertrain, opens a guide and sees cautions and torque in two units", async () => {
  const { page, errors } = await openPage(browser());
  await page.goto(`${origin}/`);
  await page.waitForLoadState("networkidle");
  expect(await page.getByRole("heading", { level: 1 }).textContent()).toMatch(/install guides/i);
  const allCount = await page.locator("article h2").count();
  expect(allCount).toBeGreaterThanOrEqual(5);
  await screenshot(page, "library");

  await page.getByRole("radio", { name: /^Hybrid/ }).check();
  await page.waitForURL(/powertrain=hybrid/);
  await page.waitForFunction((n) => document.querySelectorAll("article h2").length < n, allCount);
  const titles = await page.locator("article h2").allTextContents();
  expect(titles.some((t) => /12 V outlet/i.test(t))).toBe(true);
  expect(titles.some((t) => /Kestrel/.test(t))).toBe(false);
  await screenshot(page, "library-hybrid");

  await page.goto(`${origin}/guides/kestrel-hood-auxiliary-lamps`);
  const caution = page
    .getByRole("note")
    .filter({ hasText: /WARNING|CAUTION|DANGER/ })
    .first();
  expect(await caution.isVisible()).toBe(true);
  const torque = (await page.getByTestId("torque-values").first().textContent()) ?? "";
  // Two units side by side, N·m and lbf·ft (NIST SP 811 conversion on the page).
  expect(torque).toMatch(/N·m/);
  expect(torque).toMatch(/lbf·ft/);
  expect(await page.locator("figure svg title").first().textContent()).toMatch(/wiring/i);
  await screenshot(page, "guide-lamps");

  // The print view adds its own inline style sheet in the browser; the policy allows it by hash.
  await page.getByRole("link", { name: "Print view" }).click();
  await page.waitForURL(/print=1/);
  await expect.poll(async () => page.getByRole("navigation", { name: "Breadcrumb" }).isVisible()).toBe(false);

  expect(errors).toEqual([]);
});

it("labels an estimated torque as an estimate and shows all three units", async () => {
  const { page, errors } = await openPage(browser());
  await page.goto(`${origin}/guides/kestrel-k2-front-skid-plate`);
  const all = await page.getByTestId("torque-values").allTextContents();
  // ISO 898-1 proof load for M8 class 8.8 (21 200 N), K = 0.20 dry: T = 0.20 × 0.75 × 21 200 N × 8 mm ≈ 25.4 N·m.
  const estimated = all.find((t) => t.includes("25.4 N·m")) ?? "";
  expect(estimated).toMatch(/N·m.*lbf·ft.*lbf·in/);
  expect(await page.getByText("Estimate", { exact: true }).count()).toBeGreaterThan(0);
  expect(await page.getByText(/maker's value governs/).count()).toBeGreaterThan(0);
  expect(errors).toEqual([]);
});

it("answers an unknown guide with a helpful 404 page", async () => {
  const { page, errors } = await openPage(browser());
  const response = await page.goto(`${origin}/guides/no-such-guide`);
  expect(response?.status()).toBe(404);
  expect(await page.getByRole("link", { name: "Browse the library" }).isVisible()).toBe(true);
  // Chromium logs the 404 itself as a failed load; that one was intended, nothing else may fail.
  expect(errors).toEqual([expect.stringMatching(/status of 404/)]);
});

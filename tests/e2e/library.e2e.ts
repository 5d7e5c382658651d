import { AxeBuilder } from "@axe-core/playwright";
import { describe, expect, inject, it } from "vitest";
import { launchBrowser, openPage, screenshot, sharedBrowser } from "./browser";

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
  // Values are joined to their units by a no-break space; compare with plain spaces.
  const estimated = all.map((t) => t.replace(/\s+/g, " ")).find((t) => t.includes("25.4 N·m")) ?? "";
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

/** The value of every filter control, by name: text, menu and the checked radio of each group. */
async function filterValues(page: import("playwright-core").Page) {
  return page.evaluate(() => {
    const form = document.querySelector<HTMLFormElement>("form[role=search]");
    if (!form) throw new Error("no filter form");
    const values: Record<string, string> = {};
    for (const el of Array.from(form.elements) as HTMLInputElement[]) {
      if (!el.name) continue;
      if (el.type === "radio") {
        if (el.checked) values[el.name] = el.value;
      } else values[el.name] = el.value;
    }
    return values;
  });
}

it("Clear puts every filter back, and the next change applies only itself", async () => {
  const { page, errors } = await openPage(browser());
  await page.goto(`${origin}/`);
  await page.waitForLoadState("networkidle");
  const blank = await filterValues(page);
  expect(blank).toEqual({ q: "", vehicle: "", year: "", powertrain: "", drivetrain: "", category: "", difficulty: "", sort: "" });

  await page.getByRole("radio", { name: /^Gasoline/ }).check();
  await page.waitForURL(/powertrain=gas/);
  await page.getByRole("radio", { name: /^4WD/ }).check();
  await page.waitForURL(/drivetrain=4WD/);
  await page.getByLabel("Difficulty").selectOption("3");
  await page.waitForURL(/difficulty=3/);
  await page.getByLabel("Model year").fill("2020");
  await page.waitForURL(/year=2020/);
  await page.getByRole("searchbox", { name: "Search" }).fill("bracket");
  await page.waitForURL(/q=bracket/);
  // Only the filters that are set are in the address.
  expect(new URL(page.url()).search).toBe("?q=bracket&year=2020&powertrain=gas&drivetrain=4WD&difficulty=3");

  await page.getByRole("link", { name: "Clear" }).click();
  await page.waitForURL(`${origin}/`);
  await expect.poll(() => filterValues(page)).toEqual(blank);

  await page.getByRole("radio", { name: /^AWD/ }).check();
  await page.waitForURL(/drivetrain=AWD/);
  expect(new URL(page.url()).search).toBe("?drivetrain=AWD");
  expect(errors).toEqual([]);
});

it("typing a search adds one history entry, and Back and Forward keep the box in step", async () => {
  const { page, errors } = await openPage(browser());
  await page.goto(`${origin}/`);
  await page.waitForLoadState("networkidle");
  const before = await page.evaluate(() => history.length);
  const box = page.getByRole("searchbox", { name: "Search" });
  await box.click();
  // Slow enough that some keystrokes are a pause apart and the address changes while typing.
  for (const key of "relay") {
    await page.keyboard.type(key);
    await page.waitForTimeout(key === "l" ? 600 : 80);
  }
  await page.waitForURL(/q=relay/);
  await page.waitForLoadState("networkidle");
  expect(await page.evaluate(() => history.length)).toBe(before + 1);
  expect(await page.locator("article h2").allTextContents()).toEqual(
    expect.arrayContaining([expect.stringMatching(/auxiliary lamps/i)]),
  );

  await page.goBack();
  await page.waitForURL(`${origin}/`);
  await expect.poll(() => box.inputValue()).toBe("");
  await page.goForward();
  await page.waitForURL(/q=relay/);
  await expect.poll(() => box.inputValue()).toBe("relay");
  expect(errors).toEqual([]);
});

it("on a phone the filters fold away and the first guide is on the first screen", async () => {
  const { page, errors } = await openPage(browser());
  await page.setViewportSize({ width: 360, height: 780 });
  await page.goto(`${origin}/`);
  await page.waitForLoadState("networkidle");
  const summary = page.locator("summary", { hasText: "Filters and search" });
  expect(await summary.isVisible()).toBe(true);
  expect(await page.getByRole("searchbox", { name: "Search" }).isVisible()).toBe(false);
  const first = await page.locator("article h2").first().boundingBox();
  expect(first).not.toBeNull();
  expect((first?.y ?? 0) + (first?.height ?? 0)).toBeLessThanOrEqual(780);
  // Nothing scrolls sideways.
  expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);

  await summary.click();
  expect(await page.getByRole("searchbox", { name: "Search" }).isVisible()).toBe(true);
  await page.getByRole("radio", { name: /^Hybrid/ }).check();
  await page.waitForURL(/powertrain=hybrid/);
  // The count of filters in use shows on the summary, and the panel stays open while in use.
  await expect.poll(() => summary.textContent()).toMatch(/1 active/);
  expect(await page.getByRole("searchbox", { name: "Search" }).isVisible()).toBe(true);

  await page.setViewportSize({ width: 1366, height: 900 });
  await page.goto(`${origin}/`);
  await page.waitForLoadState("networkidle");
  // On a wide screen the filters are always there, without a summary to open.
  expect(await page.getByRole("searchbox", { name: "Search" }).isVisible()).toBe(true);
  expect(await summary.isVisible()).toBe(false);
  expect(errors).toEqual([]);
});

/** Library states of issue 13: a search with marked words, an empty list with its suggestions, a variant's badges and the "fits" filter. */
const LIBRARY_STATES = {
  search: "/?q=relay",
  empty: "/?q=relay&difficulty=5",
  variant: "/?vehicle=norvik.fjell.f3&for=4",
  fits: "/?vehicle=norvik.fjell.f3&for=4&fits=4&sort=shortest",
};

describe("the Library's sorts, search marks, suggestions and variant", () => {
  for (const [name, path] of Object.entries(LIBRARY_STATES)) {
    it(`${name}: no serious or critical axe violation, and at 360 px no sideways scroll and 44 px targets`, async () => {
      const { page, errors } = await openPage(browser());
      await page.setViewportSize({ width: 360, height: 780 });
      await page.goto(`${origin}${path}`);
      await page.waitForLoadState("networkidle");
      await page.locator("summary", { hasText: "Filters and search" }).click();
      // axe-core's WCAG 2.x A and AA rules (Deque, axe-core rule descriptions).
      const result = await new AxeBuilder({ page }).withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa", "wcag22aa"]).analyze();
      const grave = result.violations
        .filter((v) => v.impact === "serious" || v.impact === "critical")
        .map((v) => `${v.id} (${v.impact}): ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`);
      expect(grave).toEqual([]);
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
      // WCAG 2.2 SC 2.5.8 asks 24 px; the issue asks 44 px (WCAG 2.5.5 AAA): a control inside a
      // label counts by its label, the skip link only shows when focused.
      const small = await page.evaluate(() =>
        [...document.querySelectorAll("main a, main button, main select, main input, main summary")]
          .filter((el) => !el.closest("label"))
          .map((el) => ({ el, box: el.getBoundingClientRect() }))
          .filter(({ box }) => box.width > 0 && box.height > 0 && box.height < 44)
          .map(({ el, box }) => `${el.tagName} "${(el.textContent ?? "").trim().slice(0, 30)}" ${Math.round(box.height)} px`),
      );
      expect(small).toEqual([]);
      await screenshot(page, `library-360-${name}`);
      expect(errors).toEqual([]);
    });
  }

  it("a reader picks a variant, keeps only guides that fit it, orders them and sees the badges", async () => {
    const { page, errors } = await openPage(browser());
    await page.goto(`${origin}/`);
    await page.waitForLoadState("networkidle");
    await page.getByLabel("Vehicle").selectOption("norvik.fjell.f3");
    await page.waitForURL(/vehicle=norvik.fjell.f3/);
    await page.getByLabel("Your variant").selectOption({ label: "2.0 hybrid AWD" });
    await page.waitForURL(/for=4/);
    // Every card says how the guide fits the variant (once the list for it has come).
    const before = await page.locator("article h2").count();
    expect(before).toBeGreaterThan(0);
    await expect.poll(() => page.getByText(/for your Norvik Fjell F3 2\.0 hybrid AWD/).count()).toBe(before);
    await page.getByRole("checkbox", { name: /Fits my vehicle only/ }).check();
    await page.waitForURL(/fits=4/);
    await expect.poll(() => page.getByText(/does not fit for your|Not listed for your/i).count()).toBe(0);
    await page.getByLabel("Order").selectOption({ label: "Shortest time first" });
    await page.waitForURL(/sort=shortest/);
    // The address holds the whole state: opened afresh it shows the same list.
    const titles = await page.locator("article h2").allTextContents();
    await page.goto(page.url());
    expect(await page.locator("article h2").allTextContents()).toEqual(titles);
    await screenshot(page, "library-fits-shortest");
    expect(errors).toEqual([]);
  });

  it("works as plain links and a plain form without JavaScript", async () => {
    const context = await launchBrowser({ javaScriptEnabled: false });
    try {
      const page = await context.newPage();
      await page.goto(`${origin}/?q=relay&difficulty=5`);
      await page.getByRole("link", { name: /Without the difficulty filter: \d+ guides?/ }).click();
      await page.waitForURL((url) => !url.search.includes("difficulty"));
      expect(await page.locator("article mark").count()).toBeGreaterThan(0);
      // On a wide screen the filter panel shows without being opened.
      await page.getByRole("radio", { name: /^Gasoline/ }).check();
      await page.getByLabel("Order").selectOption({ label: "Shortest time first" });
      await page.getByRole("button", { name: "Sort" }).click();
      await page.waitForURL(/sort=shortest/);
      expect(new URL(page.url()).searchParams.get("powertrain")).toBe("gas");
    } finally {
      await context.close();
    }
  });
});

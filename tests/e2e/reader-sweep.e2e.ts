import { AxeBuilder } from "@axe-core/playwright";
import type { BrowserContext, Page } from "playwright-core";
import { afterAll, describe, expect, inject, it } from "vitest";
import { launchBrowser, openPage, screenshot, sharedBrowser } from "./browser";
import { ACCOUNTS } from "./matrix-support";

/**
 * A sweep over the pages a reader meets, checked the same way on every page: accessibility by axe,
 * no console error in time zones far from the server's, and a phone-width layout that neither scrolls
 * sideways nor offers a control smaller than a fingertip.
 */
const origin = inject("origin");
const browser = sharedBrowser();

// A plan with a fuse and wire chosen, as a shared planner address carries it.
const PLAN = "/tools/circuit?load=120&oneWayLengthM=4&fuse=15&wire=awg%3A14";
const READER_PAGES = [
  "/",
  "/?powertrain=hybrid",
  "/guides/kestrel-hood-auxiliary-lamps",
  "/guides/kestrel-k2-front-skid-plate",
  "/guides/fjell-hybrid-cargo-12v-outlet",
  "/guides/kestrel-hood-auxiliary-lamps?print=1",
  "/tools/circuit",
  PLAN,
  "/login",
  "/signup",
  "/reset",
  "/contributor-terms",
  "/api/docs",
];

/** Pages behind sign-in, with the demo account that may open them (api.md, demo accounts). */
const SIGNED_IN_PAGES: { path: string; account: keyof typeof ACCOUNTS }[] = [
  { path: "/me/account", account: "reader" },
  { path: "/me/checklists", account: "reader" },
  { path: "/me/vehicles", account: "reader" },
  { path: "/admin/users", account: "admin" },
  { path: "/admin/audit", account: "admin" },
  { path: "/admin/catalogue", account: "admin" },
];

async function settle(page: Page, path: string) {
  const response = await page.goto(`${origin}${path}`);
  expect(response?.status(), path).toBeLessThan(400);
  await page.waitForLoadState("networkidle");
}

/** Signs the browser in as a demo account through the sign-in form (api.md, demo accounts). */
async function signInAs(page: Page, account: keyof typeof ACCOUNTS) {
  await page.context().clearCookies();
  await page.goto(`${origin}/login`);
  await page.getByLabel("E-mail address", { exact: true }).fill(ACCOUNTS[account]);
  await page.getByLabel("Password", { exact: true }).fill("torqueleaf-demo");
  await page.getByRole("button", { name: "Sign in", exact: true }).click();
  await page.waitForURL((url) => url.pathname !== "/login");
}

describe("accessibility (axe-core, WCAG 2.2 A and AA rules)", () => {
  // The list: the Library, a guide page, the planner, sign-in and the print view.
  const pages = ["/", "/guides/kestrel-hood-auxiliary-lamps", "/guides/fjell-hybrid-cargo-12v-outlet", PLAN, "/login"];
  for (const path of pages) {
    it(`${path} has no serious or critical violation`, async () => {
      const { page, errors } = await openPage(browser());
      await settle(page, path);
      const result = await new AxeBuilder({ page }).withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa", "wcag22aa"]).analyze();
      const grave = result.violations
        .filter((v) => v.impact === "serious" || v.impact === "critical")
        .map((v) => `${v.id} (${v.impact}): ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`);
      expect(grave).toEqual([]);
      expect(errors).toEqual([]);
      await page.close();
    });
  }

  it("the print view, printed, has no serious or critical violation", async () => {
    const { page, errors } = await openPage(browser());
    await page.emulateMedia({ media: "print" });
    await settle(page, "/guides/kestrel-hood-auxiliary-lamps?print=1");
    const result = await new AxeBuilder({ page }).withTags(["wcag2a", "wcag2aa", "wcag21aa", "wcag22aa"]).analyze();
    const grave = result.violations.filter((v) => v.impact === "serious" || v.impact === "critical").map((v) => v.id);
    expect(grave).toEqual([]);
    expect(errors).toEqual([]);
    await page.close();
  });
});

describe("a parts checklist", () => {
  it("saved from a guide page, ticked and printed: no serious or critical violation, nothing under 44 px at 360 px", async () => {
    const phone = await launchBrowser({ viewport: { width: 360, height: 780 } });
    try {
      const { page, errors } = await openPage(phone);
      await signInAs(page, "reader");
      await settle(page, "/guides/kestrel-hood-auxiliary-lamps");
      await page.getByRole("button", { name: "Save a parts checklist" }).click();
      await page.waitForURL(/\/me\/checklists\/\d+$/);
      await page.waitForLoadState("networkidle");
      const path = new URL(page.url()).pathname;
      await page
        .getByRole("button", { name: /^Ticked off:/ })
        .first()
        .click();
      await page.waitForLoadState("networkidle");
      for (const [url, media] of [
        [path, "screen"],
        [`${path}?print=1`, "print"],
      ] as const) {
        await page.emulateMedia({ media });
        await settle(page, url);
        const result = await new AxeBuilder({ page })
          .withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa", "wcag22aa"])
          .analyze();
        const grave = result.violations
          .filter((v) => v.impact === "serious" || v.impact === "critical")
          .map((v) => `${v.id} (${v.impact}): ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`);
        expect(grave, url).toEqual([]);
        if (media === "screen") {
          const found = await phoneProblems(page);
          expect(found, url).toEqual({ sideways: null, small: [] });
          await screenshot(page, "phone-checklist");
        }
      }
      expect(errors).toEqual([]);
    } finally {
      await phone.close();
    }
  });
});

describe("no console error far from the server's time zone", () => {
  for (const timezoneId of ["Pacific/Honolulu", "Asia/Tokyo"]) {
    it(`every reader page hydrates cleanly in ${timezoneId}`, async () => {
      const context = await launchBrowser({ timezoneId });
      try {
        const { page, errors } = await openPage(context);
        expect(await page.evaluate(() => Intl.DateTimeFormat().resolvedOptions().timeZone)).toBe(timezoneId);
        for (const path of [...READER_PAGES, "/dev/inbox"]) {
          await settle(page, path);
          // Hydration mismatches are reported once React has taken over the page; give it a beat.
          await page.waitForTimeout(100);
          expect(errors, `${path} in ${timezoneId}`).toEqual([]);
        }
        await signInAs(page, "admin");
        for (const { path } of SIGNED_IN_PAGES) {
          await settle(page, path);
          await page.waitForTimeout(100);
          expect(errors, `${path} in ${timezoneId}`).toEqual([]);
        }
      } finally {
        await context.close();
      }
    });
  }
});

type Offender = { what: string; height: number };

/**
 * At 360 px: the page must not scroll sideways, and every control a finger aims at must be at least
 * 44 px tall (WCAG 2.2 SC 2.5.5 "Target Size (Enhanced)": 44 × 44 CSS px; links inside a sentence are
 * the SC's own "inline" exception). A checkbox or radio counts by its label, which is what a finger hits.
 */
async function phoneProblems(page: Page) {
  return page.evaluate(() => {
    const root = document.documentElement;
    const sideways = root.scrollWidth > root.clientWidth ? `scrollWidth ${root.scrollWidth} > ${root.clientWidth}` : null;
    const small: Offender[] = [];
    const controls = document.querySelectorAll<HTMLElement>(
      "a[href], button, input:not([type=hidden]), select, textarea, summary, [role=button]",
    );
    for (const element of controls) {
      const style = getComputedStyle(element);
      if (style.visibility === "hidden" || style.display === "none") continue;
      let target: HTMLElement = element;
      if (element instanceof HTMLInputElement && (element.type === "checkbox" || element.type === "radio")) {
        target = element.closest("label") ?? element;
      }
      const box = target.getBoundingClientRect();
      // Not rendered, or visually hidden until focused (the skip link).
      if (box.width <= 1 || box.height <= 1) continue;
      if (element.closest("svg")) continue;
      if (element instanceof HTMLAnchorElement) {
        const block = element.closest("p, li, td, dd, figcaption, blockquote, small");
        const own = (element.textContent ?? "").trim().length;
        const around = (block?.textContent ?? "").trim().length;
        if (block && around > own + 2) continue;
      }
      if (box.height < 44) {
        const label = (target.getAttribute("aria-label") ?? target.textContent ?? "").trim().slice(0, 40);
        small.push({ what: `${target.tagName.toLowerCase()} "${label}"`, height: Math.round(box.height) });
      }
    }
    return { sideways, small };
  });
}

describe("at 360 px wide", () => {
  let phone: BrowserContext | undefined;
  afterAll(async () => phone?.close());

  it("no reader page scrolls sideways or has a control under 44 px", async () => {
    phone = await launchBrowser({ viewport: { width: 360, height: 780 } });
    const { page, errors } = await openPage(phone);
    const problems: Record<string, unknown> = {};
    for (const path of READER_PAGES) {
      await settle(page, path);
      const found = await phoneProblems(page);
      if (found.sideways || found.small.length) problems[path] = found;
    }
    await screenshot(page, "phone-sweep-last-reader-page");
    expect(problems).toEqual({});
    expect(errors).toEqual([]);
  });

  it("no signed-in page scrolls sideways or has a control under 44 px", async () => {
    phone ??= await launchBrowser({ viewport: { width: 360, height: 780 } });
    const { page, errors } = await openPage(phone);
    const problems: Record<string, unknown> = {};
    for (const { path, account } of SIGNED_IN_PAGES) {
      await signInAs(page, account);
      await settle(page, path);
      const found = await phoneProblems(page);
      if (found.sideways || found.small.length) problems[path] = found;
    }
    expect(problems).toEqual({});
    expect(errors).toEqual([]);
  });
});

import { readFileSync } from "node:fs";
import { AxeBuilder } from "@axe-core/playwright";
import { parse } from "csv-parse/sync";
import type { Page } from "playwright-core";
import { afterAll, describe, expect, inject, it } from "vitest";
import { launchBrowser, openPage, screenshot } from "./browser";

/**
 * The reader's whole job, as the issue lists it, at a phone's and a laptop's width: save a vehicle,
 * filter the Library to the guides that fit it, open one, save its parts checklist, tick two items,
 * reload and see them ticked, download the CSV, report fitment, print the guide. A screenshot of
 * every screen; axe (WCAG 2.2 A/AA rules) on My vehicles and the checklist.
 */
const origin = inject("origin");
// Demo data (invented): the Norvik Fjell F3 hybrid AWD keeps its 12 V battery in the cargo area,
// and the cargo-side 12 V outlet guide is marked "fits" for it.
const GUIDE = "fjell-hybrid-cargo-12v-outlet";
const SIZES = [
  { name: "phone", viewport: { width: 360, height: 780 }, account: "reader@torqueleaf.test" },
  { name: "laptop", viewport: { width: 1366, height: 900 }, account: "author2@torqueleaf.test" },
];

async function signIn(page: Page, email: string) {
  await page.goto(`${origin}/login`);
  await page.getByLabel("E-mail address", { exact: true }).fill(email);
  await page.getByLabel("Password", { exact: true }).fill("torqueleaf-demo");
  await page.getByRole("button", { name: "Sign in", exact: true }).click();
  await page.waitForURL((url) => url.pathname !== "/login");
}

/** Earlier test files may have left vehicles and checklists on the demo account: start from none. */
async function clearReaderRecords(page: Page) {
  const headers = { Origin: origin };
  const vehicles = (await (await page.request.get(`${origin}/api/me/vehicles`)).json()) as { vehicles: { id: number }[] };
  for (const v of vehicles.vehicles) await page.request.delete(`${origin}/api/me/vehicles/${v.id}`, { headers });
  const lists = (await (await page.request.get(`${origin}/api/checklists`)).json()) as { checklists: { id: number }[] };
  for (const c of lists.checklists) await page.request.delete(`${origin}/api/checklists/${c.id}`, { headers });
}

async function axeGrave(page: Page) {
  const result = await new AxeBuilder({ page }).withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa", "wcag22aa"]).analyze();
  return result.violations
    .filter((v) => v.impact === "serious" || v.impact === "critical")
    .map((v) => `${v.id} (${v.impact}): ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`);
}

const sideways = (page: Page) => page.evaluate(() => document.documentElement.scrollWidth > window.innerWidth);

for (const size of SIZES) {
  describe(`a reader's visit at ${size.viewport.width} × ${size.viewport.height}`, () => {
    let context: Awaited<ReturnType<typeof launchBrowser>> | undefined;
    afterAll(async () => context?.close());

    it("saves a vehicle, finds a guide that fits it, keeps its parts checklist, reports fitment and prints it", async () => {
      context = await launchBrowser({ viewport: size.viewport });
      const { page, errors } = await openPage(context);
      const shot = (step: string) => screenshot(page, `reader-flow-${size.name}-${step}`);
      await signIn(page, size.account);
      await clearReaderRecords(page);

      // 1. My vehicles: make → model → generation move on by themselves, then variant and year.
      await page.goto(`${origin}/me/vehicles`);
      await page.getByLabel("Make", { exact: true }).selectOption({ label: "Norvik" });
      await page.getByLabel("Model", { exact: true }).selectOption({ label: "Fjell" });
      await page.getByLabel("Generation", { exact: true }).selectOption({ label: "F3 (2019–2025)" });
      await page.getByLabel("Variant", { exact: true }).selectOption({ label: "2.0 hybrid AWD" });
      await page.getByLabel("Model year", { exact: true }).selectOption("2022");
      await page.getByLabel(/^Nickname/).fill("Cargo hauler");
      await page.getByRole("button", { name: "Save vehicle" }).click();
      await expect.poll(() => page.getByText("Cargo hauler", { exact: true }).count()).toBeGreaterThan(0);
      expect(await sideways(page)).toBe(false);
      expect(await axeGrave(page)).toEqual([]);
      await shot("1-my-vehicles");
      const saved = (await (await page.request.get(`${origin}/api/me/vehicles`)).json()) as {
        vehicles: { id: number; variantId: number; year: number; current: boolean }[];
      };
      expect(saved.vehicles).toHaveLength(1);
      expect(saved.vehicles[0]).toMatchObject({ year: 2022, current: true });
      const variantId = saved.vehicles[0].variantId;

      // 2. The Library, filtered to the guides that fit the current vehicle.
      await page.goto(`${origin}/`);
      // At a phone's width the filters fold away under their summary line.
      const fitsMine = page.getByLabel(/Fits my vehicle only/);
      if (!(await fitsMine.isVisible())) await page.getByText("Filters and search").first().click();
      await fitsMine.check();
      await page.getByRole("button", { name: "Apply filters" }).first().click();
      await page.waitForURL((url) => url.searchParams.get("fits") === String(variantId));
      const shown = await page.locator(`a[href="/guides/${GUIDE}"]`).count();
      expect(shown).toBeGreaterThan(0);
      // Every guide listed fits the variant (fits or fits with changes), by the public API's fitment.
      const listed = (await (await page.request.get(`${origin}/api/guides?fits=${variantId}`)).json()) as {
        guides: { slug: string; fitment: { variantId: number; status: string }[] }[];
      };
      for (const g of listed.guides) {
        const status = g.fitment.find((f) => f.variantId === variantId)?.status;
        expect(["fits", "fits-with-changes"], g.slug).toContain(status);
      }
      expect(await sideways(page)).toBe(false);
      await shot("2-library-fits-my-vehicle");

      // 3. The guide, with the fitment line for the vehicle at the top.
      await page.locator(`a[href="/guides/${GUIDE}"]`).first().click();
      await page.waitForURL(`**/guides/${GUIDE}`);
      const line = page.getByRole("region", { name: "Fitment for your vehicle" });
      await expect.poll(() => line.textContent()).toMatch(/Cargo hauler|2\.0 hybrid AWD/);
      await shot("3-guide");

      // 4. Save the parts checklist, tick two items, reload: both still ticked.
      await page.getByRole("button", { name: "Save a parts checklist" }).click();
      await page.waitForURL(/\/me\/checklists\/\d+/);
      const checklistId = Number(new URL(page.url()).pathname.split("/").at(-1));
      const ticks = page.locator('button[aria-pressed="false"]');
      expect(await ticks.count()).toBeGreaterThanOrEqual(2);
      const names = [
        (await ticks.nth(0).locator(".sr-only").textContent())!,
        (await ticks.nth(1).locator(".sr-only").textContent())!,
      ];
      for (const name of names) {
        await page.getByRole("button", { name, exact: true }).click();
        await expect.poll(() => page.getByRole("button", { name, exact: true }).getAttribute("aria-pressed")).toBe("true");
      }
      await expect
        .poll(async () => {
          const answer = (await (await page.request.get(`${origin}/api/checklists/${checklistId}`)).json()) as {
            items: { checked: boolean }[];
          };
          return answer.items.filter((i) => i.checked).length;
        })
        .toBe(2);
      await page.reload();
      for (const name of names) {
        expect(await page.getByRole("button", { name, exact: true }).getAttribute("aria-pressed")).toBe("true");
      }
      expect(await sideways(page)).toBe(false);
      expect(await axeGrave(page)).toEqual([]);
      await shot("4-checklist-ticked");

      // 5. The CSV: RFC 4180, read back with csv-parse; the two ticked items say so.
      const downloading = page.waitForEvent("download");
      await page.getByRole("link", { name: "Download CSV" }).click();
      const download = await downloading;
      const rows = parse(readFileSync((await download.path())!), { bom: true, columns: true }) as Record<string, string>[];
      expect(Object.keys(rows[0])).toEqual(["item", "quantity", "part number", "step", "checked", "note"]);
      const tickedNames = names.map((n) => n.replace(/^Ticked off: /, ""));
      for (const name of tickedNames) {
        const row = rows.find((r) => r.item === name);
        expect(row, name).toBeDefined();
        expect(row!.checked).toBe("yes");
      }

      // 6. Report fitment for the saved vehicle; the guide's tally counts it.
      await page.goto(`${origin}/guides/${GUIDE}#fitment-reports`);
      await page.getByLabel("It fit", { exact: true }).check();
      await page.getByLabel(/^Note/).fill("The panel clip sat behind the cargo hook; no other change.");
      await page.getByRole("button", { name: "Send report" }).click();
      await expect
        .poll(async () => {
          const guide = (await (await page.request.get(`${origin}/api/guides/${GUIDE}`)).json()) as {
            fitmentReports: { variantId: number; fits: number }[];
          };
          return guide.fitmentReports.find((r) => r.variantId === variantId)?.fits ?? 0;
        })
        .toBeGreaterThanOrEqual(1);
      await page.goto(`${origin}/guides/${GUIDE}`);
      await expect.poll(() => page.locator("#fitment-reports").textContent()).toMatch(/[1-9]\d* fit ·/);
      expect(await sideways(page)).toBe(false);
      await page.locator("#fitment-reports").scrollIntoViewIfNeeded();
      await shot("5-fitment-reported");

      // 7. Print the guide: the print view, laid out for paper.
      await page.getByRole("link", { name: "Print view" }).first().click();
      await page.waitForURL((url) => url.searchParams.get("print") === "1");
      await page.emulateMedia({ media: "print" });
      await shot("6-print");
      await page.emulateMedia({ media: "screen" });

      expect(errors).toEqual([]);
      // The demo account goes back to no vehicle and no checklist for the test files after this one.
      await clearReaderRecords(page);
    });
  });
}

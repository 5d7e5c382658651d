import { expect, inject, it } from "vitest";
import { launchBrowser, openPage, screenshot, sharedBrowser } from "./browser";

const origin = inject("origin");
const browser = sharedBrowser();

it("the planner computes as you type, explains and draws the circuit", async () => {
  const { page, errors } = await openPage(browser());
  await page.goto(`${origin}/tools/circuit`);
  await page.waitForLoadState("networkidle");
  // A pair of lamps, 170 W together at 12 V (common practice: the seed guide's example).
  await page.getByLabel("Load power (W)").fill("170");
  await page.getByLabel("One-way run (m)").fill("2.6");
  await page.getByLabel("Return path").selectOption("chassis");
  await page.getByLabel("Wire size").selectOption("awg:12");
  await page.getByLabel("Fuse", { exact: true }).selectOption("20");
  const results = page.getByTestId("circuit-results");
  await expect.poll(async () => results.textContent()).toMatch(/14\.2 A/);
  expect(await results.textContent()).toMatch(/20 A/);
  const diagram = await page.locator("figure svg").first().innerHTML();
  for (const terminal of ["30", "87", "85", "86"]) expect(diagram).toContain(`>${terminal}<`);
  await screenshot(page, "planner");

  // A fuse over 150 % of the wire's ampacity is flagged as blocking (33 CFR 183.455(c)(1)): 18 AWG at 105 °C
  // carries 20 A × 0.85 in the engine bay (33 CFR 183.425 Table 5), so 25.5 A at most; a 30 A fuse exceeds it.
  await page.getByLabel("Wire size").selectOption("awg:18");
  await page.getByLabel("Fuse", { exact: true }).selectOption("30");
  await expect.poll(async () => page.getByText("fuse-exceeds-wire").count()).toBeGreaterThan(0);

  // Choosing the hybrid whose battery sits in the cargo area pre-fills a long run to the front.
  const hybrid = await page
    .getByLabel("Vehicle", { exact: true })
    .locator("option", { hasText: "hybrid AWD (Hybrid)" })
    .getAttribute("value");
  await page.getByLabel("Vehicle", { exact: true }).selectOption(hybrid ?? "");
  await expect.poll(async () => Number(await page.getByLabel("One-way run (m)").inputValue())).toBeGreaterThan(4);
  expect(await page.getByTestId("vehicle-note").textContent()).toMatch(/cargo area/);
  await screenshot(page, "planner-hybrid");

  // A bad length names the field and keeps what was typed.
  await page.getByLabel("One-way run (m)").fill("0");
  await expect.poll(async () => page.getByText(/oneWayLengthM must be more than 0/).count()).toBeGreaterThan(0);
  expect(await page.getByLabel("Load power (W)").inputValue()).toBe("170");
  expect(errors).toEqual([]);
});

it("works without JavaScript as a plain form post", async () => {
  const noScript = await launchBrowser({ javaScriptEnabled: false });
  const { page, errors } = await openPage(noScript);
  await page.goto(`${origin}/tools/circuit`);
  await page.getByLabel("Load power (W)").fill("110");
  await page.getByLabel("One-way run (m)").fill("5");
  await page.getByLabel("Return path").selectOption("chassis");
  await page.getByRole("button", { name: "Check the circuit" }).click();
  await page.waitForLoadState("load");
  // Derived by hand from engine.md §1: 110 W / 12 V = 9.167 A → 15 A fuse; chassis return, 3 % → 12 AWG.
  const text = (await page.getByTestId("circuit-results").textContent()) ?? "";
  expect(text).toMatch(/9\.2 A/);
  expect(text).toMatch(/15 A/);
  expect(text).toMatch(/12 AWG/);
  await noScript.close();
  expect(errors).toEqual([]);
});

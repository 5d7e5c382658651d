import sharp from "sharp";
import { expect, inject, it } from "vitest";
import { openPage, screenshot, sharedBrowser } from "./browser";

const origin = inject("origin");
const browser = sharedBrowser();

const saveState = (page: import("playwright-core").Page) => page.locator("[data-save-state]").getAttribute("data-save-state");

it("an author writes a guide, loses the network, gets the kept edits back, settles a conflict and previews", async () => {
  const { page, errors } = await openPage(browser());
  await page.goto(`${origin}/login`);
  await page.fill("#field-email", "author@torqueleaf.test");
  await page.fill("#field-password", "torqueleaf-demo");
  await page.getByRole("button", { name: "Sign in", exact: true }).click();
  await page.waitForURL(`${origin}/`);
  await page.goto(`${origin}/workbench`);
  await screenshot(page, "workbench");
  await page.getByRole("link", { name: "Write a new guide" }).click();
  await page.fill("#field-title", "Fog lamps behind the grille");
  await page.fill("#field-summary", "Two fog lamps behind the lower grille, switched through a relay.");
  await page.selectOption("#field-category", "lighting");
  await page.selectOption("#field-difficulty", "3");
  await page.fill("#field-minutes", "150");
  await page.getByRole("button", { name: "Create the draft" }).click();
  await page.waitForURL(/\/workbench\/guides\/\d+$/);
  const editorUrl = page.url();
  await page.waitForLoadState("networkidle");

  for (const [i, title] of ["Disconnect the battery", "Mount the lamp brackets", "Run the harness"].entries()) {
    await page.getByRole("button", { name: "Add a step" }).click();
    await page.fill(`#field-steps-${i}-title`, title);
    await page.locator(`#field-steps-${i}-body`).click();
    await page.keyboard.type(`Text of step ${i + 1}.`);
  }
  // Two generated photos (invented content) on step 2.
  const photo = await sharp({ create: { width: 1200, height: 800, channels: 3, background: "#3a6b5c" } })
    .jpeg()
    .toBuffer();
  await page.setInputFiles("#field-steps-1-photos", [
    { name: "left.jpg", mimeType: "image/jpeg", buffer: photo },
    { name: "right.jpg", mimeType: "image/jpeg", buffer: photo },
  ]);
  await page.waitForSelector("#field-steps-1-photos-1-alt", { timeout: 30_000 });
  await page.fill("#field-steps-1-photos-0-alt", "The left bracket on the bumper beam");
  await page.fill("#field-steps-1-photos-1-alt", "The right bracket on the bumper beam");
  await expect.poll(() => saveState(page), { timeout: 15_000 }).toBe("saved");
  await screenshot(page, "editor");

  // Offline: the edit is kept on this device and offered back after a reload.
  await page.context().setOffline(true);
  await page.fill("#field-steps-2-title", "Run the harness through the grommet");
  await expect.poll(() => saveState(page), { timeout: 10_000 }).toBe("offline");
  // The reload happens online, but the kept edit must not have reached the server yet.
  await page.route("**/api/guides/*/draft", (route) => route.abort());
  await page.context().setOffline(false);
  await page.reload();
  await page.getByRole("button", { name: "Restore my changes" }).click();
  await page.unroute("**/api/guides/*/draft");
  expect(await page.inputValue("#field-steps-2-title")).toBe("Run the harness through the grommet");
  await page.fill("#field-minutes", "160");
  await expect.poll(() => saveState(page), { timeout: 15_000 }).toBe("saved");

  // A second tab saves first; this tab's next save meets the conflict view, nothing is overwritten.
  const { page: tab2 } = await openPage(browser());
  await tab2.goto(editorUrl);
  await tab2.waitForLoadState("networkidle");
  await tab2.fill("#field-title", "Fog lamps behind the lower grille");
  await expect.poll(() => saveState(tab2), { timeout: 15_000 }).toBe("saved");
  await page.fill("#field-summary", "Two fog lamps, a relay and a switch in the dash.");
  await page.locator("#conflict-title").waitFor({ timeout: 15_000 });
  expect(
    await page.locator("[data-conflict-field]").evaluateAll((els) => els.map((e) => e.getAttribute("data-conflict-field"))),
  ).toEqual(["title", "summary"]);
  await screenshot(page, "editor-conflict");
  await page.locator('[data-conflict-field="title"]').getByRole("button", { name: "Take the saved one" }).click();
  await page.getByRole("button", { name: "Save this combination" }).click();
  await expect.poll(() => saveState(page), { timeout: 15_000 }).toBe("saved");
  await tab2.close();

  await page.goto(`${editorUrl}/preview`);
  const preview = (await page.locator("main, article").first().textContent()) ?? "";
  expect(preview).toContain("Fog lamps behind the lower grille");
  expect(preview).toContain("Two fog lamps, a relay and a switch in the dash.");
  expect(preview).toContain("Run the harness through the grommet");
  await screenshot(page, "editor-preview");
  // The flow itself causes refused saves (400 while a callout is half-filled, 409 on the conflict) and
  // dropped requests (offline, aborted): the browser logs those loads; nothing else may appear.
  expect(
    errors.filter((e) => !/^Failed to load resource: (the server responded with a status of (400|409)|net::ERR_)/.test(e)),
  ).toEqual([]);
});

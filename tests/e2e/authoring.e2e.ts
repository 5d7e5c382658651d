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
  // Two generated photos (invented content) on step 2, noisy so that they take a while to send
  // over an upload throttled to 256 KB/s (Chrome DevTools Protocol network emulation): each file's
  // progress bar is seen part-way.
  const photo = await sharp({
    create: { width: 1200, height: 800, channels: 3, background: "#3a6b5c", noise: { type: "gaussian", mean: 90, sigma: 40 } },
  })
    .jpeg({ quality: 90 })
    .toBuffer();
  expect(photo.byteLength).toBeGreaterThan(300_000);
  const cdp = await page.context().newCDPSession(page);
  await cdp.send("Network.emulateNetworkConditions", {
    offline: false,
    latency: 0,
    downloadThroughput: -1,
    uploadThroughput: 256 * 1024,
  });
  await page.setInputFiles("#field-steps-1-photos", [
    { name: "left.jpg", mimeType: "image/jpeg", buffer: photo },
    { name: "right.jpg", mimeType: "image/jpeg", buffer: photo },
  ]);
  const bars = page.locator('ul[aria-label="Uploads"] progress');
  await expect
    .poll(
      async () =>
        bars.evaluateAll((els) => els.some((e) => (e as HTMLProgressElement).value > 0 && (e as HTMLProgressElement).value < 1)),
      {
        timeout: 15_000,
        interval: 50,
      },
    )
    .toBe(true);
  await screenshot(page, "editor-uploading");
  await page.waitForSelector("#field-steps-1-photos-1-alt", { timeout: 60_000 });
  await cdp.send("Network.emulateNetworkConditions", {
    offline: false,
    latency: 0,
    downloadThroughput: -1,
    uploadThroughput: -1,
  });
  await page.fill("#field-steps-1-photos-0-alt", "The left bracket on the bumper beam");
  await page.fill("#field-steps-1-photos-1-alt", "The right bracket on the bumper beam");

  // A torque callout with the maker's value: every unit shown as the author types.
  await page.click("#field-steps-1-callouts-add-torque");
  await page.fill("#field-steps-1-callouts-0-fastener", "Bracket bolt M8");
  await page.fill("#field-steps-1-callouts-0-value", "22");
  const asShown = page.locator('#field-steps-1-callouts-0 [aria-label="As readers will see this torque"]');
  // 22 N·m = 16.2 lbf·ft (1 lbf·ft = 1.355818 N·m, NIST SP 811 (2008) appendix B.9).
  await expect.poll(() => asShown.textContent(), { timeout: 5_000 }).toMatch(/16\.2\s*lbf·ft/);
  // A circuit callout: the engine's results and the wiring diagram appear once load and run are in.
  await page.click("#field-steps-2-callouts-add-circuit");
  await page.fill("#field-steps-2-callouts-0-loadWatts", "110");
  await page.fill("#field-steps-2-callouts-0-oneWayLengthM", "3");
  await page.locator("#field-steps-2-callouts-0 svg").first().waitFor({ timeout: 5_000 });
  // 110 W at 12 V is 9.2 A; with the 125 % margin, 11.5 A, the next blade rating is 15 A (engine.md §1).
  expect(await page.locator("#field-steps-2-callouts-0").textContent()).toMatch(/15\s*A/);
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

  // Submit: refused (422) while no vehicle is in the fitment, with a link to the place to fix.
  await page.goto(editorUrl);
  await page.waitForLoadState("networkidle");
  await page.fill("#field-changeSummary", "First revision: fog lamps on a relay.");
  await page.getByRole("button", { name: "Submit for review" }).click();
  const refusal = page.locator("#section-submit [role=alert]");
  await refusal.waitFor({ timeout: 10_000 });
  expect(await refusal.textContent()).toMatch(/fitment/i);
  await refusal
    .getByRole("button", { name: /fitment/i })
    .first()
    .click();
  expect(await page.evaluate(() => document.activeElement?.closest("[id^=field-fitment]")?.id)).toMatch(/^field-fitment/);
  await page.selectOption("#field-fitment-pick-make", { index: 1 });
  await page.selectOption("#field-fitment-pick-model", { index: 1 });
  await page.selectOption("#field-fitment-pick-generation", { index: 1 });
  await page.locator('[id^="field-fitment-"][id$="-status-fits"]').first().check();
  // The circuit's own choices, which submit requires (api.md: every circuit callout complete), and
  // the battery disconnected first, which the engine's rule battery-disconnect-missing asks for.
  expect(await refusal.textContent()).toMatch(/choose the wire size/);
  await page.selectOption("#field-steps-2-callouts-0-wire", { label: "12 AWG" });
  await page.selectOption("#field-steps-2-callouts-0-fuseA", { label: "15 A" });
  await page.fill("#field-steps-2-callouts-0-fuseDistanceMm", "150");
  await page.selectOption("#field-steps-2-callouts-0-relay", { label: "Not used" });
  await page.getByRole("group", { name: "Step 1: safety flags" }).getByLabel("Disconnects the battery").check();
  await expect.poll(() => saveState(page), { timeout: 15_000 }).toBe("saved");

  // The editor at a phone's width: nothing wider than the screen.
  await page.setViewportSize({ width: 360, height: 780 });
  expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
  await screenshot(page, "editor-360");
  await page.setViewportSize({ width: 1280, height: 900 });

  await page.getByRole("button", { name: "Submit for review" }).click();
  await page
    .getByText(/Revision 1 is with the editors/)
    .first()
    .waitFor({ timeout: 15_000 });
  await page.goto(`${origin}/workbench`);
  expect(await page.locator("main").textContent()).toMatch(/Fog lamps behind the lower grille[\s\S]*In review with the editors/);

  // The flow itself causes refused saves (409 on the conflict, 422 on the first submit) and
  // dropped requests (offline, aborted): the browser logs those loads; nothing else may appear.
  expect(
    errors.filter((e) => !/^Failed to load resource: (the server responded with a status of (400|409|422)|net::ERR_)/.test(e)),
  ).toEqual([]);
}, 240_000);

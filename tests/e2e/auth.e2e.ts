import type { Page } from "playwright-core";
import { expect, inject, it } from "vitest";
import { openPage, screenshot, sharedBrowser } from "./browser";

const origin = inject("origin");
const browser = sharedBrowser();
const member = {
  name: "Linnea Vos",
  email: `linnea.vos.${Date.now().toString(36)}@example.test`,
  password: "relay before the fuse box",
  newPassword: "a new phrase for the garage",
};

/** Opens the development inbox like a person would and returns the first link to this site in the newest matching mail. */
async function linkFromInbox(page: Page, to: string, subject: RegExp, path: RegExp) {
  const mail = page.locator("li").filter({ hasText: to }).filter({ hasText: subject }).first();
  // Account mail leaves in the background; look again until it has arrived.
  for (let tries = 0; ; tries++) {
    await page.goto(`${origin}/dev/inbox`);
    if ((await mail.count()) > 0 || tries >= 20) break;
    await page.waitForTimeout(250);
  }
  const text = (await mail.locator("pre").textContent()) ?? "";
  const match = text.match(path);
  if (!match) throw new Error(`no link in the mail to ${to}:\n${text}`);
  return match[0];
}

async function signIn(page: Page, email: string, password: string) {
  await page.goto(`${origin}/login`);
  await page.getByLabel("E-mail address", { exact: true }).fill(email);
  await page.getByLabel("Password", { exact: true }).fill(password);
  await page.getByRole("button", { name: "Sign in", exact: true }).click();
}

it("a visitor signs up, confirms the address from the mail in the inbox, signs in and out", async () => {
  const { page, errors } = await openPage(browser());
  await page.goto(`${origin}/signup`);
  await page.getByLabel("Name", { exact: true }).fill(member.name);
  await page.getByLabel("E-mail address").fill(member.email);
  await page.getByLabel("Password").fill("password1");
  await page.getByRole("button", { name: "Create my account" }).click();
  // A common password is refused beside the field; the other fields keep what was typed.
  await page.getByText("one of the most common ones").waitFor();
  expect(await page.getByLabel("E-mail address").inputValue()).toBe(member.email);
  expect(await page.getByLabel("Password").inputValue()).toBe("");
  // The refused submission answered 400, which Chromium logs as a failed load; that one was intended.
  errors.length = 0;
  await page.getByLabel("Password").fill(member.password);
  await page.getByRole("button", { name: "Create my account" }).click();
  await page.getByRole("heading", { name: "Check your inbox" }).waitFor();
  await screenshot(page, "signup-check-inbox");

  const link = await linkFromInbox(page, member.email, /Confirm your e-mail/, /https?:\/\/\S+\/verify\/[\w-]+/);
  await page.goto(link);
  await page.getByRole("button", { name: "Confirm this address" }).click();
  await page.waitForURL(/notice=verified/);
  await page.getByRole("status").filter({ hasText: "Your address is confirmed" }).waitFor();

  await signIn(page, member.email, member.password);
  await page.waitForURL(`${origin}/`);
  const banner = page.getByRole("banner");
  await banner.getByText(member.name).waitFor();
  // Chromium treats http://localhost as secure, so the production cookie with its __Host- prefix is kept.
  const cookie = (await browser().cookies(origin)).find((c) => c.name === "__Host-tl_session");
  expect(cookie).toMatchObject({ secure: true, httpOnly: true, sameSite: "Lax", path: "/" });
  await banner.getByText(member.name).click();
  await screenshot(page, "user-menu");
  await banner.getByRole("button", { name: "Sign out" }).click();
  await page.waitForURL(/notice=signed-out/);
  await page.getByRole("banner").getByRole("link", { name: "Sign in", exact: true }).waitFor();
  expect(await page.getByRole("banner").getByText(member.name).count()).toBe(0);
  expect(errors).toEqual([]);
});

it("the member forgets the password, resets it by the mailed link and signs in with the new one", async () => {
  const { page, errors } = await openPage(browser());
  await page.goto(`${origin}/login`);
  await page.getByRole("link", { name: "Forgot your password?" }).click();
  await page.getByRole("heading", { name: "Reset your password" }).waitFor();
  await page.getByLabel("E-mail address").fill(member.email);
  await page.getByRole("button", { name: "Send the link" }).click();
  await page.getByText("a link is on its way").waitFor();

  const link = await linkFromInbox(page, member.email, /new Torqueleaf password/, /https?:\/\/\S+\/reset\/[\w-]+/);
  await page.goto(link);
  await page.getByLabel("New password").fill(member.newPassword);
  await page.getByRole("button", { name: "Set the new password" }).click();
  await page.waitForURL(/notice=reset/);
  await signIn(page, member.email, member.newPassword);
  await page.waitForURL(`${origin}/`);
  await page.getByRole("banner").getByText(member.name).waitFor();
  await browser().clearCookies();
  expect(errors).toEqual([]);
});

it("someone signs in with GitHub through the local stand-in and lands signed in", async () => {
  const { page, errors } = await openPage(browser());
  await page.goto(`${origin}/login`);
  await page.getByRole("link", { name: "Sign in with GitHub" }).click();
  await page.getByRole("button", { name: /Continue as Tove Arnesen/ }).click();
  await page.waitForURL(`${origin}/`);
  // Only our own pages count: the stand-in's bare page has no favicon.
  errors.length = 0;
  await page.getByRole("banner").getByText("Tove Arnesen").waitFor();
  await page.goto(`${origin}/me/account`);
  expect(await page.getByText("Also signs in with: GitHub").isVisible()).toBe(true);
  await screenshot(page, "account-settings");
  await browser().clearCookies();
  expect(errors).toEqual([]);
});

it("an admin appoints the new member editor, with a reason, from the users page", async () => {
  const { page, errors } = await openPage(browser());
  await signIn(page, "admin@torqueleaf.test", "torqueleaf-demo");
  await page.waitForURL(`${origin}/`);
  await page.goto(`${origin}/admin/users`);
  await page.getByLabel("Name or e-mail").fill("Linnea");
  await page.getByRole("button", { name: "Show" }).click();
  await page.waitForURL(/q=Linnea/);
  await page.getByLabel(`Role for ${member.name}`).selectOption("editor");
  await page.getByLabel(`Reason for the change to ${member.name}`).fill("Runs the electrical review rota");
  await page.getByRole("button", { name: "Set role" }).click();
  await page.getByText(`${member.name} is now an editor.`).waitFor();
  await screenshot(page, "admin-users");
  await browser().clearCookies();
  expect(errors).toEqual([]);
});

it("a failed sign-in puts the focus on the error, with the address kept", async () => {
  const { page, errors } = await openPage(browser());
  // An address with no account: nobody's failed attempts are recorded.
  await signIn(page, `nobody.${Date.now().toString(36)}@example.test`, "not the password");
  await page.getByRole("alert").waitFor();
  await expect.poll(() => page.evaluate(() => document.activeElement?.getAttribute("role"))).toBe("alert");
  expect(await page.evaluate(() => document.activeElement?.textContent)).toMatch(/e-mail address and password/i);
  expect(await page.getByLabel("E-mail address", { exact: true }).inputValue()).toMatch(/^nobody\./);
  // The refused sign-in answered 401, which Chromium logs as a failed load; that one was intended.
  expect(errors.filter((e) => !/status of 401/.test(e))).toEqual([]);
});

it("the account menu closes on Escape, giving the focus back to its button, and on a click outside", async () => {
  const { page, errors } = await openPage(browser());
  await signIn(page, "reader@torqueleaf.test", "torqueleaf-demo");
  await page.waitForURL((url) => !url.pathname.startsWith("/login"));
  const menu = page.locator("header details");
  const button = menu.locator("summary");
  await button.click();
  expect(await menu.evaluate((d: HTMLDetailsElement) => d.open)).toBe(true);
  await page.getByRole("link", { name: "Account and sessions" }).focus();
  await page.keyboard.press("Escape");
  expect(await menu.evaluate((d: HTMLDetailsElement) => d.open)).toBe(false);
  expect(await button.evaluate((el) => el === document.activeElement)).toBe(true);

  await button.click();
  expect(await menu.evaluate((d: HTMLDetailsElement) => d.open)).toBe(true);
  await page.getByRole("heading", { level: 1 }).click();
  await expect.poll(() => menu.evaluate((d: HTMLDetailsElement) => d.open)).toBe(false);
  expect(errors).toEqual([]);
});

it("the first Tab on a page reaches a skip link that moves the focus to the main content", async () => {
  const { page, errors } = await openPage(browser());
  await page.goto(`${origin}/login`);
  await page.waitForLoadState("networkidle");
  await page.keyboard.press("Tab");
  const first = await page.evaluate(() => ({
    text: document.activeElement?.textContent,
    href: document.activeElement?.getAttribute("href"),
  }));
  expect(first).toEqual({ text: "Skip to content", href: "#main" });
  await page.keyboard.press("Enter");
  expect(await page.evaluate(() => document.activeElement?.tagName)).toBe("MAIN");
  expect(errors).toEqual([]);
});

/** WCAG 2.2 relative luminance and contrast ratio (Understanding SC 1.4.3, "contrast ratio" definition). */
function contrast(a: number[], b: number[]) {
  const lum = ([r, g, bl]: number[]) => {
    const c = [r, g, bl].map((v) => {
      const s = v / 255;
      return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
    });
    return 0.2126 * c[0] + 0.7152 * c[1] + 0.0722 * c[2];
  };
  const [hi, lo] = [lum(a), lum(b)].sort((x, y) => y - x);
  return (hi + 0.05) / (lo + 0.05);
}

it("at 360 px the account pages fit the width, every control is 44 px tall and the header text has 4.5:1 contrast", async () => {
  // Signed out, so the sign-in and sign-up pages show rather than send the visitor on.
  await browser().clearCookies();
  const { page, errors } = await openPage(browser());
  await page.setViewportSize({ width: 360, height: 780 });
  for (const path of ["/", "/login", "/signup", "/reset"]) {
    await page.goto(`${origin}${path}`);
    await page.waitForLoadState("networkidle");
    expect(await page.evaluate(() => document.documentElement.scrollWidth), path).toBeLessThanOrEqual(360);
    // Controls, not links inside a sentence (WCAG 2.2 SC 2.5.8 leaves inline links out, so neither a
    // link in a paragraph nor one laid out inline counts); a radio counts by its label.
    const small = await page.evaluate(() =>
      Array.from(document.querySelectorAll<HTMLElement>("a, button, input, select, summary, textarea"))
        .filter(
          (el) =>
            el.getClientRects().length > 0 &&
            !el.closest("p, dd, .sr-only") &&
            getComputedStyle(el).display !== "inline" &&
            (el as HTMLInputElement).type !== "hidden",
        )
        .map((el) => ({
          el,
          box: ((el as HTMLInputElement).type === "radio" ? (el.closest("label") ?? el) : el).getBoundingClientRect(),
        }))
        .filter(({ box }) => box.height > 0 && box.height < 44)
        .map(
          ({ el, box }) =>
            `${el.tagName} "${(el.textContent || el.getAttribute("name") || "").trim().slice(0, 30)}" ${Math.round(box.height)}px`,
        ),
    );
    expect(small, path).toEqual([]);
    const colours = await page.evaluate(() =>
      Array.from(document.querySelectorAll<HTMLElement>("header a, header summary"))
        .filter((el) => el.getClientRects().length > 0 && el.textContent?.trim())
        .map((el) => {
          let bg = "rgba(0, 0, 0, 0)";
          for (let node: HTMLElement | null = el; node && /rgba\(0, 0, 0, 0\)|transparent/.test(bg); node = node.parentElement) {
            bg = getComputedStyle(node).backgroundColor;
          }
          return { text: el.textContent?.trim() ?? "", fg: getComputedStyle(el).color, bg };
        }),
    );
    const rgb = (css: string) => (css.match(/\d+(\.\d+)?/g) ?? []).slice(0, 3).map(Number);
    for (const { text, fg, bg } of colours) {
      expect(contrast(rgb(fg), rgb(bg)), `${path}: "${text}" ${fg} on ${bg}`).toBeGreaterThanOrEqual(4.5);
    }
  }
  // Signed in as the admin, the account page and the users table fit too, every action in reach.
  await signIn(page, "admin@torqueleaf.test", "torqueleaf-demo");
  await page.waitForURL((url) => !url.pathname.startsWith("/login"));
  for (const path of ["/me/account", "/admin/users"]) {
    await page.goto(`${origin}${path}`);
    await page.waitForLoadState("networkidle");
    expect(await page.evaluate(() => document.documentElement.scrollWidth), path).toBeLessThanOrEqual(360);
  }
  const actions = page.getByRole("button", { name: "Set role" });
  expect(await actions.count()).toBeGreaterThan(0);
  const box = await actions.first().boundingBox();
  expect((box?.x ?? 999) + (box?.width ?? 0)).toBeLessThanOrEqual(360);
  await browser().clearCookies();
  expect(errors).toEqual([]);
});

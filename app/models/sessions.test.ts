import { describe, expect, it } from "vitest";
import { describeSession, plainAddress } from "./sessions.server";

// What the account page's list of sessions says for the headers a sign-in arrived with.
describe("describeSession", () => {
  it.each([
    [
      // From Debian's Chromium 156 on this project's build machine, headless (navigator.userAgent).
      "Mozilla/5.0 (X11; Linux x86_64) AppleWebKit/537.36 (KHTML, like Gecko) HeadlessChrome/156.0.0.0 Safari/537.36",
      "Headless Chrome on Linux",
    ],
    [
      // The same build with a window: Chromium's reduced User-Agent (from memory).
      "Mozilla/5.0 (X11; Linux x86_64) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/156.0.0.0 Safari/537.36",
      "Chrome on Linux",
    ],
    [
      // Firefox ESR on Windows 10 (from memory; the shape is Mozilla's documented "rv:… Gecko/20100101 Firefox/…").
      "Mozilla/5.0 (Windows NT 10.0; Win64; x64; rv:128.0) Gecko/20100101 Firefox/128.0",
      "Firefox on Windows",
    ],
    [
      // Safari on an iPhone (from memory).
      "Mozilla/5.0 (iPhone; CPU iPhone OS 17_5 like Mac OS X) AppleWebKit/605.1.15 (KHTML, like Gecko) Version/17.5 Mobile/15E148 Safari/604.1",
      "Safari on iOS",
    ],
    [
      // Samsung Internet on Android (from memory).
      "Mozilla/5.0 (Linux; Android 14; SM-S918B) AppleWebKit/537.36 (KHTML, like Gecko) SamsungBrowser/25.0 Chrome/121.0.0.0 Mobile Safari/537.36",
      "Samsung Internet on Android",
    ],
    // From `curl --version` on this machine: curl 7.88.1 sends "curl/7.88.1".
    ["curl/7.88.1", "curl"],
    [null, "Unknown browser"],
  ])("%s → %s", (userAgent, browser) => {
    const shown = describeSession({ id: "x", userAgent, ipAddress: "127.0.0.1" });
    expect(shown.browser).toBe(browser);
    // The raw header is not passed on to the page.
    expect("userAgent" in shown).toBe(false);
  });
});

// Address text forms from RFC 4291 §2.2 and §2.5.5.2 (IPv4-mapped IPv6 addresses, ::ffff:a.b.c.d);
// the example addresses are from the documentation ranges of RFC 5737 and RFC 3849.
describe("plainAddress", () => {
  it.each([
    ["::ffff:192.0.2.7", "192.0.2.7"],
    ["::FFFF:198.51.100.20", "198.51.100.20"],
    ["::ffff:127.0.0.2", "127.0.0.2"],
    ["192.0.2.7", "192.0.2.7"],
    ["2001:db8::1", "2001:db8::1"],
    ["::1", "::1"],
    // Not a mapped IPv4 address (the IPv4-compatible form, deprecated), so shown as it is.
    ["::192.0.2.7", "::192.0.2.7"],
    ["", null],
    [null, null],
  ])("%s → %s", (address, shown) => {
    expect(plainAddress(address)).toBe(shown);
  });
});

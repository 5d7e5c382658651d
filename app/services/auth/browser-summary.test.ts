import { describe, expect, it } from "vitest";
import { summarizeBrowser } from "./browser-summary";

// User-Agent strings in the shapes the browsers document for themselves (Mozilla's "User-Agent
// reference" on MDN lists the Firefox, Chrome, Edge and Safari forms); the version numbers are
// invented. Each pair is what the owner reads on the account page.
describe("summarizeBrowser", () => {
  it.each([
    ["Mozilla/5.0 (X11; Linux x86_64; rv:128.0) Gecko/20100101 Firefox/128.0", "Firefox on Linux"],
    [
      "Mozilla/5.0 (Windows NT 10.0; Win64; x64) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/126.0.0.0 Safari/537.36",
      "Chrome on Windows",
    ],
    [
      "Mozilla/5.0 (Windows NT 10.0; Win64; x64) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/126.0.0.0 Safari/537.36 Edg/126.0.0.0",
      "Edge on Windows",
    ],
    [
      "Mozilla/5.0 (Macintosh; Intel Mac OS X 10_15_7) AppleWebKit/605.1.15 (KHTML, like Gecko) Version/17.5 Safari/605.1.15",
      "Safari on macOS",
    ],
    [
      "Mozilla/5.0 (iPhone; CPU iPhone OS 17_5 like Mac OS X) AppleWebKit/605.1.15 (KHTML, like Gecko) Version/17.5 Mobile/15E148 Safari/604.1",
      "Safari on iOS",
    ],
    [
      "Mozilla/5.0 (Linux; Android 14; K) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/126.0.0.0 Mobile Safari/537.36",
      "Chrome on Android",
    ],
    ["curl/8.5.0", "curl"],
    ["node", "a Node.js script"],
    ["", "Unknown browser"],
    [null, "Unknown browser"],
    ["Something/1.0", "Unknown browser"],
  ])("%s → %s", (ua, expected) => {
    expect(summarizeBrowser(ua)).toBe(expected);
  });

  it("stays short whatever it is given", () => {
    expect(summarizeBrowser(`${"x".repeat(10_000)} Firefox/1 Linux`).length).toBeLessThan(40);
  });
});

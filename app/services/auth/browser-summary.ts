/**
 * A short, human summary of a User-Agent header ("Firefox on Linux") for the account page's list of
 * failed attempts: enough for the owner to tell "that was not me", without storing the whole string.
 * Order matters: Chromium-based browsers also say "Safari" and "Chrome", so the specific names go first.
 */
const BROWSERS: [RegExp, string][] = [
  [/\bEdg(e|A|iOS)?\//, "Edge"],
  [/\bOPR\/|\bOpera\b/, "Opera"],
  [/\bSamsungBrowser\//, "Samsung Internet"],
  [/\bFirefox\/|\bFxiOS\//, "Firefox"],
  [/\bHeadlessChrome\//, "Headless Chrome"],
  [/\bChrome\/|\bCriOS\/|\bChromium\//, "Chrome"],
  [/\bVersion\/[\d.]+.*\bSafari\//, "Safari"],
  [/\bcurl\//i, "curl"],
  [/\bpython-requests\/|\bpython-urllib|\baiohttp\//i, "a Python script"],
  [/\bnode\b|\bundici\b|\baxios\//i, "a Node.js script"],
];

const SYSTEMS: [RegExp, string][] = [
  [/\bAndroid\b/, "Android"],
  [/\biPhone\b|\biPad\b|\biPod\b/, "iOS"],
  [/\bCrOS\b/, "ChromeOS"],
  [/\bWindows\b/, "Windows"],
  [/\bMac OS X\b|\bMacintosh\b/, "macOS"],
  [/\bLinux\b|\bX11\b/, "Linux"],
];

export function summarizeBrowser(userAgent: string | null | undefined): string {
  const ua = (userAgent ?? "").slice(0, 512);
  if (!ua.trim()) return "Unknown browser";
  const browser = BROWSERS.find(([pattern]) => pattern.test(ua))?.[1];
  const system = SYSTEMS.find(([pattern]) => pattern.test(ua))?.[1];
  if (browser && system) return `${browser} on ${system}`;
  if (browser) return browser;
  if (system) return `A browser on ${system}`;
  return "Unknown browser";
}

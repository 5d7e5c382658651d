const BASE = "https://torqueleaf.invalid";

/**
 * Where to send someone after sign-in: only a path on this site. Refuses absolute URLs,
 * protocol-relative `//host`, `/\host` (browsers read a backslash as a slash) and `javascript:`,
 * and returns the path as the URL parser reads it, so the Location header is what was checked.
 */
export function safeRedirect(target: unknown, fallback = "/"): string {
  if (typeof target !== "string" || target.length === 0 || target.length > 2048) return fallback;
  if (!target.startsWith("/") || target.startsWith("//") || target.includes("\\")) return fallback;
  // Tabs and newlines are dropped by URL parsers, which can turn "/\t/host" into "//host".
  if ([...target].some((c) => c.charCodeAt(0) < 0x20 || c.charCodeAt(0) === 0x7f)) return fallback;
  let url: URL;
  try {
    url = new URL(target, BASE);
  } catch {
    return fallback;
  }
  if (url.origin !== BASE) return fallback;
  const path = `${url.pathname}${url.search}${url.hash}`;
  return path.startsWith("//") ? fallback : path;
}

/**
 * Results keep full precision; only the words shown to people are rounded,
 * and trailing zeros are dropped so "15 A" does not read as "15.00 A".
 */
export function num(value: number, digits = 2): string {
  return String(Number(value.toFixed(digits)));
}

/** Text and attribute values in SVG come from authors, so escape all five XML specials. */
export function escapeXml(text: string): string {
  return text.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;").replace(/'/g, "&#39;");
}

/** Stable per input, so server and client render the same ids. */
export function hashId(text: string): string {
  let hash = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    hash ^= text.charCodeAt(i);
    hash = Math.imul(hash, 0x01000193);
  }
  return (hash >>> 0).toString(36);
}

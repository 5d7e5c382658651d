import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { describe, expect, it } from "vitest";
import { SIGNAL_PRINT, SIGNAL_STYLE } from "./callouts";

/**
 * WCAG 2.2, relative luminance (definition in §"Key terms"): each sRGB channel c = value / 255 is
 * linearised as c / 12.92 when c <= 0.04045, else ((c + 0.055) / 1.055) ^ 2.4; then
 * L = 0.2126 R + 0.7152 G + 0.0722 B.
 */
function relativeLuminance(hex: string): number {
  const [r, g, b] = [1, 3, 5].map((i) => Number.parseInt(hex.slice(i, i + 2), 16) / 255);
  const linear = (c: number) => (c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4);
  return 0.2126 * linear(r) + 0.7152 * linear(g) + 0.0722 * linear(b);
}

/** WCAG 2.2, contrast ratio: (L1 + 0.05) / (L2 + 0.05), L1 the lighter of the two. */
function contrastRatio(a: string, b: string): number {
  const [light, dark] = [relativeLuminance(a), relativeLuminance(b)].sort((x, y) => y - x);
  return (light + 0.05) / (dark + 0.05);
}

/** WCAG 2.2 §1.4.3 Contrast (Minimum), level AA: 4.5:1 for text (the labels are 14 px bold, not large text). */
const AA_TEXT = 4.5;

// The colour values the page really uses: the app's theme first, then Tailwind's own (black, white).
const appCss = readFileSync(new URL("../app.css", import.meta.url), "utf8");
const tailwindTheme = readFileSync(createRequire(import.meta.url).resolve("tailwindcss/theme.css"), "utf8");

function colourOf(token: string): string {
  for (const css of [appCss, tailwindTheme]) {
    const found = new RegExp(`--color-${token.replace(/[-]/g, "\\-")}:\\s*(#[0-9a-fA-F]{3,6})\\s*;`).exec(css);
    if (found) {
      const hex = found[1];
      return hex.length === 4 ? `#${[...hex.slice(1)].map((c) => c + c).join("")}` : hex.toLowerCase();
    }
  }
  throw new Error(`no hex value for --color-${token} in app.css or Tailwind's theme`);
}

/** The colour token of the first class with this prefix (`bg-`, `text-`, `print:text-`…) in a class list. */
function tokenOf(classes: string, prefix: string): string {
  const found = classes.split(/\s+/).find((c) => c.startsWith(prefix));
  if (!found) throw new Error(`no ${prefix} class in "${classes}"`);
  return found.slice(prefix.length);
}

describe("the contrast ratio itself", () => {
  it("spans 1:1 to 21:1 as WCAG 2.2 defines it", () => {
    expect(contrastRatio("#000000", "#ffffff")).toBeCloseTo(21, 5);
    expect(contrastRatio("#ffffff", "#ffffff")).toBeCloseTo(1, 5);
    // #767676 on white is the palest grey that passes 4.5:1, at 4.54:1 (from memory, widely quoted).
    expect(contrastRatio("#767676", "#ffffff")).toBeCloseTo(4.54, 2);
  });

  it("finds the fault the signal bars had: white on the Z535 orange is 3.78:1", () => {
    expect(contrastRatio("#ffffff", colourOf("z-warning"))).toBeCloseTo(3.78, 2);
  });
});

describe("ANSI Z535.6 signal-word labels", () => {
  it("has the four signal words in their Z535 colours", () => {
    expect(Object.keys(SIGNAL_STYLE).sort()).toEqual(["CAUTION", "DANGER", "NOTICE", "WARNING"]);
    expect(tokenOf(SIGNAL_STYLE.DANGER.bar, "bg-")).toBe("z-danger");
    expect(tokenOf(SIGNAL_STYLE.WARNING.bar, "bg-")).toBe("z-warning");
    expect(tokenOf(SIGNAL_STYLE.CAUTION.bar, "bg-")).toBe("z-caution");
    expect(tokenOf(SIGNAL_STYLE.NOTICE.bar, "bg-")).toBe("z-notice");
  });

  for (const [word, style] of Object.entries(SIGNAL_STYLE)) {
    it(`${word}: text on its colour reaches 4.5:1 on screen`, () => {
      const background = colourOf(tokenOf(style.bar, "bg-"));
      const text = colourOf(tokenOf(style.bar, "text-"));
      expect(contrastRatio(text, background)).toBeGreaterThanOrEqual(AA_TEXT);
    });

    it(`${word}: on paper with backgrounds off it is dark text on white, framed in its colour`, () => {
      expect(SIGNAL_PRINT).toContain("print:bg-transparent");
      const printed = colourOf(tokenOf(SIGNAL_PRINT, "print:text-"));
      expect(contrastRatio(printed, "#ffffff")).toBeGreaterThanOrEqual(AA_TEXT);
      // The rule under the word keeps the signal colour, so the colour meaning survives on paper.
      expect(SIGNAL_PRINT).toMatch(/print:border-b-\d/);
      expect(tokenOf(style.print, "print:border-")).toBe(tokenOf(style.bar, "bg-"));
    });
  }
});

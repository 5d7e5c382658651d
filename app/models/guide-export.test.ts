import { unit } from "mathjs";
import { describe, expect, it } from "vitest";
import { bodyMarkdown, calloutMarkdown } from "./guide-export.server";

describe("step text as Markdown", () => {
  it("keeps the structure and prints the author's characters as written", () => {
    const lines = bodyMarkdown({
      type: "doc",
      content: [
        { type: "heading", attrs: { level: 2 }, content: [{ type: "text", text: "Before you start" }] },
        {
          type: "paragraph",
          content: [
            { type: "text", text: "Use " },
            { type: "text", text: "12 AWG", marks: [{ type: "bold" }] },
            { type: "text", text: " wire *not* 14_AWG, see " },
            { type: "text", text: "the kit sheet", marks: [{ type: "link", attrs: { href: "https://parts.example/kit" } }] },
          ],
        },
        {
          type: "orderedList",
          attrs: { start: 3 },
          content: [
            { type: "listItem", content: [{ type: "paragraph", content: [{ type: "text", text: "Loosen the clamp" }] }] },
          ],
        },
      ],
    });
    // CommonMark 0.31: ATX headings (§4.2), strong emphasis (§6.2), backslash escapes (§2.4), links (§6.3), ordered list start (§5.2).
    expect(lines).toEqual([
      "##### Before you start",
      "Use **12 AWG** wire \\*not\\* 14\\_AWG, see [the kit sheet](<https://parts.example/kit>)",
      "3. Loosen the clamp",
    ]);
  });
});

describe("callouts as Markdown", () => {
  it("prints a torque in N·m, lbf·ft and lbf·in, agreeing with mathjs", () => {
    const text = calloutMarkdown({
      kind: "torque",
      fastener: "Bracket bolt",
      value: 30,
      unit: "lbf·ft",
      valueSource: "vehicle-maker",
    }).join("\n");
    // mathjs's lbf and ft are the exact definitions (NIST SP 811, App. B).
    const nm = unit(30, "lbf ft").toNumber("N m");
    const lbfIn = unit(30, "lbf ft").toNumber("lbf in");
    expect(text).toContain(`${Number(nm.toFixed(1))} N·m · 30 lbf·ft · ${Number(lbfIn.toFixed(1))} lbf·in`);
    expect(text).toContain("Source: the vehicle maker's service manual.");
  });

  it("labels an estimate as one, with the caution that the maker's value governs", () => {
    const text = calloutMarkdown({
      kind: "torque",
      fastener: "Gusset nut",
      size: "M8",
      propertyClass: "8.8",
      estimate: true,
    }).join("\n");
    expect(text).toMatch(/Estimate: [\d.]+ N·m/);
    expect(text).toMatch(/maker's value governs/);
  });

  it("keeps a caution's signal word and defers electrical work to the maker and local codes", () => {
    expect(calloutMarkdown({ kind: "caution", signalWord: "DANGER", text: "High-voltage cables run here." })).toEqual([
      "> **DANGER**",
      ">",
      "> High-voltage cables run here.",
    ]);
    const circuit = calloutMarkdown({
      kind: "circuit",
      systemVoltage: 12,
      loadWatts: 60,
      continuous: true,
      oneWayLengthM: 3,
      returnPath: "wire",
      location: "cabin",
      insulationC: 105,
      bundled: 1,
      dropLimitPct: 3,
      conductorTempC: 20,
      switchRatingA: 10,
      feed: "fuse-box",
    }).join("\n");
    expect(circuit).toContain("Fuse not chosen");
    expect(circuit).toMatch(/vehicle maker's instructions, local codes and licensed practice/);
  });
});

import { describe, expect, it } from "vitest";
import { FitmentMatrixEditor } from "./fitment-matrix";
import { NOTE_REQUIRED, type FitmentValue } from "./fitment-state";
import { catalogueForTests, hasFlag, noop, render, tagWithId, textOf, variantIdOf } from "./render-test-support";

const catalogue = catalogueForTests();
const id = (key: string) => variantIdOf(catalogue, key);
const renderMatrix = (value: FitmentValue[], errors: Record<string, string> = {}) =>
  render(FitmentMatrixEditor, { catalogue, value, onChange: noop, path: "fitment", errors });

describe("the fitment matrix", () => {
  it("opens on the first listed row's generation and lists every variant of it with its status", () => {
    const html = renderMatrix([
      { variantId: id("fjell-f3-gas-awd"), status: "fits", note: null },
      { variantId: id("fjell-f3-hybrid-awd"), status: "fits-with-changes", note: "Feed runs under the rear seat" },
    ]);
    const text = textOf(html);
    expect(text).toContain("Norvik Fjell F3 (2019–2025)");
    for (const name of ["2.0 gas FWD", "2.0 gas AWD", "2.0 hybrid AWD", "2.0 plug-in hybrid AWD"]) expect(text).toContain(name);
    expect(hasFlag(html, "field-fitment-0-status-fits", "checked")).toBe(true);
    expect(hasFlag(html, "field-fitment-1-status-fits-with-changes", "checked")).toBe(true);
    // A variant with no row is "not listed", under an id of its own until it gets a row.
    expect(hasFlag(html, `field-fitment-variant-${id("fjell-f3-gas-fwd")}-status-not-listed`, "checked")).toBe(true);
    expect(tagWithId(html, "field-fitment-1-note")).toContain('value="Feed runs under the rear seat"');
  });

  it("shows each variant's 12 V battery location and the runs it implies", () => {
    const text = textOf(renderMatrix([{ variantId: id("fjell-f3-hybrid-awd"), status: "fits" }]));
    // content-samples/catalogue.ts: the hybrid keeps its battery in the cargo area, 4.5 m from the firewall;
    // runs.ts (common practice): front 4.5 + 1.5 m, dash 4.5 m, rear beside the battery 1.2 m.
    expect(text).toContain(
      "12 V battery in the cargo area, 4.5 m to the firewall. Typical one-way run: front 6 m · dash 4.5 m · rear 1.2 m.",
    );
    expect(text).toContain("12 V battery in the engine bay, 1.1 m to the firewall.");
  });

  it("asks for the note of a 'fits with changes' row beside it", () => {
    const html = renderMatrix([{ variantId: id("fjell-f3-hybrid-awd"), status: "fits-with-changes", note: "" }]);
    const note = tagWithId(html, "field-fitment-0-note");
    expect(note).toContain('aria-invalid="true"');
    expect(note).toContain('aria-describedby="field-fitment-0-note-error"');
    expect(textOf(html)).toContain(`What has to change (required) ${NOTE_REQUIRED}`);
  });

  it("shows the server's message for a row's field", () => {
    const html = renderMatrix([{ variantId: id("fjell-f3-gas-awd"), status: "fits", note: "x".repeat(10) }], {
      "fitment.0.note": "Keep it under 500 characters",
    });
    expect(textOf(html)).toContain("Keep it under 500 characters");
    expect(tagWithId(html, "field-fitment-0-note")).toContain('aria-invalid="true"');
  });

  it("keeps rows of other generations in a summary with a remove button and their messages", () => {
    const html = renderMatrix(
      [
        { variantId: id("fjell-f3-gas-awd"), status: "fits" },
        { variantId: id("kestrel-k2-diesel-4wd"), status: "fits-with-changes", note: "" },
        { variantId: 4242, status: "does-not-fit" },
      ],
      { "fitment.2.variantId": "This variant is listed twice" },
    );
    const text = textOf(html);
    expect(text).toContain("Listed for other vehicles");
    expect(text).toContain("Calder Kestrel K2 2.8 diesel 4WD");
    expect(text).toContain(NOTE_REQUIRED);
    expect(text).toContain("Variant 4242 (Does not fit; no longer in the catalogue)");
    expect(text).toContain("This variant is listed twice");
    expect(html).toContain('aria-label="Remove Calder Kestrel K2 2.8 diesel 4WD from the fitment"');
    expect(tagWithId(html, "field-fitment-1")).toContain('tabindex="-1"');
  });

  it("starts with nothing picked for a new guide and says a row is needed", () => {
    const text = textOf(renderMatrix([]));
    expect(text).toContain("Choose a make");
    expect(text).toContain("a guide needs at least one fitment row");
  });
});

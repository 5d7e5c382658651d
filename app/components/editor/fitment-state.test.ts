import { describe, expect, it } from "vitest";
import { typicalRunLengthM } from "~/engine/runs";
import {
  changePick,
  choiceOf,
  fitmentNoteProblems,
  initialPick,
  NO_PICK,
  NOTE_REQUIRED,
  pickedGeneration,
  setFitmentNote,
  setFitmentStatus,
  typicalRuns,
  variantIndex,
  yearsWords,
} from "./fitment-state";
import { catalogueForTests, variantIdOf } from "./render-test-support";

const catalogue = catalogueForTests();
const hybrid = variantIdOf(catalogue, "fjell-f3-hybrid-awd");
const diesel = variantIdOf(catalogue, "kestrel-k2-diesel-4wd");

describe("a variant's fitment status", () => {
  it("keeps the note through every change of status", () => {
    let value = setFitmentStatus([], hybrid, "fits-with-changes").value;
    expect(value).toEqual([{ variantId: hybrid, status: "fits-with-changes", note: "" }]);
    value = setFitmentNote(value, hybrid, "Route the feed under the rear seat");
    value = setFitmentStatus(value, hybrid, "fits").value;
    value = setFitmentStatus(value, hybrid, "does-not-fit").value;
    expect(value).toEqual([{ variantId: hybrid, status: "does-not-fit", note: "Route the feed under the rear seat" }]);
  });

  it("takes the row out for 'not listed', hands its note back, and restores it when listed again", () => {
    const value = [
      { variantId: diesel, status: "fits" as const, note: null },
      { variantId: hybrid, status: "fits-with-changes" as const, note: "Longer feed" },
    ];
    const removed = setFitmentStatus(value, hybrid, "not-listed");
    expect(removed.value).toEqual([value[0]]);
    expect(removed.removedNote).toBe("Longer feed");
    expect(choiceOf(removed.value, hybrid)).toBe("not-listed");
    const again = setFitmentStatus(removed.value, hybrid, "fits-with-changes", removed.removedNote);
    expect(again.value[1]).toEqual({ variantId: hybrid, status: "fits-with-changes", note: "Longer feed" });
    expect(setFitmentStatus(value, 999, "not-listed").value).toEqual(value);
  });

  it("requires a note for 'fits with changes' only", () => {
    const value = [
      { variantId: diesel, status: "fits" as const, note: "" },
      { variantId: hybrid, status: "fits-with-changes" as const, note: "  " },
    ];
    expect(fitmentNoteProblems(value)).toEqual({ "fitment.1.note": NOTE_REQUIRED });
    expect(fitmentNoteProblems(setFitmentNote(value, hybrid, "Trim the liner"))).toEqual({});
  });
});

describe("picking make, model and generation", () => {
  it("opens on the generation of the first listed row", () => {
    expect(initialPick(catalogue, [{ variantId: diesel, status: "fits" }])).toEqual({
      make: "calder",
      model: "kestrel",
      generation: "k2",
    });
    expect(initialPick(catalogue, [])).toEqual(NO_PICK);
    expect(initialPick(catalogue, [{ variantId: 999, status: "fits" }])).toEqual(NO_PICK);
  });

  it("clears the levels under a change and takes a single choice at once", () => {
    // Each demo make has one model: choosing the make picks it; its two generations wait for a choice.
    const pick = changePick(catalogue, NO_PICK, "make", "norvik");
    expect(pick).toEqual({ make: "norvik", model: "fjell", generation: "" });
    const chosen = changePick(catalogue, pick, "generation", "f3");
    expect(pickedGeneration(catalogue, chosen)?.variants.map((v) => v.key)).toContain("fjell-f3-hybrid-awd");
    expect(changePick(catalogue, chosen, "make", "calder")).toEqual({ make: "calder", model: "kestrel", generation: "" });
  });

  it("writes an open-ended generation's years without an end", () => {
    expect(yearsWords({ firstYear: 2019, lastYear: 2025 })).toBe("2019–2025");
    expect(yearsWords({ firstYear: 2024, lastYear: null })).toBe("2024 on");
  });
});

describe("the run a variant implies", () => {
  it("is the engine's typical run for each place an accessory goes", () => {
    const placed = variantIndex(catalogue).get(hybrid);
    expect(placed?.variant.batteryLocation).toBe("cargo-area");
    const runs = typicalRuns(placed!.variant);
    expect(runs.map((r) => r.place)).toEqual(["front", "dash", "rear"]);
    for (const run of runs) expect(run.metres).toBe(typicalRunLengthM(placed!.variant, run.place));
    // runs.ts (common practice): a battery behind the cabin reaches the front through the body,
    // 4.5 m to the firewall + 1.5 m beyond it; a rear accessory beside a cargo-area battery is 1.2 m.
    expect(runs.find((r) => r.place === "front")?.metres).toBe(6);
    expect(runs.find((r) => r.place === "rear")?.metres).toBe(1.2);
  });
});

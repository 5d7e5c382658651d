import { describe, expect, it } from "vitest";
import { ACCESSORY_PLACES, typicalRunLengthM } from "./runs";

// The run lengths are planning defaults (common practice), so these tests check the relations a
// reader relies on rather than any published figure.
describe("typicalRunLengthM", () => {
  const engineBay = { batteryLocation: "engine-bay" as const, batteryRunM: 1.1 };
  const cargo = { batteryLocation: "cargo-area" as const, batteryRunM: 4.5 };

  it("gives a front accessory a far longer run when the battery is in the cargo area", () => {
    expect(typicalRunLengthM(cargo, "front")).toBeGreaterThan(3 * typicalRunLengthM(engineBay, "front"));
  });

  it("gives a rear accessory a short run when the battery is in the cargo area", () => {
    expect(typicalRunLengthM(cargo, "rear")).toBeLessThan(typicalRunLengthM(engineBay, "rear"));
  });

  it("never returns a run shorter than the battery-to-firewall length for a dash load behind the firewall", () => {
    for (const v of [engineBay, cargo, { batteryLocation: "under-seat" as const, batteryRunM: 2.8 }]) {
      expect(typicalRunLengthM(v, "dash")).toBeGreaterThanOrEqual(v.batteryRunM);
    }
  });

  it("is positive and rounded to 0.1 m for every place", () => {
    for (const place of ACCESSORY_PLACES) {
      const m = typicalRunLengthM(engineBay, place);
      expect(m).toBeGreaterThan(0);
      expect(Math.round(m * 10) / 10).toBe(m);
    }
  });
});

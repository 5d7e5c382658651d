import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { AWG_SIZES, MM2_SIZES, checkCircuit, circuitInputSchema, type CircuitInput, type CircuitInputRaw } from "./circuit";

// The properties follow from the method in engine.md §1 (ASTM B258 / IEC 60228 resistance,
// 33 CFR 183.425 ampacity, NEC 210.20(A) fuse margin); none needs a published value.

const arbitraryInput = fc
  .record({
    systemVoltage: fc.constantFrom(12 as const, 24 as const),
    load: fc.oneof(
      fc.record({ loadAmps: fc.double({ min: 0.1, max: 120, noNaN: true }) }),
      fc.record({ loadWatts: fc.double({ min: 1, max: 2000, noNaN: true }) }),
    ),
    continuous: fc.boolean(),
    oneWayLengthM: fc.double({ min: 0.1, max: 30, noNaN: true }),
    returnPath: fc.constantFrom("wire" as const, "chassis" as const),
    location: fc.constantFrom("engine-bay" as const, "cabin" as const),
    insulationC: fc.constantFrom(60 as const, 90 as const, 105 as const, 125 as const),
    bundled: fc.integer({ min: 1, max: 30 }),
    dropLimitPct: fc.double({ min: 0.5, max: 15, noNaN: true }),
    conductorTempC: fc.double({ min: -30, max: 120, noNaN: true }),
  })
  .map(({ load, ...rest }): CircuitInput => circuitInputSchema.parse({ ...rest, ...load } satisfies CircuitInputRaw));

/** Thicker is larger; "none fits" sorts after every real size. */
const awgRank = (awg: number | null) => (awg === null ? AWG_SIZES.length : AWG_SIZES.indexOf(awg as (typeof AWG_SIZES)[number]));
const mm2Rank = (mm2: number | null) => (mm2 === null ? MM2_SIZES.length : MM2_SIZES.indexOf(mm2 as (typeof MM2_SIZES)[number]));

describe("circuit properties", () => {
  it("never needs a thinner wire for a longer run", () => {
    fc.assert(
      fc.property(arbitraryInput, fc.double({ min: 1, max: 5, noNaN: true }), (input, stretch) => {
        const short = checkCircuit(input).minWire;
        const long = checkCircuit({ ...input, oneWayLengthM: input.oneWayLengthM * stretch }).minWire;
        expect(awgRank(long.awg)).toBeGreaterThanOrEqual(awgRank(short.awg));
        expect(mm2Rank(long.mm2)).toBeGreaterThanOrEqual(mm2Rank(short.mm2));
      }),
    );
  });

  it("never recommends a fuse below the current, nor below 125 % for continuous loads", () => {
    fc.assert(
      fc.property(arbitraryInput, (input) => {
        const result = checkCircuit(input);
        if (result.recommendedFuseA === null) {
          expect(result.fuseFactor * result.currentA).toBeGreaterThan(100);
          return;
        }
        expect(result.recommendedFuseA).toBeGreaterThanOrEqual(result.currentA);
        if (input.continuous) expect(result.recommendedFuseA).toBeGreaterThanOrEqual(1.25 * result.currentA);
      }),
    );
  });

  it("gives the minimum wire an ampacity no lower than the recommended fuse", () => {
    fc.assert(
      fc.property(arbitraryInput, (input) => {
        const result = checkCircuit(input);
        for (const wire of [
          result.minWire.awg === null ? null : { awg: result.minWire.awg },
          result.minWire.mm2 === null ? null : { mm2: result.minWire.mm2 },
        ]) {
          if (wire === null) continue;
          const chosen = checkCircuit({ ...input, wire }).chosen;
          expect(result.recommendedFuseA).not.toBeNull();
          expect(chosen?.ampacityA).toBeGreaterThanOrEqual(result.recommendedFuseA ?? Number.POSITIVE_INFINITY);
          expect(chosen?.dropPct).toBeLessThanOrEqual(input.dropLimitPct);
        }
      }),
    );
  });

  it("scales the drop linearly with length and with current", () => {
    fc.assert(
      fc.property(
        arbitraryInput,
        fc.constantFrom(...AWG_SIZES),
        fc.double({ min: 0.1, max: 3, noNaN: true }),
        (input, awg, k) => {
          const atAmps = { ...input, loadWatts: undefined, loadAmps: checkCircuit(input).currentA, wire: { awg } };
          const base = checkCircuit(atAmps).chosen?.dropV ?? Number.NaN;
          const longer = checkCircuit({ ...atAmps, oneWayLengthM: atAmps.oneWayLengthM * k }).chosen?.dropV;
          const heavier = checkCircuit({ ...atAmps, loadAmps: atAmps.loadAmps * k }).chosen?.dropV;
          expect(longer).toBeCloseTo(base * k, 9);
          expect(heavier).toBeCloseTo(base * k, 9);
        },
      ),
    );
  });
});

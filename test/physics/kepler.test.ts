import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { AU, InputError, M_SUN } from "@chirpsieve/core";
import { G } from "../../packages/core/src/physics/constants.js";
import { gwFrequencyFromOrbitalFrequency, gwFrequencyFromSeparation, orbitalFrequencyFromGwFrequency, orbitalPeriodFromSeparation, separationFromGwFrequency, separationFromOrbitalPeriod } from "../../packages/core/src/physics/kepler.js";

describe("Kepler's third law", () => {
  it("P² = 4π² a³ / (G M)", () => {
    const a = 3e9, m = 5 * M_SUN;
    const p = orbitalPeriodFromSeparation(a, m);
    expect((p * p * G * m) / (4 * Math.PI * Math.PI * a ** 3)).toBeCloseTo(1, 12);
  });

  it("round-trips separation ↔ period and separation ↔ GW frequency", () => {
    fc.assert(
      fc.property(fc.double({ min: 1e4, max: 1e15, noNaN: true }), fc.double({ min: 0.1, max: 1e3, noNaN: true }), (a, mSolar) => {
        const m = mSolar * M_SUN;
        expect(separationFromOrbitalPeriod(orbitalPeriodFromSeparation(a, m), m) / a).toBeCloseTo(1, 12);
        expect(separationFromGwFrequency(gwFrequencyFromSeparation(a, m), m) / a).toBeCloseTo(1, 12);
        // f_gw = 2 / P for a circular orbit
        expect(gwFrequencyFromSeparation(a, m) * orbitalPeriodFromSeparation(a, m)).toBeCloseTo(2, 12);
      }),
      { seed: 1913, numRuns: 200 },
    );
  });

  it("GW frequency is twice the orbital frequency", () => {
    expect(gwFrequencyFromOrbitalFrequency(5)).toBe(10);
    expect(orbitalFrequencyFromGwFrequency(10)).toBe(5);
  });

  it("rejects bad input with InputError naming the parameter", () => {
    expect(() => orbitalPeriodFromSeparation(-AU, M_SUN)).toThrow(/orbitalPeriodFromSeparation: separation \(m\) must be a positive finite number/);
    expect(() => orbitalPeriodFromSeparation(AU, 0)).toThrow(/totalMass/);
    expect(() => separationFromOrbitalPeriod(NaN, M_SUN)).toThrow(/orbitalPeriod/);
    expect(() => separationFromGwFrequency(0, M_SUN)).toThrow(InputError);
    expect(() => gwFrequencyFromOrbitalFrequency(-1)).toThrow(/orbitalFrequency/);
    expect(() => orbitalFrequencyFromGwFrequency(Infinity)).toThrow(/gwFrequency/);
  });
});

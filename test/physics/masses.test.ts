import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { InputError, M_SUN, chirpMass } from "@chirpsieve/core";
import { componentMassesFromChirpMassAndMassRatio, componentMassesFromChirpMassAndSymmetricMassRatio, massRatio, symmetricMassRatio, totalMass } from "../../packages/core/src/physics/masses.js";

describe("mass combinations", () => {
  it("computes total mass, η, q and chirp mass of 1.4 + 1.4 and 10 + 1.4 M_sun", () => {
    expect(totalMass(1.4 * M_SUN, 1.4 * M_SUN)).toBeCloseTo(2.8 * M_SUN, -20);
    expect(symmetricMassRatio(1.4, 1.4)).toBe(0.25);
    expect(massRatio(1.4, 10)).toBeCloseTo(0.14, 15);
    expect(massRatio(10, 1.4)).toBeCloseTo(0.14, 15);
    // Mc = (m1 m2)^{3/5} / M^{1/5}, worked by hand: 1.4+1.4 → 1.2188; 10+1.4 → 2.9943 (solar masses).
    expect(chirpMass(1.4, 1.4)).toBeCloseTo(1.21877, 4);
    expect(chirpMass(10, 1.4)).toBeCloseTo(2.9943, 3);
    expect(symmetricMassRatio(10, 1.4)).toBeCloseTo(14 / 11.4 ** 2, 15);
  });

  it("chirp mass equals η^{3/5} M", () => {
    const m1 = 7.3, m2 = 2.1;
    expect(chirpMass(m1, m2)).toBeCloseTo(Math.pow(symmetricMassRatio(m1, m2), 0.6) * (m1 + m2), 12);
  });

  it("round-trips (m1, m2) → (Mc, q) → (m1, m2) and (m1, m2) → (Mc, η) → (m1, m2)", () => {
    fc.assert(
      fc.property(fc.double({ min: 0.1, max: 300, noNaN: true }), fc.double({ min: 0.1, max: 300, noNaN: true }), (a, b) => {
        const m1 = Math.max(a, b) * M_SUN;
        const m2 = Math.min(a, b) * M_SUN;
        const mc = chirpMass(m1, m2);
        const back = componentMassesFromChirpMassAndMassRatio(mc, m2 / m1);
        expect(back.m1 / m1).toBeCloseTo(1, 10);
        expect(back.m2 / m2).toBeCloseTo(1, 10);
        const viaEta = componentMassesFromChirpMassAndSymmetricMassRatio(mc, symmetricMassRatio(m1, m2));
        // η loses precision near equal masses (√(1 − 4η)); 1e-6 relative is ample there.
        expect(viaEta.m1 / m1).toBeCloseTo(1, 6);
        expect(viaEta.m2 / m2).toBeCloseTo(1, 6);
        expect(viaEta.m1).toBeGreaterThanOrEqual(viaEta.m2);
      }),
      { seed: 20240601, numRuns: 300 },
    );
  });

  it("takes η = 1/4 + rounding as equal masses", () => {
    const r = componentMassesFromChirpMassAndSymmetricMassRatio(1, 0.25 + 1e-17);
    expect(r.m1).toBe(r.m2);
  });

  it("rejects non-positive, non-finite masses and out-of-range q, η with InputError naming the parameter", () => {
    expect(() => chirpMass(-1, 1)).toThrow(InputError);
    expect(() => chirpMass(-1, 1)).toThrow(/chirpMass: m1 must be a positive finite number \(got -1\)/);
    expect(() => totalMass(1, 0)).toThrow(/m2/);
    expect(() => symmetricMassRatio(NaN, 1)).toThrow(/m1.*NaN/);
    expect(() => massRatio(1, Infinity)).toThrow(/m2.*Infinity/);
    expect(() => componentMassesFromChirpMassAndMassRatio(1, 1.5)).toThrow(/q must be in \(0, 1\]/);
    expect(() => componentMassesFromChirpMassAndMassRatio(1, 0)).toThrow(InputError);
    expect(() => componentMassesFromChirpMassAndMassRatio(0, 0.5)).toThrow(/chirpMass/);
    expect(() => componentMassesFromChirpMassAndSymmetricMassRatio(1, 0.26)).toThrow(/eta must be in \(0, 0.25\]/);
    expect(() => componentMassesFromChirpMassAndSymmetricMassRatio(1, -0.1)).toThrow(InputError);
  });
});

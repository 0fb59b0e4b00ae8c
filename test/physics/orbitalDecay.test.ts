import { describe, expect, it } from "vitest";
import { InputError, M_SUN, chirpMass } from "@chirpsieve/core";
import { frequencyDerivative, timeToCoalescenceFromGwFrequency } from "../../packages/core/src/physics/chirp.js";
import { C, G } from "../../packages/core/src/physics/constants.js";
import { gwFrequencyFromSeparation, orbitalPeriodFromSeparation } from "../../packages/core/src/physics/kepler.js";
import { eccentricityEnhancement, orbitalPeriodDerivative, separationDecayRate, timeToCoalescenceFromSeparation } from "../../packages/core/src/physics/orbitalDecay.js";

describe("orbital decay by GW emission", () => {
  const m1 = 10 * M_SUN, m2 = 1.4 * M_SUN, a = 1e6;

  it("da/dt = −(64/5) G³ m1 m2 M / (c⁵ a³)", () => {
    const expected = (-(64 / 5) * G ** 3 * m1 * m2 * (m1 + m2)) / (C ** 5 * a ** 3);
    expect(separationDecayRate(m1, m2, a) / expected).toBeCloseTo(1, 12);
  });

  it("coalescence time a / (4 |da/dt|) = (5/256) c⁵ a⁴ / (G³ m1 m2 M), scaling as a⁴", () => {
    const t = timeToCoalescenceFromSeparation(m1, m2, a);
    expect(t / (a / (4 * -separationDecayRate(m1, m2, a)))).toBeCloseTo(1, 12);
    expect(timeToCoalescenceFromSeparation(m1, m2, 2 * a) / t).toBeCloseTo(16, 10);
  });

  it("coalescence time from separation equals coalescence time from the GW frequency at that separation", () => {
    const f = gwFrequencyFromSeparation(a, m1 + m2);
    expect(timeToCoalescenceFromSeparation(m1, m2, a) / timeToCoalescenceFromGwFrequency(chirpMass(m1, m2), f)).toBeCloseTo(1, 10);
  });

  it("f(e) is 1 for a circle, grows with e, and is ≈ 11.85 at e = 0.6171", () => {
    expect(eccentricityEnhancement(0)).toBe(1);
    expect(eccentricityEnhancement(0.3)).toBeGreaterThan(eccentricityEnhancement(0.1));
    // Hand evaluation of (1 + 73/24 e² + 37/96 e⁴)/(1 − e²)^{7/2} at e = 0.6171.
    expect(eccentricityEnhancement(0.6171)).toBeCloseTo(11.853, 2);
  });

  it("circular Ṗb agrees with the chirp: Ṗb = −2 ḟ / f² (P = 2 / f)", () => {
    const p = orbitalPeriodFromSeparation(a, m1 + m2);
    const f = 2 / p;
    const fdot = frequencyDerivative(chirpMass(m1, m2), f);
    expect(orbitalPeriodDerivative(p, m1, m2) / ((-2 * fdot) / (f * f))).toBeCloseTo(1, 10);
    expect(orbitalPeriodDerivative(p, m1, m2, 0.5) / orbitalPeriodDerivative(p, m1, m2)).toBeCloseTo(eccentricityEnhancement(0.5), 12);
  });

  it("rejects bad input with InputError naming the parameter", () => {
    expect(() => eccentricityEnhancement(1)).toThrow(/eccentricityEnhancement: eccentricity must be in \[0, 1\) for a bound orbit \(got 1\)/);
    expect(() => eccentricityEnhancement(-0.1)).toThrow(InputError);
    expect(() => eccentricityEnhancement(NaN)).toThrow(/NaN/);
    expect(() => orbitalPeriodDerivative(1000, m1, m2, 1.2)).toThrow(/eccentricity/);
    expect(() => orbitalPeriodDerivative(0, m1, m2)).toThrow(/orbitalPeriod/);
    expect(() => separationDecayRate(m1, m2, 0)).toThrow(/separation/);
    expect(() => timeToCoalescenceFromSeparation(m1, -1, a)).toThrow(/m2/);
  });
});

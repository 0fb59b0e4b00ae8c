import { describe, expect, it } from "vitest";
import { AU, InputError, M_SUN, chirpMass } from "@chirpsieve/core";
import { frequencyDerivative } from "../../packages/core/src/physics/chirp.js";
import { C, G } from "../../packages/core/src/physics/constants.js";
import { gwFrequencyFromSeparation } from "../../packages/core/src/physics/kepler.js";
import { gwLuminosityCircular } from "../../packages/core/src/physics/luminosity.js";

describe("quadrupole GW luminosity of a circular binary", () => {
  it("L = (32/5)(G⁴/c⁵)(m1 m2)² M / a⁵, scaling as a^{-5}", () => {
    const m1 = 10 * M_SUN, m2 = 3 * M_SUN, a = 1e6;
    const l = gwLuminosityCircular(m1, m2, a);
    expect(l / (((32 / 5) * G ** 4 * (m1 * m2) ** 2 * (m1 + m2)) / (C ** 5 * a ** 5))).toBeCloseTo(1, 12);
    expect(gwLuminosityCircular(m1, m2, 2 * a) / l).toBeCloseTo(1 / 32, 12);
  });

  it("equals the chirp-mass form (32/5)(c⁵/G)(G Mc π f / c³)^{10/3}", () => {
    // Same power written with Mc and f_gw; Peters & Mathews 1963 with Kepler's law.
    const m1 = 1.4 * M_SUN, m2 = 1.3 * M_SUN, a = 5e5;
    const f = gwFrequencyFromSeparation(a, m1 + m2);
    const mc = chirpMass(m1, m2);
    const alt = ((32 / 5) * C ** 5) / G * ((G * mc * Math.PI * f) / C ** 3) ** (10 / 3);
    expect(gwLuminosityCircular(m1, m2, a) / alt).toBeCloseTo(1, 10);
  });

  it("balances the orbital energy loss: L = −dE/dt with E = −G m1 m2 / (2a)", () => {
    // dE/dt = (G m1 m2 / (2 a²)) da/dt and f grows as ḟ: check via a = (G M / (π f)²)^{1/3}, da/dt = −(2/3) a ḟ / f.
    const m1 = 30 * M_SUN, m2 = 25 * M_SUN, a = 2e6;
    const f = gwFrequencyFromSeparation(a, m1 + m2);
    const fdot = frequencyDerivative(chirpMass(m1, m2), f);
    const dadt = (-(2 / 3) * a * fdot) / f;
    const dEdt = ((G * m1 * m2) / (2 * a * a)) * dadt;
    expect(-dEdt / gwLuminosityCircular(m1, m2, a)).toBeCloseTo(1, 10);
  });

  it("rejects bad input with InputError naming the parameter", () => {
    expect(() => gwLuminosityCircular(M_SUN, M_SUN, -AU)).toThrow(/gwLuminosityCircular: separation \(m\)/);
    expect(() => gwLuminosityCircular(0, M_SUN, AU)).toThrow(/m1/);
    expect(() => gwLuminosityCircular(M_SUN, NaN, AU)).toThrow(InputError);
  });
});

// Checks of the physics core against the outside world. Each check names its source; values are
// also listed in the project's shared references table.
import { describe, expect, it } from "vitest";
import { AU, DAY, JULIAN_YEAR, M_SUN, chirpMass, describeBinary } from "@chirpsieve/core";
import { gwCycleCount, timeToCoalescenceFromGwFrequency } from "../../packages/core/src/physics/chirp.js";
import { C, G, GM_SUN } from "../../packages/core/src/physics/constants.js";
import { iscoGwFrequency } from "../../packages/core/src/physics/isco.js";
import { orbitalPeriodFromSeparation } from "../../packages/core/src/physics/kepler.js";
import { orbitalPeriodDerivative, timeToCoalescenceFromSeparation } from "../../packages/core/src/physics/orbitalDecay.js";

describe("constants", () => {
  it("carry their published values", () => {
    expect(G).toBe(6.6743e-11); // CODATA 2018
    expect(C).toBe(299_792_458); // SI definition of the metre
    expect(GM_SUN).toBe(1.3271244e20); // IAU 2015 Resolution B3 (nominal)
  });
});

describe("Kepler's third law with plain numbers", () => {
  it("Earth–Sun: 1 AU around 1 M_sun takes 365.25 d within 0.1%", () => {
    // Common practice, no source: the year is ~365.25 d (Earth's own mass neglected).
    const p = orbitalPeriodFromSeparation(AU, M_SUN) / DAY;
    expect(Math.abs(p / 365.25 - 1)).toBeLessThan(1e-3);
    // The same with nothing from the library but GM_sun: P = 2π √(a³/GM).
    expect(p).toBeCloseTo((2 * Math.PI * Math.sqrt(AU ** 3 / GM_SUN)) / DAY, 9);
  });
});

describe("two 1 M_sun stars 50 AU apart", () => {
  const d = describeBinary({ m1: M_SUN, m2: M_SUN, separation: 50 * AU });

  it("orbit in ≈ 250 yr and radiate with a GW period half of it", () => {
    // Kepler's third law, a worked example of the trade: P = 50^{3/2} / √2 yr ≈ 250 yr.
    expect(d.orbitalPeriod / JULIAN_YEAR).toBeCloseTo(250, 0);
    // Quadrupole formula: f_GW = 2 f_orb (common practice), so the GW period is 125 yr.
    expect(d.gwPeriod / d.orbitalPeriod).toBeCloseTo(0.5, 12);
    expect(d.gwPeriod / JULIAN_YEAR).toBeCloseTo(125, 0);
  });

  it("would take more than 1e12 yr (≈1e24 yr) to merge by GW emission alone", () => {
    // Peters, Phys. Rev. 136, B1224 (1964): t = (5/256) c⁵ a⁴ / (G³ m1 m2 M) ≈ 1e24 yr here.
    const t = timeToCoalescenceFromSeparation(M_SUN, M_SUN, 50 * AU) / JULIAN_YEAR;
    expect(t).toBeGreaterThan(1e12);
    expect(t).toBeGreaterThan(5e23);
    expect(t).toBeLessThan(2e24);
  });
});

describe("PSR B1913+16", () => {
  it("GR orbital decay Ṗb ≈ −2.40e-12 within 1%", () => {
    // Weisberg & Huang, ApJ 829, 55 (2016), GR prediction −2.40e-12 (from memory, tolerance 1%);
    // Pb = 0.322997 d, e = 0.6171, m_p = 1.438, m_c = 1.390 M_sun; Peters & Mathews 1963 f(e).
    const pbdot = orbitalPeriodDerivative(0.322997 * DAY, 1.438 * M_SUN, 1.39 * M_SUN, 0.6171);
    expect(Math.abs(pbdot / -2.4e-12 - 1)).toBeLessThan(0.01);
  });
});

describe("a 30 M_sun chirp mass from 35 Hz", () => {
  it("coalesces in ≈ 0.17 s at Newtonian order (within 10%)", () => {
    // Abbott et al., Phys. Rev. Lett. 116, 061102 (2016): ~0.2 s from 35 Hz to merger (from memory, tol 10%).
    const tau = timeToCoalescenceFromGwFrequency(30 * M_SUN, 35);
    expect(Math.abs(tau / 0.17 - 1)).toBeLessThan(0.1);
  });
});

describe("Newtonian GW cycles from 10 Hz to the ISCO", () => {
  // Blanchet, Living Rev. Relativ. 17, 2 (2014), table of cycle counts (from memory, tolerance 0.5%).
  it.each([
    [1.4, 1.4, 16031],
    [10, 1.4, 3576],
    [10, 10, 601],
  ])("%s + %s M_sun: ≈ %i cycles", (a, b, expected) => {
    const m1 = a * M_SUN, m2 = b * M_SUN;
    const n = gwCycleCount(chirpMass(m1, m2), 10, iscoGwFrequency(m1 + m2));
    expect(Math.abs(n / expected - 1)).toBeLessThan(0.005);
  });
});

describe("ISCO GW frequency", () => {
  it("of M = 2.8 M_sun is ≈ 1570 Hz within 0.5%", () => {
    // Schwarzschild ISCO, f = c³ / (6^{3/2} π G M); common practice, no source.
    expect(Math.abs(iscoGwFrequency(2.8 * M_SUN) / 1570 - 1)).toBeLessThan(0.005);
  });
});

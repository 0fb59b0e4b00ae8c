import { describe, expect, it } from "vitest";
import { InputError, M_SUN, chirpMass } from "@chirpsieve/core";
import { C, G, MPC } from "../../packages/core/src/physics/constants.js";
import { strainAmplitude, strainPolarisations } from "../../packages/core/src/physics/quadrupole.js";

describe("quadrupole strain amplitude", () => {
  it("h0 = 4 (G Mc)^{5/3} (π f)^{2/3} / (c⁴ D) and scales as Mc^{5/3} f^{2/3} / D", () => {
    const mc = chirpMass(1.4 * M_SUN, 1.4 * M_SUN);
    const h = strainAmplitude(mc, 100, 100 * MPC);
    expect(h / ((4 * (G * mc) ** (5 / 3) * (Math.PI * 100) ** (2 / 3)) / (C ** 4 * 100 * MPC))).toBeCloseTo(1, 12);
    expect(strainAmplitude(mc, 100, 200 * MPC) / h).toBeCloseTo(0.5, 12);
    expect(strainAmplitude(mc, 800, 100 * MPC) / h).toBeCloseTo(4, 12);
    expect(strainAmplitude(8 * mc, 100, 100 * MPC) / h).toBeCloseTo(32, 10);
    // Order of magnitude of a 1.4+1.4 binary at 100 Hz and 100 Mpc: between 1e-23 and 1e-22
    // (common practice, no source; the formula gives ≈ 3.6e-23).
    expect(h).toBeGreaterThan(1e-23);
    expect(h).toBeLessThan(1e-22);
  });

  it("h+ = h0 (1 + cos²ι)/2 and h× = h0 cos ι: face-on both h0, edge-on h+ = h0/2, h× = 0", () => {
    expect(strainPolarisations(2, 0)).toEqual({ plus: 2, cross: 2 });
    const edge = strainPolarisations(2, Math.PI / 2);
    expect(edge.plus).toBeCloseTo(1, 15);
    expect(edge.cross).toBeCloseTo(0, 15);
    const p = strainPolarisations(1, Math.PI / 3);
    expect(p.plus).toBeCloseTo(0.625, 15);
    expect(p.cross).toBeCloseTo(0.5, 15);
  });

  it("rejects bad input with InputError naming the parameter", () => {
    expect(() => strainAmplitude(M_SUN, 100, 0)).toThrow(/strainAmplitude: distance \(m\) must be a positive finite number \(got 0\)/);
    expect(() => strainAmplitude(-M_SUN, 100, MPC)).toThrow(/chirpMass/);
    expect(() => strainAmplitude(M_SUN, NaN, MPC)).toThrow(/gwFrequency/);
    expect(() => strainPolarisations(1e-21, NaN)).toThrow(/inclination/);
    expect(() => strainPolarisations(0, 0)).toThrow(InputError);
  });
});

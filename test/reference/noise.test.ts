// Outside-world checks of the noise layer: published noise fits and what they imply.
import { describe, expect, it } from "vitest";
import { ajith2011, dis2001, FINN_CHERNOFF_RANGE_FACTOR, horizonDistance, medianBiasFactor } from "@chirpsieve/core";

describe("horizon distances of a 1.4+1.4 M_sun binary at SNR 8 (optimal orientation)", () => {
  it("is ≈31 Mpc for the first-generation fit above 40 Hz", () => {
    // Damour, Iyer & Sathyaprakash, Phys. Rev. D 63, 044023 (2001); ≈31 Mpc from memory
    // (shared/references.md), tolerance 10%. Computed: 31.2 Mpc.
    const r = horizonDistance({ massSolar1: 1.4, massSolar2: 1.4, psd: dis2001, fLowHz: 40 });
    expect(Math.abs(r.horizonMpc / 31 - 1)).toBeLessThan(0.1);
    // ISCO GW frequency of 2.8 M_sun ≈ 1570 Hz (Schwarzschild ISCO; common practice).
    expect(Math.abs(r.fIscoHz / 1570 - 1)).toBeLessThan(0.002);
  });

  it("is ≈500 Mpc for the second-generation design fit from 10 Hz", () => {
    // Ajith, Phys. Rev. D 84, 084037 (2011); ≈500 Mpc from memory (shared/references.md),
    // tolerance 10%. Computed: 498 Mpc.
    const r = horizonDistance({ massSolar1: 1.4, massSolar2: 1.4, psd: ajith2011, fLowHz: 10 });
    expect(Math.abs(r.horizonMpc / 500 - 1)).toBeLessThan(0.1);
    // Finn & Chernoff, Phys. Rev. D 47, 2198 (1993): averaged range = horizon / 2.264.
    expect(FINN_CHERNOFF_RANGE_FACTOR).toBe(2.264);
    expect(r.rangeMpc).toBeCloseTo(r.horizonMpc / 2.264, 10);
  });
});

describe("median bias factor", () => {
  it("is Σ_{l=1..K}(−1)^{l+1}/l for odd K, tending to ln 2", () => {
    // Allen et al., Phys. Rev. D 85, 122006 (2012), appendix (from memory).
    expect(medianBiasFactor(7)).toBeCloseTo(1 - 1 / 2 + 1 / 3 - 1 / 4 + 1 / 5 - 1 / 6 + 1 / 7, 15);
    expect(Math.abs(medianBiasFactor(10001) - Math.LN2)).toBeLessThan(1e-4);
  });
});

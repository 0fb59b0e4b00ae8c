// Outside-world checks of the noise layer: published noise fits and what they imply.
import { describe, expect, it } from "vitest";
import { ajith2011, horizonDistance } from "@chirpsieve/core";
import { FINN_CHERNOFF_RANGE_FACTOR } from "../../packages/core/src/noise/horizon.js";
import { dis2001 } from "../../packages/core/src/noise/psdModel.js";
import { medianBiasFactor } from "../../packages/core/src/noise/welch.js";

describe("analytic noise curves, point by point against the published fits", () => {
  const freqs = [40, 55.5, 100, 150, 215, 300, 430, 1000, 2048];
  const rel = (a: number, b: number): number => Math.abs(a / b - 1);

  it("first-generation fit: S_n = 9e-46 [(4.49x)^−56 + 0.16 x^−4.52 + 0.52 + 0.32 x²], x = f/150 Hz", () => {
    // Damour, Iyer & Sathyaprakash, Phys. Rev. D 63, 044023 (2001) (from memory), evaluated here
    // term by term through exp and log.
    const fit = (f: number): number => {
      const lx = Math.log(f / 150);
      return 9e-46 * (Math.exp(-56 * (Math.log(4.49) + lx)) + 0.16 * Math.exp(-4.52 * lx) + 0.52 + 0.32 * Math.exp(2 * lx));
    };
    for (const f of freqs) expect(rel(dis2001.evaluate(f), fit(f))).toBeLessThan(1e-12);
    // By hand at x = 1: 9e-46 (0.16 + 0.52 + 0.32) = 9e-46 (the (4.49)^−56 term is 3e-37).
    expect(rel(dis2001.evaluate(150), 9e-46)).toBeLessThan(1e-12);
    expect(dis2001.fMinHz).toBe(40);
  });

  it("second-generation fit: S_n = 1e-49 [x^−4.14 − 5x^−2 + 111 (1 − x² + x⁴/2)/(1 + x²/2)], x = f/215 Hz", () => {
    // Ajith, Phys. Rev. D 84, 084037 (2011) (from memory), evaluated here term by term.
    const fit = (f: number): number => {
      const x = f / 215;
      return 1e-49 * (Math.exp(-4.14 * Math.log(x)) - 5 * x ** -2 + (111 * (1 - x ** 2 + x ** 4 / 2)) / (1 + x ** 2 / 2));
    };
    for (const f of [10, 20, ...freqs]) expect(rel(ajith2011.evaluate(f), fit(f))).toBeLessThan(1e-12);
    // By hand at x = 1: 1e-49 (1 − 5 + 111 · 0.5 / 1.5) = 3.3e-48.
    expect(rel(ajith2011.evaluate(215), 3.3e-48)).toBeLessThan(1e-12);
    expect(ajith2011.fMinHz).toBe(10);
  });
});

describe("horizon distances of a 1.4+1.4 M_sun binary at SNR 8 (optimal orientation)", () => {
  it("is ≈31 Mpc for the first-generation fit above 40 Hz", () => {
    // Damour, Iyer & Sathyaprakash, Phys. Rev. D 63, 044023 (2001); ≈31 Mpc from memory,
    // tolerance 10%. Computed: 31.2 Mpc.
    const r = horizonDistance({ massSolar1: 1.4, massSolar2: 1.4, psd: dis2001, fMinHz: 40 });
    expect(Math.abs(r.horizonMpc / 31 - 1)).toBeLessThan(0.1);
    // ISCO GW frequency of 2.8 M_sun ≈ 1570 Hz (Schwarzschild ISCO; common practice).
    expect(Math.abs(r.fIscoHz / 1570 - 1)).toBeLessThan(0.002);
  });

  it("is ≈500 Mpc for the second-generation design fit from 10 Hz", () => {
    // Ajith, Phys. Rev. D 84, 084037 (2011); ≈500 Mpc from memory, tolerance 10%. Computed: 498 Mpc.
    const r = horizonDistance({ massSolar1: 1.4, massSolar2: 1.4, psd: ajith2011, fMinHz: 10 });
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

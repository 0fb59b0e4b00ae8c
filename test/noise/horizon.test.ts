import { describe, expect, it } from "vitest";
import { ajith2011, horizonDistance } from "@chirpsieve/core";
import { FINN_CHERNOFF_RANGE_FACTOR } from "../../packages/core/src/noise/horizon.js";
import { interpolatePsd } from "../../packages/core/src/noise/interpolatePsd.js";
import { flatPsd } from "../../packages/core/src/noise/psdModel.js";
import { C, GM_SUN, MPC } from "../../packages/core/src/physics/constants.js";

describe("horizonDistance", () => {
  it("matches the closed form for a flat PSD to 1e-6 (integration accuracy)", () => {
    // For S = S0: ∫ f^{−7/3} df = (3/4)(a^{−4/3} − b^{−4/3}); D = 2√(A² ∫/S0)/ρ with
    // A² = (5/24) π^{−4/3} (G𝓜)^{5/3} / c³ (the amplitude in horizon.ts's doc comment).
    const s0 = 1e-46;
    const r = horizonDistance({ massSolar1: 10, massSolar2: 1.4, psd: flatPsd(s0), fMinHz: 20, snr: 10 });
    const mc = Math.pow(10 * 1.4, 0.6) / Math.pow(11.4, 0.2);
    const a2 = ((5 / 24) * Math.pow(Math.PI, -4 / 3) * Math.pow(GM_SUN * mc, 5 / 3)) / C ** 3;
    const integral = 0.75 * (Math.pow(20, -4 / 3) - Math.pow(r.fIscoHz, -4 / 3));
    const expected = (2 * Math.sqrt((a2 * integral) / s0)) / 10 / MPC;
    expect(r.horizonMpc / expected).toBeCloseTo(1, 6);
    expect(r.fMaxHz).toBe(r.fIscoHz);
    expect(r.rangeMpc).toBe(r.horizonMpc / FINN_CHERNOFF_RANGE_FACTOR);
  });

  it("scales as 1/SNR and gives the same result for a finely sampled copy of the PSD (to 1e-3)", () => {
    const base = horizonDistance({ massSolar1: 1.4, massSolar2: 1.4, psd: ajith2011, fMinHz: 20 });
    const half = horizonDistance({ massSolar1: 1.4, massSolar2: 1.4, psd: ajith2011, fMinHz: 20, snr: 4 });
    expect(half.horizonMpc / base.horizonMpc).toBeCloseTo(2, 12);
    const df = 0.25;
    const sampled = { df, psd: interpolatePsd(ajith2011, df, 8193) };
    const s = horizonDistance({ massSolar1: 1.4, massSolar2: 1.4, psd: sampled, fMinHz: 20 });
    expect(Math.abs(s.horizonMpc / base.horizonMpc - 1)).toBeLessThan(1e-3);
  });

  it("stops at the PSD's last frequency and at an explicit fMaxHz", () => {
    const sampled = { df: 1, psd: interpolatePsd(ajith2011, 1, 513) }; // up to 512 Hz
    const r = horizonDistance({ massSolar1: 1.4, massSolar2: 1.4, psd: sampled, fMinHz: 20 });
    expect(r.fMaxHz).toBe(512);
    const e = horizonDistance({ massSolar1: 1.4, massSolar2: 1.4, psd: ajith2011, fMinHz: 20, fMaxHz: 512 });
    expect(Math.abs(r.horizonMpc / e.horizonMpc - 1)).toBeLessThan(1e-3);
  });

  it("rejects bad masses, limits and thresholds", () => {
    expect(() => horizonDistance({ massSolar1: 0, massSolar2: 1, psd: ajith2011 })).toThrow(/massSolar1/);
    expect(() => horizonDistance({ massSolar1: 1, massSolar2: 1, psd: ajith2011, snr: -1 })).toThrow(/snr/);
    expect(() => horizonDistance({ massSolar1: 100, massSolar2: 100, psd: ajith2011, fMinHz: 100 })).toThrow(/not above fMinHz/);
    expect(() => horizonDistance({ massSolar1: 1, massSolar2: 1, psd: { df: 1, psd: new Float64Array(600) }, fMinHz: 20 })).toThrow(/not positive/);
  });
});

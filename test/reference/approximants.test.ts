import { describe, expect, it } from "vitest";
import { ajith2011, arrayInput, searchStrain } from "@chirpsieve/core";
import { optimalSnrOfSeries } from "../../packages/core/src/inject/optimalSnr.js";
import { injectionAt, simulatedData } from "../search/fixtures.js";

/**
 * Overlap of the 3.5PN TaylorT4 injection model with the 3.5PN TaylorF2 template of the same
 * masses, maximised over time and phase: noise-free data holding the projected TaylorT4 signal is
 * filtered with that one template in the model PSD, so SNR / optimal SNR is the normalised overlap.
 * The two approximants differ by design at 3.5PN (Buonanno, Iyer, Ochsner, Pan & Sathyaprakash,
 * Phys. Rev. D 80, 084043 (2009), Sec. V), so the overlap sits below 1: 0.9 is the floor we require
 * of it, and the value measured here (0.964) is held as a regression value.
 */
async function overlap(m1: number, m2: number, fMin: number): Promise<number> {
  const fs = 2048;
  const inj = injectionAt(m1, m2, 90.25, { distanceMpc: 100 });
  const data = simulatedData({ psd: ajith2011, fs, seconds: 128, seed: "none", fMin, injections: [inj], noise: false });
  const optimal = optimalSnrOfSeries(data, ajith2011, fs, fMin);
  const { candidates } = await searchStrain(arrayInput(data, fs), {
    templates: [{ primaryMassSolar: m1, secondaryMassSolar: m2 }],
    fMinHz: fMin,
    snrThreshold: 1,
    chi2Bands: 0,
    loudestWithinSeconds: 1,
    psd: { kind: "model", model: ajith2011 },
    // Noise-free data is mostly exact zeros, and the signal an excursion over no noise: neither screened nor gated.
    badData: "ignore",
    gating: null,
  });
  const best = candidates.reduce((a, b) => (b.snr > a.snr ? b : a));
  return best.snr / optimal;
}

describe("TaylorT4 against TaylorF2 at 3.5PN, same masses, maximised over time and phase (ajith2011, from 30 Hz)", () => {
  it("10+10 M_sun: overlap above 0.9 (measured here 0.964; the approximants differ by design)", async () => {
    const o = await overlap(10, 10, 30);
    expect(o).toBeGreaterThan(0.9);
    expect(Math.abs(o - 0.964)).toBeLessThan(0.005); // measured here (regression)
    expect(o).toBeLessThan(1.0001);
  });
});

import { describe, expect, it } from "vitest";
import kstest from "@stdlib/stats-kstest";
import chisquareCdf from "@stdlib/stats-base-dists-chisquare-cdf";
import { ajith2011, colouredNoise, createComplexPlan, type PsdModel } from "@chirpsieve/core";
import { createRealFft } from "../../packages/core/src/fft/create.js";
import { chiSquared } from "../../packages/core/src/filter/chisq.js";
import { computeSegmentSpectrum } from "../../packages/core/src/filter/segmentSpectrum.js";
import { snrSeries } from "../../packages/core/src/filter/snrSeries.js";
import { interpolatePsd } from "../../packages/core/src/noise/interpolatePsd.js";
import { flatPsd } from "../../packages/core/src/noise/psdModel.js";
import { createTaylorF2Generator } from "../../packages/core/src/waveform/taylorf2.js";

/**
 * Filters seeded stationary Gaussian noise with a few templates (PSD known exactly) and returns
 * |z|² at samples 512 apart (≫ the SNR autocorrelation length, so effectively independent),
 * plus the fraction of all searchable samples above a few thresholds.
 */
function filterNoise(psd: PsdModel, seed: string) {
  const fs = 2048;
  const n = 1 << 18; // 128 s
  const fMin = 30;
  const data = colouredNoise(psd, n, fs, seed);
  const bins = n / 2 + 1;
  const df = fs / n;
  const psdBins = interpolatePsd(psd, df, bins);
  const buffers = { weighted: new Float64Array(n + 2), inversePsd: new Float64Array(bins), spectrum: new Float64Array(n + 2) };
  const spec = computeSegmentSpectrum(data, psdBins, fs, fMin, 0.95 * (fs / 2), createRealFft(n), buffers);
  const plan = createComplexPlan(n, "fftjs");
  const gen = createTaylorF2Generator(bins, df);
  const tmpl = new Float64Array(2 * bins);
  const state = { dirtyEnd: 2 * bins };
  const samples: number[] = [];
  const thresholds = [2, 3, 4];
  const above = [0, 0, 0];
  let searched = 0;
  for (const [m1, m2] of [[1.4, 1.4], [3, 1.5], [10, 8], [25, 20]]) {
    const kEnd = gen.generate(tmpl, fMin, m1, m2, 1);
    expect(snrSeries(spec, tmpl, kEnd, plan, state)).toBeGreaterThan(0);
    const z = plan.output;
    // Skip the wrap-around stretch (longest template here ≈ 56 s) and the filter edges.
    for (let j = 60 * fs; j < n - 4 * fs; j++) {
      const p = z[2 * j] ** 2 + z[2 * j + 1] ** 2;
      if (j % 512 === 0) samples.push(p);
      searched++;
      for (let t = 0; t < thresholds.length; t++) if (p > thresholds[t] ** 2) above[t]++;
    }
  }
  return { samples, thresholds, fractions: above.map((a) => a / searched), searched };
}

describe("matched-filter SNR in stationary Gaussian noise", () => {
  for (const psd of [ajith2011, flatPsd()]) {
    it(`|z|² is χ² with 2 degrees of freedom (${psd.name} noise, KS test)`, () => {
      const { samples } = filterNoise(psd, `ks-${psd.name}`);
      // Standard detection theory: Re z, Im z ~ N(0,1) so |z|² ~ χ²₂ (e.g. Allen et al.,
      // Phys. Rev. D 85, 122006 (2012)); the KS test and χ² CDF are @stdlib's, an independent library.
      const result = kstest(samples, "chisquare", 2);
      expect(samples.length).toBeGreaterThan(1000);
      expect(result.pValue).toBeGreaterThan(0.01);
      const mean = samples.reduce((a, b) => a + b, 0) / samples.length;
      expect(mean).toBeGreaterThan(2 * (1 - 4 / Math.sqrt(samples.length)));
      expect(mean).toBeLessThan(2 * (1 + 4 / Math.sqrt(samples.length)));
    });

    it(`the rate of samples above ρ follows exp(−ρ²/2) (${psd.name} noise)`, () => {
      const { thresholds, fractions, searched } = filterNoise(psd, `rate-${psd.name}`);
      // P(|z| > ρ) = exp(−ρ²/2) per sample for |z|² ~ χ²₂ (standard detection theory).
      // Neighbouring samples are correlated over ~a few samples, so the count behaves like
      // ≈ searched/8 independent draws: allow 5 of those standard errors.
      for (let t = 0; t < thresholds.length; t++) {
        const p = Math.exp(-(thresholds[t] ** 2) / 2);
        const err = Math.sqrt((p * (1 - p)) / (searched / 8));
        expect(Math.abs(fractions[t] - p)).toBeLessThan(5 * err);
      }
    });
  }
});

describe("chi-squared discriminator in stationary Gaussian noise", () => {
  /**
   * χ² of one template at samples 1 s apart in 42 seeded noise realisations of 32 s each (PSD known
   * exactly), away from the filter's wrap-around stretch and edges.
   */
  function chiSquaredInNoise(psd: PsdModel, m1: number, m2: number, p: number): number[] {
    const fs = 2048;
    const n = 1 << 16;
    const fMin = 30;
    const bins = n / 2 + 1;
    const df = fs / n;
    const psdBins = interpolatePsd(psd, df, bins);
    const buffers = { weighted: new Float64Array(n + 2), inversePsd: new Float64Array(bins), spectrum: new Float64Array(n + 2) };
    const fft = createRealFft(n);
    const gen = createTaylorF2Generator(bins, df);
    const tmpl = new Float64Array(2 * bins);
    const kEnd = gen.generate(tmpl, fMin, m1, m2, 1);
    const out: number[] = [];
    for (let r = 0; r < 42; r++) {
      const data = colouredNoise(psd, n, fs, `chi2-${psd.name}-${r}`);
      const spec = computeSegmentSpectrum(data, psdBins, fs, fMin, 0.95 * (fs / 2), fft, buffers);
      for (let j = 6 * fs; j < n - 2 * fs; j += fs) {
        const { chi2, dof } = chiSquared(spec, tmpl, kEnd, j, p);
        expect(dof).toBe(2 * p - 2);
        out.push(chi2);
      }
    }
    return out;
  }

  for (const [psd, m1, m2, p] of [
    [ajith2011, 10, 8, 16],
    [flatPsd(), 6, 4, 4],
  ] as const) {
    it(`follows χ² with 2p − 2 = ${2 * p - 2} degrees of freedom (${psd.name} noise, ${m1}+${m2} M_sun, p = ${p}; KS test)`, () => {
      // Allen, Phys. Rev. D 71, 062001 (2005), Sec. IV: in Gaussian noise the discriminator with p
      // equal-power sub-bands is χ²-distributed with 2p − 2 degrees of freedom. The χ² CDF
      // (@stdlib/stats-base-dists-chisquare-cdf) and the KS test (@stdlib/stats-kstest) are @stdlib's.
      const samples = chiSquaredInNoise(psd, m1, m2, p);
      const dof = 2 * p - 2;
      expect(samples.length).toBeGreaterThanOrEqual(1000);
      const result = kstest(samples, (x: number) => chisquareCdf(x, dof));
      expect(result.pValue).toBeGreaterThan(0.01);
      // Mean k = dof and variance 2k of the χ² distribution, within 4 standard errors (the sample
      // variance's relative standard error is √((2 + 12/k)/m) from the χ² kurtosis 12/k).
      const m = samples.length;
      const mean = samples.reduce((a, b) => a + b, 0) / m;
      const variance = samples.reduce((a, b) => a + (b - mean) ** 2, 0) / (m - 1);
      expect(Math.abs(mean - dof)).toBeLessThan(4 * Math.sqrt((2 * dof) / m));
      expect(Math.abs(variance / (2 * dof) - 1)).toBeLessThan(4 * Math.sqrt((2 + 12 / dof) / m));
    });
  }
});

// The search's fast TaylorF2 phase path (piecewise-quadratic recurrences, no per-bin cos/sin)
// against the exact template of waveform/taylorf2.ts.
import { describe, expect, it } from "vitest";
import { ajith2011, colouredNoise, createBankFilter, createComplexPlan, createSegmentFilter } from "@chirpsieve/core";
import { createRealFft } from "../../packages/core/src/fft/create.js";
import { computeSegmentSpectrum } from "../../packages/core/src/filter/segmentSpectrum.js";
import { snrSeries } from "../../packages/core/src/filter/snrSeries.js";
import { interpolatePsd } from "../../packages/core/src/noise/interpolatePsd.js";
import { allocateSegmentWeights, amplitudeLaw, fillSegmentWeights } from "../../packages/core/src/search/segmentWeights.js";
import { createTaylorF2Phasor, DEFAULT_PHASOR_PHASE_ERROR } from "../../packages/core/src/waveform/taylorF2Phasor.js";
import { taylorF2BinRange, taylorF2Into } from "../../packages/core/src/waveform/taylorf2.js";
import { taylorF2Chirp } from "../search/fixtures.js";

/**
 * Noise-weighted overlap of the fast template h_fast = |h̃| e^{−iΨ_fast} with the exact h̃,
 * |(h_fast|h̃)| / (h̃|h̃) in ajith2011 noise, without maximising over time or phase (so a lower
 * bound on the match), and the largest phase difference of any bin.
 */
function fastVsExact(seconds: number, fs: number, fLow: number, m1: number, m2: number, chi1 = 0, chi2 = 0) {
  const n = seconds * fs;
  const nBins = n / 2 + 1;
  const df = fs / n;
  const exact = new Float64Array(2 * nBins);
  taylorF2Into(exact, nBins, df, fLow, m1, m2, 1, Infinity, 7, chi1, chi2);
  const { kStart, kEnd } = taylorF2BinRange(nBins, df, fLow, m1, m2);
  const u = new Float64Array(2 * nBins);
  for (let k = kStart; k < kEnd; k++) u[2 * k] = 1;
  const phasor = createTaylorF2Phasor(df);
  const out = new Float64Array(2 * nBins);
  phasor.multiply(u, out, kStart, kEnd, m1, m2, 1, chi1, chi2);
  const psd = interpolatePsd(ajith2011, df, nBins);
  let re = 0, im = 0, norm = 0, worstPhase = 0;
  for (let k = kStart; k < kEnd; k++) {
    const er = exact[2 * k], ei = exact[2 * k + 1];
    const mag = Math.hypot(er, ei);
    // out ≈ e^{+iΨ}, exact = |h̃| e^{−iΨ}: out·exact ≈ |h̃|, and h_fast·conj(h̃) = |h̃| conj(out)·conj(exact).
    const pr = out[2 * k] * er - out[2 * k + 1] * ei;
    const pi = out[2 * k] * ei + out[2 * k + 1] * er;
    worstPhase = Math.max(worstPhase, Math.abs(Math.atan2(pi, pr)));
    re += (mag * pr) / psd[k];
    im += (mag * pi) / psd[k];
    norm += (mag * mag) / psd[k];
  }
  return { match: Math.hypot(re, im) / norm, worstPhase, bins: kEnd - kStart };
}

describe("fast phase path of the search (taylorF2Phasor)", () => {
  const cases: [number, number, number, number, number][] = [
    // seconds, fs, fLow, m1, m2: the bench's grid (512 s at 4096 Hz from 30 Hz) and longer/heavier ones
    [512, 4096, 30, 1, 1],
    [512, 4096, 30, 1.4, 1.4],
    [512, 4096, 30, 3, 1],
    [1024, 2048, 20, 1, 1],
    [256, 2048, 20, 10, 8],
    [64, 2048, 15, 25, 20],
  ];
  for (const [seconds, fs, fLow, m1, m2] of cases) {
    it(`matches the exact template to ≥ 0.9999 with every bin within the phase bound (${m1}+${m2} M_sun from ${fLow} Hz, ${seconds} s at ${fs} Hz)`, () => {
      const { match, worstPhase } = fastVsExact(seconds, fs, fLow, m1, m2);
      expect(match).toBeGreaterThanOrEqual(0.9999);
      expect(worstPhase).toBeLessThanOrEqual(DEFAULT_PHASOR_PHASE_ERROR);
    });
  }

  for (const [seconds, fs, fLow, m1, m2] of cases) {
    for (const [chi1, chi2] of [[0.99, 0.99], [-0.99, -0.99], [0.99, -0.99]]) {
      it(`keeps every bin within the phase bound with aligned spins ${chi1}, ${chi2} (${m1}+${m2} M_sun from ${fLow} Hz)`, () => {
        const { match, worstPhase } = fastVsExact(seconds, fs, fLow, m1, m2, chi1, chi2);
        expect(match).toBeGreaterThanOrEqual(0.9999);
        expect(worstPhase).toBeLessThanOrEqual(DEFAULT_PHASOR_PHASE_ERROR);
      });
    }
  }

  it("writes h̃ for the chi-squared test (SegmentFilter.generate) within the phase bound of the exact template, bin by bin", () => {
    const fs = 4096, n = 1 << 19, fMin = 30, nBins = n / 2 + 1, df = fs / n;
    const filter = createSegmentFilter({
      size: n, sampleRate: fs, fMinHz: fMin, fMaxHz: 0.95 * (fs / 2),
      psd: { kind: "model", model: ajith2011 }, truncationSamples: 2 * fs, backend: "fftjs",
    });
    const exact = new Float64Array(2 * nBins);
    for (const [m1, m2] of [[1, 1], [2.2, 1.7], [3, 3]]) {
      const kEnd = filter.generate({ primaryMassSolar: m1, secondaryMassSolar: m2 });
      expect(kEnd).toBe(taylorF2Into(exact, nBins, df, fMin, m1, m2, 1, 0.95 * (fs / 2)));
      const h = filter.template;
      let worst = 0;
      for (let k = 0; k < nBins; k++) {
        const mag = Math.hypot(exact[2 * k], exact[2 * k + 1]);
        const diff = Math.hypot(h[2 * k] - exact[2 * k], h[2 * k + 1] - exact[2 * k + 1]);
        if (mag === 0) expect(diff).toBe(0);
        else worst = Math.max(worst, diff / mag);
      }
      expect(worst).toBeLessThan(DEFAULT_PHASOR_PHASE_ERROR);
    }
  });

  it("gives the same σ (to 1e-9) and SNR series (peak within 1e-4, every sample within ε·peak, ε the phase bound) as the exact template through snrSeries", () => {
    const fs = 2048, n = 1 << 18, fMin = 30, nBins = n / 2 + 1, df = fs / n;
    const data = colouredNoise(ajith2011, n, fs, "fast-phase-series");
    const chirp = taylorF2Chirp(1.5, 1.3, 100.3, n, fs, fMin);
    for (let i = 0; i < n; i++) data[i] += chirp[i] / 250; // the 1 Mpc chirp at ≈ 250 Mpc: SNR ≈ 15
    const psd = interpolatePsd(ajith2011, df, nBins);
    const buffers = { weighted: new Float64Array(n + 2), inversePsd: new Float64Array(nBins), spectrum: new Float64Array(n + 2) };
    const spec = computeSegmentSpectrum(data, psd, fs, fMin, 0.95 * (fs / 2), createRealFft(n), buffers);
    const weights = allocateSegmentWeights(n, fs, false);
    fillSegmentWeights(spec, amplitudeLaw(nBins, df), weights);
    const bank = createBankFilter({ size: n, sampleRate: fs, fMinHz: fMin, fMaxHz: 0.95 * (fs / 2), backend: "fftjs" });
    const plan = createComplexPlan(n, "fftjs");
    const template = new Float64Array(2 * nBins);
    for (const [m1, m2] of [[1.5, 1.3], [1.4, 1.4], [6, 2]]) {
      const kEnd = taylorF2Into(template, nBins, df, fMin, m1, m2, 1, 0.95 * (fs / 2));
      const sigmaExact = snrSeries(spec, template, kEnd, plan, { dirtyEnd: 2 * n });
      const { sigma } = bank.filter(weights, m1, m2);
      expect(Math.abs(sigma / sigmaExact - 1)).toBeLessThan(1e-9);
      const a = plan.output, b = bank.snr;
      let peakA = 0, peakB = 0, worst = 0;
      for (let j = 0; j < n; j++) {
        peakA = Math.max(peakA, Math.hypot(a[2 * j], a[2 * j + 1]));
        peakB = Math.max(peakB, Math.hypot(b[2 * j], b[2 * j + 1]));
        worst = Math.max(worst, Math.hypot(a[2 * j] - b[2 * j], a[2 * j + 1] - b[2 * j + 1]));
      }
      expect(Math.abs(peakB / peakA - 1)).toBeLessThan(1e-4);
      expect(worst / peakA).toBeLessThan(DEFAULT_PHASOR_PHASE_ERROR);
    }
  });
});

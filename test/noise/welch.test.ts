import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { InputError, welchPsd } from "@chirpsieve/core";
import { medianBiasFactor } from "../../packages/core/src/noise/welch.js";

/** Seeded white Gaussian noise of standard deviation sigma (Box–Muller, written out here). */
function whiteNoise(n: number, sigma: number, seed: string): Float64Array {
  const rng = seedrandom(seed);
  const out = new Float64Array(n);
  for (let i = 0; i < n; i += 2) {
    const r = Math.sqrt(-2 * Math.log(1 - rng())) * sigma;
    const a = 2 * Math.PI * rng();
    out[i] = r * Math.cos(a);
    if (i + 1 < n) out[i + 1] = r * Math.sin(a);
  }
  return out;
}

function meanOver(psd: Float64Array, from: number, to: number): number {
  let s = 0;
  for (let k = from; k < to; k++) s += psd[k];
  return s / (to - from);
}

describe("welchPsd", () => {
  const fs = 1024;
  const sigma = 3e-3;
  const data = whiteNoise(fs * 128, sigma, "welch-white");

  it("gives 2σ²/fs for white noise of variance σ² (mean average, within 2%)", () => {
    // Common practice, no source: one-sided PSD of white noise is 2σ²/fs.
    const w = welchPsd(data, fs, { segmentLength: 1024 });
    expect(w.segments).toBe(255);
    expect(w.df).toBe(1);
    expect(w.psd.length).toBe(513);
    expect(w.frequencies[512]).toBe(512);
    const level = meanOver(w.psd, 1, 512);
    expect(Math.abs(level / ((2 * sigma * sigma) / fs) - 1)).toBeLessThan(0.02);
  });

  it("median average with the bias correction agrees with the mean within 3% (odd and even K)", () => {
    // Allen et al., Phys. Rev. D 85, 122006 (2012): median / Σ(−1)^{l+1}/l estimates the mean.
    for (const len of [1024, 2048]) {
      const mean = welchPsd(data, fs, { segmentLength: len, average: "mean" });
      const median = welchPsd(data, fs, { segmentLength: len, average: "median" });
      expect(median.segments).toBe(mean.segments);
      const ratio = meanOver(median.psd, 1, len / 2) / meanOver(mean.psd, 1, len / 2);
      expect(Math.abs(ratio - 1)).toBeLessThan(0.03);
    }
    // Those give K = 255 and 127 (odd); an even K = 12 from a shorter series:
    const even = data.subarray(0, 1024 * 6 + 512);
    const k = welchPsd(even, fs, { segmentLength: 1024, average: "median" });
    expect(k.segments % 2).toBe(0);
    const m = welchPsd(even, fs, { segmentLength: 1024, average: "mean" });
    expect(Math.abs(meanOver(k.psd, 1, 512) / meanOver(m.psd, 1, 512) - 1)).toBeLessThan(0.03);
  });

  it("median resists a loud glitch that ruins the mean", () => {
    const glitched = data.slice();
    for (let i = 0; i < 64; i++) glitched[50_000 + i] += 1000 * sigma * Math.sin(i);
    const mean = welchPsd(glitched, fs, { segmentLength: 1024 });
    const median = welchPsd(glitched, fs, { segmentLength: 1024, average: "median" });
    const truth = (2 * sigma * sigma) / fs;
    expect(meanOver(mean.psd, 1, 512) / truth).toBeGreaterThan(2);
    expect(Math.abs(meanOver(median.psd, 1, 512) / truth - 1)).toBeLessThan(0.03);
  });

  it("counts segments for other overlaps", () => {
    expect(welchPsd(data.subarray(0, 4096), fs, { segmentLength: 1024, overlap: 0 }).segments).toBe(4);
    expect(welchPsd(data.subarray(0, 4096), fs, { segmentLength: 1024, overlap: 0.75 }).segments).toBe(13);
    expect(welchPsd(data.subarray(0, 1024), fs, { segmentLength: 1024 }).segments).toBe(1);
  });

  it("rejects bad arguments with an InputError naming the parameter", () => {
    expect(() => welchPsd(data.subarray(0, 100), fs, { segmentLength: 128 })).toThrow(/shorter than one segment/);
    expect(() => welchPsd(data, fs, { segmentLength: 1000 })).toThrow(/segmentLength must be a power of two/);
    expect(() => welchPsd(data, 0, { segmentLength: 1024 })).toThrow(/sampleRate/);
    expect(() => welchPsd(data, fs, { segmentLength: 1024, overlap: 1 })).toThrow(/overlap/);
    expect(() => welchPsd(data, fs, { segmentLength: 1024, average: "mode" as never })).toThrow(InputError);
  });
});

describe("medianBiasFactor", () => {
  it("is Σ(−1)^{l+1}/l for odd K and tends to ln 2", () => {
    // Allen et al., Phys. Rev. D 85, 122006 (2012), appendix (from memory): β(K) for odd K → ln 2.
    expect(medianBiasFactor(1)).toBe(1);
    expect(medianBiasFactor(3)).toBeCloseTo(1 - 1 / 2 + 1 / 3, 15);
    expect(medianBiasFactor(5)).toBeCloseTo(1 - 1 / 2 + 1 / 3 - 1 / 4 + 1 / 5, 15);
    expect(Math.abs(medianBiasFactor(100001) - Math.LN2)).toBeLessThan(1e-5);
  });

  it("for even K matches a seeded Monte Carlo of the two-middle-value median of exponentials", () => {
    // Our own choice for even K (expected order statistics of the exponential distribution):
    // check it against simulation: 20000 trials, the median of K ≤ 10 unit exponentials has standard
    // deviation < 1, so the standard error is < 0.007 and 0.02 is a 3σ bound.
    const rng = seedrandom("median-even");
    for (const k of [2, 4, 10]) {
      let sum = 0;
      const trials = 20000;
      const v = new Float64Array(k);
      for (let t = 0; t < trials; t++) {
        for (let i = 0; i < k; i++) v[i] = -Math.log(1 - rng());
        v.sort();
        sum += 0.5 * (v[k / 2 - 1] + v[k / 2]);
      }
      expect(Math.abs(sum / trials - medianBiasFactor(k))).toBeLessThan(0.02);
    }
    expect(medianBiasFactor(2)).toBe(1);
  });
});

// The stages of gating on small fixtures (noise/gateWindows.ts, noise/gating.ts).
import { describe, expect, it } from "vitest";
import { createGaussianDeviates } from "../../packages/core/src/noise/gaussianDeviates.js";
import {
  excursionRuns,
  gateTaperWeight,
  keepGatedPart,
  mergeGateWindows,
  robustSigma,
} from "../../packages/core/src/noise/gateWindows.js";
import { bandWhiteningGain, edgeTaperedCopy } from "../../packages/core/src/noise/gating.js";

/** A quiet series of `length` samples (value 0.01) with the given loud samples. */
function spikes(length: number, loud: Record<number, number>): Float64Array {
  const y = new Float64Array(length).fill(0.01);
  for (const [at, v] of Object.entries(loud)) y[Number(at)] = v;
  return y;
}

describe("robustSigma", () => {
  it("is the median |y| over 0.6745 (median absolute deviation of a Gaussian, common practice, no source)", () => {
    const y = Float64Array.from([-3, 2, -1, 0, 1, -2, 3]); // |y| sorted: 0 1 1 2 2 3 3, median 2
    expect(robustSigma(y, y.length, new Float64Array(16))).toBeCloseTo(2 / 0.6744897501960817, 12);
  });

  it("takes every stride-th sample when the scratch is shorter than the data", () => {
    // Samples 0, 3, 6, 9 (stride ceil(10/4) = 3): |y| = 1, 4, 7, 10 → upper median 7.
    const y = Float64Array.from({ length: 10 }, (_, i) => i + 1);
    expect(robustSigma(y, y.length, new Float64Array(4))).toBeCloseTo(7 / 0.6744897501960817, 12);
  });

  it("ignores one huge excursion and gives σ of seeded Gaussian noise within 2%", () => {
    const y = new Float64Array(20000);
    createGaussianDeviates("robust-sigma").fill(y);
    for (let i = 0; i < y.length; i++) y[i] *= 3;
    y[100] = 1e6;
    // Standard error of the MAD of 20000 samples is ~0.6% (common practice, no source).
    expect(Math.abs(robustSigma(y, y.length, new Float64Array(y.length)) / 3 - 1)).toBeLessThan(0.02);
  });
});

describe("excursionRuns", () => {
  it("joins loud samples within joinSamples of the previous one and keeps the loudest as the peak", () => {
    const y = spikes(100, { 10: 5, 13: -9, 15: 6, 40: 7, 90: -8 });
    expect(excursionRuns(y, 100, 1, 5)).toEqual([
      { first: 10, last: 15, peak: 13 },
      { first: 40, last: 40, peak: 40 },
      { first: 90, last: 90, peak: 90 },
    ]);
    // With a shorter reach the 10 and 13 samples (3 apart) stay separate runs.
    expect(excursionRuns(y, 100, 1, 2).slice(0, 2)).toEqual([
      { first: 10, last: 10, peak: 10 },
      { first: 13, last: 15, peak: 13 },
    ]);
  });

  it("finds nothing at or below the limit, and nothing past `length`", () => {
    const y = spikes(50, { 5: 2, 45: 9 });
    expect(excursionRuns(y, 50, 2, 3)).toEqual([{ first: 45, last: 45, peak: 45 }]);
    expect(excursionRuns(y, 40, 1, 3)).toEqual([{ first: 5, last: 5, peak: 5 }]);
  });
});

describe("mergeGateWindows", () => {
  const y = spikes(1000, { 100: 50, 130: 80, 500: 30, 995: 40 });

  it("widens each run by the half-width and clips the zeroed stretch to the data", () => {
    const gates = mergeGateWindows([{ first: 500, last: 500, peak: 500 }, { first: 995, last: 995, peak: 995 }], y, 2, 1000, 10, 0);
    expect(gates).toEqual([
      { peakSample: 500, zeroStart: 490, zeroEnd: 511, peakSigma: 15 },
      { peakSample: 995, zeroStart: 985, zeroEnd: 1000, peakSigma: 20 },
    ]);
  });

  it("merges runs whose tapers overlap into one gate keeping the louder peak; apart they stay two", () => {
    const runs = [{ first: 100, last: 100, peak: 100 }, { first: 130, last: 130, peak: 130 }];
    // Zeroed [90, 111) and [120, 141): 120 ≤ 111 + 2·5, so the tapers overlap.
    expect(mergeGateWindows(runs, y, 10, 1000, 10, 5)).toEqual([{ peakSample: 130, zeroStart: 90, zeroEnd: 141, peakSigma: 8 }]);
    // With 4-sample tapers 120 > 111 + 8: two gates.
    expect(mergeGateWindows(runs, y, 10, 1000, 10, 4)).toHaveLength(2);
    // The louder peak first: the merged gate keeps it.
    const quieter = spikes(1000, { 100: 80, 130: 50 });
    expect(mergeGateWindows(runs, quieter, 10, 1000, 10, 5)[0].peakSample).toBe(100);
  });
});

describe("the inverse Tukey window", () => {
  it("tapers by ½(1 − cos(πt/T)) with T = taper + 1 (Hann half-window; common practice, no source)", () => {
    const taper = 7;
    const T = taper + 1;
    for (let d = 1; d <= taper; d++) {
      const t = T - d;
      expect(gateTaperWeight(d, taper)).toBeCloseTo(0.5 * (1 - Math.cos((Math.PI * t) / T)), 14);
    }
    expect(gateTaperWeight(0, taper)).toBe(1);
    expect(gateTaperWeight(T, taper)).toBeCloseTo(0, 15);
  });

  it("keeps the zeroed stretch whole, tapers each side symmetrically and clears everything else", () => {
    const size = 64;
    const y = new Float64Array(size).fill(1);
    const gates = [{ peakSample: 20, zeroStart: 18, zeroEnd: 23, peakSigma: 30 }, { peakSample: 60, zeroStart: 58, zeroEnd: 62, peakSigma: 25 }];
    keepGatedPart(y, size, gates, 4);
    for (let j = 18; j < 23; j++) expect(y[j]).toBe(1);
    for (let d = 1; d <= 4; d++) {
      expect(y[18 - d]).toBe(gateTaperWeight(d, 4));
      expect(y[22 + d]).toBe(gateTaperWeight(d, 4));
    }
    for (const j of [0, 13, 27, 40, 53]) expect(y[j]).toBe(0);
    // The second gate's right taper runs past the end and is cut there.
    expect(Array.from(y.subarray(58, 64))).toEqual([1, 1, 1, 1, gateTaperWeight(1, 4), gateTaperWeight(2, 4)]);
    expect(y[54]).toBe(gateTaperWeight(4, 4));
  });
});

describe("whitening stages", () => {
  it("the band gain is 1/√S inside [kLow, kHigh) where S is positive and finite, 0 elsewhere", () => {
    const psd = Float64Array.from([4, 4, 0.25, 0, Infinity, 16, 9, 1]);
    const gain = new Float64Array(8).fill(7);
    bandWhiteningGain(psd, 1, 7, gain);
    expect(Array.from(gain)).toEqual([0, 0.5, 2, 0, 0, 0.25, 1 / 3, 0]);
  });

  it("the edge taper is a half-Hann ½(1 − cos(π(j + ½)/edge)) at both ends, zero past the data", () => {
    const data = new Float64Array(16).fill(2);
    const out = new Float64Array(20).fill(9);
    edgeTaperedCopy(data, 16, 4, out);
    for (let j = 0; j < 4; j++) {
      const w = 0.5 * (1 - Math.cos((Math.PI * (j + 0.5)) / 4));
      expect(out[j]).toBeCloseTo(2 * w, 15);
      expect(out[15 - j]).toBeCloseTo(2 * w, 15);
    }
    for (let j = 4; j < 12; j++) expect(out[j]).toBe(2);
    expect(Array.from(out.subarray(16))).toEqual([0, 0, 0, 0]);
  });
});

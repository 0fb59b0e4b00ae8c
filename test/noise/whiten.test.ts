import { describe, expect, it } from "vitest";
import { ajith2011, colouredNoise, welchPsd } from "@chirpsieve/core";
import { truncateInverseSpectrum } from "../../packages/core/src/noise/inverseSpectrumTruncation.js";
import { whiten } from "../../packages/core/src/noise/whiten.js";

describe("whiten", () => {
  const fs = 4096;
  const seconds = 64;
  const x = colouredNoise(ajith2011, fs * seconds, fs, "whiten-input");
  const fLow = 15;
  const edge = 4 * fs; // circular-filter corruption at the ends is kept out of the statistics

  function statistics(y: Float64Array): { variance: number; worstBand: number } {
    const inner = y.subarray(edge, y.length - edge);
    let v = 0;
    for (const s of inner) v += s * s;
    const w = welchPsd(inner, fs, { segmentLength: 4 * fs });
    // Flat spectrum: white noise of unit variance has one-sided PSD 2/fs (common practice, no source).
    // Bands of 40 Hz (160 bins), K = 23 segments: σ ≈ √(1.056/23 · 1.944/160) ≈ 0.024.
    let worstBand = 0;
    for (let f0 = 20; f0 + 40 <= 2000; f0 += 40) {
      let m = 0;
      const k0 = Math.round(f0 / w.df);
      for (let k = k0; k < k0 + 160; k++) m += w.psd[k];
      worstBand = Math.max(worstBand, Math.abs(m / 160 / (2 / fs) - 1));
    }
    return { variance: v / inner.length, worstBand };
  }

  it("turns ajith2011 noise into unit-variance noise with a flat spectrum (model PSD)", () => {
    const y = whiten(x, fs, ajith2011, { fMinHz: fLow });
    const { variance, worstBand } = statistics(y);
    // Kept fraction of the band: 1 − 2·fLow/fs; the variance of a variance estimate from N samples
    // of white noise is 2/N (here N = 229 376: σ ≈ 0.003).
    expect(Math.abs(variance - (1 - (2 * fLow) / fs))).toBeLessThan(0.015);
    expect(worstBand).toBeLessThan(0.1);
  });

  it("does the same with a Welch estimate, truncated, on another grid (interpolated)", () => {
    const est = welchPsd(x, fs, { segmentLength: 4 * fs, average: "median" });
    const truncated = truncateInverseSpectrum(est.psd, { sampleRate: fs, lengthSeconds: 2, fMinHz: fLow });
    const y = whiten(x, fs, { df: truncated.df, psd: truncated.psd }, { fMinHz: fLow });
    const { variance, worstBand } = statistics(y);
    // Whitening by a noisy estimate Ŝ raises the variance by E[S/Ŝ] ≈ 1 + Var(Ŝ)/S² (Jensen). For a
    // median of K unit exponentials, Var ≈ 1/(4K·p(m)²) = 1/K (asymptotic variance of a sample
    // median, p(m) = ½ the density at the median m = ln 2; common practice, no source), and after
    // dividing by the bias factor ≈ ln 2, Var(Ŝ)/S² ≈ 1/(K (ln 2)²) ≈ 2.1/K; using the same data
    // for the estimate lowers it again. So: between the kept fraction −1% and (1 + 2.1/K) +1%.
    const kept = 1 - (2 * fLow) / fs;
    expect(variance).toBeGreaterThan(kept * 0.99);
    expect(variance).toBeLessThan(kept * (1 + 2.1 / est.segments + 0.01));
    expect(worstBand).toBeLessThan(0.1);
  });

  it("zeroes the band outside [fLow, fHigh] and rejects bad arguments", () => {
    const y = whiten(x.subarray(0, 8 * fs), fs, ajith2011, { fMinHz: 100, fMaxHz: 200 });
    const w = welchPsd(y, fs, { segmentLength: fs });
    expect(w.psd[Math.round(50 / w.df)]).toBeLessThan(1e-6 * w.psd[150]);
    expect(w.psd[Math.round(400 / w.df)]).toBeLessThan(1e-6 * w.psd[150]);
    expect(() => whiten(x, 0, ajith2011)).toThrow(/sampleRate/);
    expect(() => whiten(x, fs, ajith2011, { fMinHz: 30, fMaxHz: 20 })).toThrow(/fMaxHz/);
    expect(() => whiten(new Float64Array(2), fs, ajith2011)).toThrow(/at least 4 samples/);
  });
});

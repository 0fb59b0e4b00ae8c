import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { ajith2011, colouredNoise, createNoiseStream, welchPsd, type PsdModel } from "@chirpsieve/core";
import { dis2001, flatPsd } from "../../packages/core/src/noise/psdModel.js";

/** ∫_0^{fs/2} g(S_held(f)) df by the midpoint rule on a 0.01 Hz grid; S held at fMin below fMin. */
function integrateHeld(model: PsdModel, fs: number, g: (s: number) => number): number {
  const df = 0.01;
  let sum = 0;
  for (let f = df / 2; f < fs / 2; f += df) sum += g(model.evaluate(Math.max(f, model.fMinHz))) * df;
  return sum;
}

function variance(x: Float64Array): number {
  let s = 0;
  for (const v of x) s += v * v;
  return s / x.length;
}

describe("coloured Gaussian noise", () => {
  const fs = 4096;

  it("gives the same samples for the same seed and different ones for another seed", () => {
    const a = colouredNoise(ajith2011, 5000, fs, "same-seed");
    const b = colouredNoise(ajith2011, 5000, fs, "same-seed");
    const c = colouredNoise(ajith2011, 5000, fs, "other-seed");
    expect(a).toEqual(b);
    expect(a[100]).not.toBe(c[100]);
  });

  it("streams in chunks of any size to exactly the series one call gives (hence the same PSD)", () => {
    const whole = colouredNoise(ajith2011, 100_000, fs, "chunks");
    const stream = createNoiseStream({ psd: ajith2011, sampleRate: fs, seed: "chunks" });
    const rng = seedrandom("chunk-sizes");
    const parts: Float64Array[] = [];
    let got = 0;
    while (got < whole.length) {
      const n = Math.min(whole.length - got, Math.floor(rng() * 40_000));
      parts.push(stream.next(n));
      got += n;
    }
    expect(stream.position).toBe(whole.length);
    const joined = new Float64Array(whole.length);
    let off = 0;
    for (const p of parts) {
      joined.set(p, off);
      off += p.length;
    }
    expect(joined).toEqual(whole);
  });

  it("has variance ∫S df (with the hold below fMin) within 4 standard errors", () => {
    // For a Gaussian series of duration T with one-sided PSD S, the sample variance has
    // Var(σ̂²) = (2/N) Σ_τ R(τ)² = (1/T) ∫_0^{fs/2} S² df (Parseval; common practice, no source).
    const seconds = 128;
    for (const model of [ajith2011, dis2001, flatPsd(4e-46)]) {
      const x = colouredNoise(model, fs * seconds, fs, `variance-${model.name}`);
      const expected = integrateHeld(model, fs, (s) => s);
      const stdError = Math.sqrt(integrateHeld(model, fs, (s) => s * s) / seconds);
      expect(Math.abs(variance(x) - expected)).toBeLessThan(4 * stdError);
      // Well within float range: no astronomically large power from below fMin.
      expect(Math.sqrt(variance(x))).toBeLessThan(1e-19);
    }
  });

  it("reproduces the ajith2011 PSD in a Welch estimate within the statistical error", () => {
    // Statistical error: a mean of K Hann-windowed, 50%-overlapped periodograms has relative
    // variance (1 + 2·0.167²)/K = 1.056/K per bin (Welch, IEEE Trans. Audio Electroacoust. 15, 70
    // (1967)); neighbouring Hann bins are correlated (power correlation 4/9 at 1 bin, 1/36 at 2 bins;
    // from the window's DFT coefficients), so a band of M bins counts as M/1.944 independent ones.
    // Each 20 Hz band must agree with the model within 4σ of that error.
    const seconds = 256;
    const x = colouredNoise(ajith2011, fs * seconds, fs, "welch-ajith");
    const w = welchPsd(x, fs, { segmentLength: 4 * fs });
    expect(w.segments).toBe(127);
    const binsPerBand = Math.round(20 / w.df);
    const sigma = Math.sqrt((1.056 / w.segments) * (1.944 / binsPerBand));
    let worst = 0;
    let bands = 0;
    for (let f0 = 12; f0 + 20 <= 1900; f0 += 20) {
      const k0 = Math.round(f0 / w.df);
      let ratio = 0;
      for (let k = k0; k < k0 + binsPerBand; k++) ratio += w.psd[k] / ajith2011.evaluate(k * w.df);
      ratio /= binsPerBand;
      worst = Math.max(worst, Math.abs(ratio - 1) / sigma);
      bands++;
    }
    expect(bands).toBeGreaterThan(90);
    expect(worst).toBeLessThan(4);
  });

  it("holds the PSD at its fMinHz value below fMinHz (here dis2001 below 40 Hz)", () => {
    const x = colouredNoise(dis2001, fs * 64, fs, "hold-dis");
    const w = welchPsd(x, fs, { segmentLength: 4 * fs });
    let ratio = 0;
    let n = 0;
    for (let k = Math.round(5 / w.df); k < Math.round(35 / w.df); k++, n++) ratio += w.psd[k] / dis2001.evaluate(40);
    // 120 bins, 31 segments: σ ≈ √(1.056/31 · 1.944/120) ≈ 0.023.
    expect(Math.abs(ratio / n - 1)).toBeLessThan(0.1);
  });

  it("accepts a sampled PSD and an explicit fMinHz", () => {
    const df = 0.25;
    const psd = new Float64Array(8193);
    for (let k = 0; k < psd.length; k++) psd[k] = ajith2011.evaluate(Math.max(k * df, 20));
    const x = createNoiseStream({ psd: { df, psd }, sampleRate: fs, seed: "sampled", fMinHz: 20 }).next(fs * 64);
    const w = welchPsd(x, fs, { segmentLength: 4 * fs });
    let ratio = 0;
    let n = 0;
    for (let k = Math.round(100 / df); k < Math.round(1000 / df); k++, n++) ratio += w.psd[k] / psd[k];
    expect(Math.abs(ratio / n - 1)).toBeLessThan(0.02);
  });

  it("rejects bad arguments", () => {
    expect(() => colouredNoise(ajith2011, -1, fs, "x")).toThrow(/length/);
    expect(() => colouredNoise(ajith2011, 10, 0, "x")).toThrow(/sampleRate/);
    expect(() => createNoiseStream({ psd: ajith2011, sampleRate: fs, seed: "x" }).next(1.5)).toThrow(/count/);
    expect(() => createNoiseStream({ psd: ajith2011, sampleRate: fs, seed: "x", fMinHz: 5000 })).toThrow(/fMinHz/);
  });
});

import { describe, expect, it } from "vitest";
import { ajith2011, InputError } from "@chirpsieve/core";
import { createRealFft } from "../../packages/core/src/fft/create.js";
import { truncateInverseSpectrum } from "../../packages/core/src/noise/inverseSpectrumTruncation.js";
import { createRealInverseFft } from "../../packages/core/src/noise/realInverseFft.js";

const fs = 4096;
const n = 1 << 16; // 16 s segment, df = 1/16 Hz
const bins = n / 2 + 1;
const df = fs / n;

/** ajith2011 held at its 10 Hz value below 10 Hz, on the grid of an n-sample segment. */
function heldAjith(): Float64Array {
  const psd = new Float64Array(bins);
  for (let k = 0; k < bins; k++) psd[k] = ajith2011.evaluate(Math.max(k * df, 10));
  return psd;
}

/** Time-domain impulse response (length n, lag i and n − i are ±i) of a real zero-phase spectrum. */
function impulseResponse(spectrum: Float64Array): Float64Array {
  const interleaved = new Float64Array(n + 2);
  for (let k = 0; k < bins; k++) interleaved[2 * k] = spectrum[k];
  const r = new Float64Array(n);
  createRealInverseFft(n).inverse(interleaved, r);
  for (let i = 0; i < n; i++) r[i] /= n;
  return r;
}

describe("inverse spectrum truncation", () => {
  it("keeps a smooth PSD within 1% and makes the inverse-ASD filter exactly L samples long", () => {
    const psd = heldAjith();
    const L = 2 * fs; // 2 s
    const t = truncateInverseSpectrum(psd, { sampleRate: fs, lengthSeconds: 2 });
    expect(t.lengthSamples).toBe(L);
    expect(t.df).toBe(df);
    let worst = 0;
    for (let k = Math.round(15 / df); k < Math.round(2000 / df); k++) worst = Math.max(worst, Math.abs(t.psd[k] / psd[k] - 1));
    expect(worst).toBeLessThan(0.01);
    // The filter R̃ = 1/√S̃ in the time domain: zero for |lag| ≥ L/2 (to rounding).
    const r = impulseResponse(t.inverseAsd);
    let peak = 0;
    for (const v of r) peak = Math.max(peak, Math.abs(v));
    let outside = 0;
    for (let i = L / 2; i <= n - L / 2; i++) outside = Math.max(outside, Math.abs(r[i]));
    expect(outside / peak).toBeLessThan(1e-12);
    for (let k = 1; k < bins; k += 997) expect(t.psd[k]).toBeCloseTo(1 / (t.inverseAsd[k] * t.inverseAsd[k]), 60);
  });

  it("stays within a few % away from a sharp line and a low cutoff, and broadens the line", () => {
    const psd = heldAjith();
    const kLine = Math.round(60 / df);
    psd[kLine] *= 1e4; // one-bin line at 60 Hz
    const t = truncateInverseSpectrum(psd, { sampleRate: fs, lengthSamples: fs, fMinHz: 15 });
    expect(t.lengthSamples).toBe(fs);
    let worst = 0;
    for (let k = Math.round(25 / df); k < Math.round(2000 / df); k++) {
      if (Math.abs(k * df - 60) < 5) continue;
      worst = Math.max(worst, Math.abs(t.psd[k] / psd[k] - 1));
    }
    expect(worst).toBeLessThan(0.03);
    // The line is no longer a single bin: its neighbours 0.25 Hz away are raised.
    expect(t.psd[kLine + 4] / psd[kLine + 4]).toBeGreaterThan(1.05);
    // Time limit holds with the cutoff as well.
    const r = impulseResponse(t.inverseAsd);
    let peak = 0;
    for (const v of r) peak = Math.max(peak, Math.abs(v));
    let outside = 0;
    for (let i = fs / 2; i <= n - fs / 2; i++) outside = Math.max(outside, Math.abs(r[i]));
    expect(outside / peak).toBeLessThan(1e-12);
    // Without truncation the line's notch rings far beyond L/2: truncation did something.
    const full = impulseResponse(psd.map((s, k) => (k * df >= 15 ? 1 / Math.sqrt(s) : 0)));
    let fullOutside = 0;
    for (let i = fs / 2; i <= n - fs / 2; i++) fullOutside = Math.max(fullOutside, Math.abs(full[i]));
    expect(fullOutside / peak).toBeGreaterThan(1e-6);
  });

  it("rejects a grid that is not N/2 + 1 bins and a bad length", () => {
    const psd = heldAjith();
    expect(() => truncateInverseSpectrum(psd.subarray(0, 1000), { sampleRate: fs, lengthSamples: 64 })).toThrow(/N\/2 \+ 1 bins/);
    expect(() => truncateInverseSpectrum(psd, { sampleRate: fs, lengthSamples: 3 })).toThrow(/even number/);
    expect(() => truncateInverseSpectrum(psd, { sampleRate: fs, lengthSamples: 2 * n })).toThrow(InputError);
    expect(() => truncateInverseSpectrum(psd, { sampleRate: fs })).toThrow(/lengthSamples or lengthSeconds/);
  });
});

describe("the noise layer's inverse real FFT", () => {
  it("inverts createRealFft (N·x) to rounding", () => {
    for (const size of [4, 8, 64, 1024]) {
      const x = Float64Array.from({ length: size }, (_, i) => Math.sin(1.7 * i) + 0.01 * i * i);
      const spec = new Float64Array(size + 2);
      createRealFft(size).forward(x, spec);
      const back = new Float64Array(size);
      createRealInverseFft(size).inverse(spec, back);
      const scale = Math.max(...x.map(Math.abs));
      for (let i = 0; i < size; i++) expect(Math.abs(back[i] / size - x[i])).toBeLessThan(1e-13 * scale * Math.log2(size));
    }
  });
});

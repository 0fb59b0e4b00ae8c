import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { createComplexFft, createRealFft } from "@chirpsieve/core";

/** Naive O(N²) DFT, X[k] = Σ x[n] e^{−2πikn/N} (the definition; common practice, no source). */
function naiveDft(x: Float64Array, sign: -1 | 1): Float64Array {
  const n = x.length / 2;
  const out = new Float64Array(2 * n);
  for (let k = 0; k < n; k++) {
    let re = 0, im = 0;
    for (let j = 0; j < n; j++) {
      const a = (sign * 2 * Math.PI * ((k * j) % n)) / n;
      const c = Math.cos(a), s = Math.sin(a);
      re += x[2 * j] * c - x[2 * j + 1] * s;
      im += x[2 * j] * s + x[2 * j + 1] * c;
    }
    out[2 * k] = re;
    out[2 * k + 1] = im;
  }
  return out;
}

function maxRelError(a: Float64Array, b: Float64Array): number {
  let num = 0, den = 0;
  for (let i = 0; i < a.length; i++) {
    num = Math.max(num, Math.abs(a[i] - b[i]));
    den = Math.max(den, Math.abs(b[i]));
  }
  return num / den;
}

describe("fft.js backend against a naive DFT", () => {
  const rng = seedrandom("fft-check");
  const n = 256;
  const x = new Float64Array(2 * n).map(() => rng() - 0.5);

  it("forward agrees to < 1e-9 relative (double precision)", () => {
    const out = new Float64Array(2 * n);
    createComplexFft(n).forward(x, out);
    expect(maxRelError(out, naiveDft(x, -1))).toBeLessThan(1e-9);
  });

  it("unnormalised inverse agrees to < 1e-9 relative", () => {
    const out = new Float64Array(2 * n);
    createComplexFft(n).inverse(x, out);
    expect(maxRelError(out, naiveDft(x, 1))).toBeLessThan(1e-9);
  });

  it("real forward returns bins 0..N/2 of the complex transform", () => {
    const real = new Float64Array(n).map(() => rng() - 0.5);
    const cplx = new Float64Array(2 * n);
    for (let i = 0; i < n; i++) cplx[2 * i] = real[i];
    const want = naiveDft(cplx, -1).subarray(0, n + 2);
    const out = new Float64Array(n + 2);
    createRealFft(n).forward(real, out);
    expect(maxRelError(out, want)).toBeLessThan(1e-9);
  });
});

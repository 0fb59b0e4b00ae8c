import { beforeAll, describe, expect, it } from "vitest";
import { createComplexFft, loadFftBackends } from "@chirpsieve/core";
import { createRealFft } from "../../packages/core/src/fft/create.js";
import { type FftBackendName } from "../../packages/core/src/fft/types.js";
import { maxRelError, naiveDft, powersOfTwo, realToComplex, seededNoise } from "./dftReference.js";

// Tolerances on max|a − b| / max|b|: fft.js computes in double, pffft in single precision. For fft.js
// the worst case measured here is 3.9e-15 (N = 4096, most of it the naive DFT's own O(N ε) rounding),
// so 1e-13 is what double precision allows with margin; pffft's float32 needs 1e-4.
const backends: { name: FftBackendName; tolerance: number; minComplex: number; minReal: number }[] = [
  { name: "fftjs", tolerance: 1e-13, minComplex: 2, minReal: 2 },
  { name: "pffft", tolerance: 1e-4, minComplex: 16, minReal: 32 },
];

beforeAll(async () => {
  await loadFftBackends();
});

describe.each(backends)("$name against the naive DFT (the definition; common practice, no source)", (b) => {
  const sizes = powersOfTwo(Math.log2(b.minComplex), 12);

  it.each(sizes)(`forward of N = %i agrees within ${b.tolerance} relative`, (n) => {
    const x = seededNoise(`fft-forward-${n}`, 2 * n);
    const out = new Float64Array(2 * n);
    createComplexFft(n, b.name).forward(x, out);
    expect(maxRelError(out, naiveDft(x, -1))).toBeLessThan(b.tolerance);
  });

  it.each(sizes)(`unnormalised inverse of N = %i agrees within ${b.tolerance} relative`, (n) => {
    const x = seededNoise(`fft-inverse-${n}`, 2 * n);
    const out = new Float64Array(2 * n);
    createComplexFft(n, b.name).inverse(x, out);
    expect(maxRelError(out, naiveDft(x, 1))).toBeLessThan(b.tolerance);
  });

  it.each(powersOfTwo(Math.log2(b.minReal), 12))("real forward of N = %i returns bins 0..N/2 of the DFT", (n) => {
    const x = seededNoise(`fft-real-${n}`, n);
    const out = new Float64Array(n + 2);
    createRealFft(n, b.name).forward(x, out);
    expect(maxRelError(out, naiveDft(realToComplex(x), -1).subarray(0, n + 2))).toBeLessThan(b.tolerance);
    expect(out[1]).toBe(0);
    expect(out[n + 1]).toBe(0);
  });
});

describe.each(backends)("$name self-consistency", (b) => {
  it.each([16, 256, 4096, 65536])("inverse(forward(x)) = N·x for N = %i", (n) => {
    const fft = createComplexFft(n, b.name);
    const x = seededNoise(`fft-roundtrip-${n}`, 2 * n);
    const spectrum = new Float64Array(2 * n);
    const back = new Float64Array(2 * n);
    fft.forward(x, spectrum);
    fft.inverse(spectrum, back);
    for (let i = 0; i < back.length; i++) back[i] /= n;
    expect(maxRelError(back, x)).toBeLessThan(b.tolerance);
  });

  it.each([32, 1024, 65536])("real transform equals the complex transform of real input for N = %i", (n) => {
    const x = seededNoise(`fft-real-vs-complex-${n}`, n);
    const real = new Float64Array(n + 2);
    const full = new Float64Array(2 * n);
    createRealFft(n, b.name).forward(x, real);
    createComplexFft(n, b.name).forward(realToComplex(x), full);
    expect(maxRelError(real, full.subarray(0, n + 2))).toBeLessThan(b.tolerance);
  });

  it("reports its backend and precision", () => {
    const fft = createComplexFft(64, b.name);
    expect(fft.backend).toBe(b.name);
    expect(fft.precision).toBe(b.name === "pffft" ? "single" : "double");
    expect(createRealFft(64, b.name).backend).toBe(b.name);
  });
});

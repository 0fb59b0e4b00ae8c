import { beforeAll, describe, expect, it } from "vitest";
import { createComplexFft, createComplexPlan, loadFftBackends } from "@chirpsieve/core";
import { createRealFft } from "../../packages/core/src/fft/create.js";
import { maxRelError, powersOfTwo, seededNoise } from "../fft/dftReference.js";

// Second opinion: pffft vs fft.js, two independent FFT libraries (PFFFT by J. Pommier, an FFTPACK
// v4 adaptation compiled to WebAssembly, single precision; fft.js by F. Indutny, a pure-JS radix-4
// FFT, double precision). Agreement is judged against fft.js as the reference,
// max|a − b| / max|b| < 1e-4, the single-precision tolerance.
const TOLERANCE = 1e-4;

beforeAll(async () => {
  await loadFftBackends();
});

describe("second opinion: pffft vs fft.js, two independent FFT libraries", () => {
  it.each(powersOfTwo(4, 16))("complex forward and inverse agree for N = %i", (n) => {
    const x = seededNoise(`second-opinion-complex-${n}`, 2 * n);
    const a = new Float64Array(2 * n);
    const b = new Float64Array(2 * n);
    const pffft = createComplexFft(n, "pffft");
    const fftjs = createComplexFft(n, "fftjs");
    pffft.forward(x, a);
    fftjs.forward(x, b);
    expect(maxRelError(a, b)).toBeLessThan(TOLERANCE);
    pffft.inverse(x, a);
    fftjs.inverse(x, b);
    expect(maxRelError(a, b)).toBeLessThan(TOLERANCE);
  });

  it.each(powersOfTwo(5, 16))("real forward agrees for N = %i", (n) => {
    const x = seededNoise(`second-opinion-real-${n}`, n);
    const a = new Float64Array(n + 2);
    const b = new Float64Array(n + 2);
    createRealFft(n, "pffft").forward(x, a);
    createRealFft(n, "fftjs").forward(x, b);
    expect(maxRelError(a, b)).toBeLessThan(TOLERANCE);
  });

  it("the float32 plan of 2^18 points agrees with fft.js's float64 plan", () => {
    const n = 2 ** 18;
    const x = seededNoise("second-opinion-plan", 2 * n);
    const single = createComplexPlan(n, "pffft");
    const double = createComplexPlan(n, "fftjs");
    single.input.set(x);
    double.input.set(x);
    single.forward();
    double.forward();
    expect(maxRelError(single.output, double.output)).toBeLessThan(TOLERANCE);
    single.dispose();
    double.dispose();
  });
});

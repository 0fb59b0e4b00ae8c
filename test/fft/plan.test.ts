import { beforeAll, describe, expect, it } from "vitest";
import { InputError, createComplexFft, createComplexPlan, loadFftBackends } from "@chirpsieve/core";
import { createRealFft, createRealPlan } from "../../packages/core/src/fft/create.js";
import { type FftBackendName } from "../../packages/core/src/fft/types.js";
import { maxRelError, naiveDft, realToComplex, seededNoise } from "./dftReference.js";

beforeAll(async () => {
  await loadFftBackends();
});

/** The values a plan of this backend holds after `plan.input.set(x)` (float32 rounds). */
function stored(x: Float64Array, backend: FftBackendName): Float64Array {
  return backend === "pffft" ? Float64Array.from(Float32Array.from(x)) : x;
}

// pffft's plan and copy API run the same float32 transform on the same float32 input, so they
// agree exactly; fft.js's plan inverts via inverseTransform·N, its copy API via conjugation.
const backends: { name: FftBackendName; agreement: number; tolerance: number }[] = [
  { name: "fftjs", agreement: 1e-13, tolerance: 1e-13 }, // measured worst 1.6e-15 against the naive DFT
  { name: "pffft", agreement: 0, tolerance: 1e-4 },
];

describe.each(backends)("$name plan API", (b) => {
  it.each([16, 1024, 65536])("complex plan matches the copy API, forward and inverse, N = %i", (n) => {
    const x = stored(seededNoise(`plan-complex-${n}`, 2 * n), b.name);
    const plan = createComplexPlan(n, b.name);
    const copy = createComplexFft(n, b.name);
    const want = new Float64Array(2 * n);
    plan.input.set(x);

    plan.forward();
    copy.forward(x, want);
    expect(maxRelError(plan.output, want)).toBeLessThanOrEqual(b.agreement);

    plan.inverse();
    copy.inverse(x, want);
    expect(maxRelError(plan.output, want)).toBeLessThanOrEqual(b.agreement);
    expect(Array.from(plan.input)).toEqual(Array.from(x)); // input left unchanged
    plan.dispose();
  });

  it("complex plan forward agrees with the naive DFT (the definition; common practice, no source)", () => {
    const n = 512;
    const x = stored(seededNoise("plan-naive", 2 * n), b.name);
    const plan = createComplexPlan(n, b.name);
    plan.input.set(x);
    plan.forward();
    expect(maxRelError(plan.output, naiveDft(x, -1))).toBeLessThan(b.tolerance);
    plan.inverse();
    expect(maxRelError(plan.output, naiveDft(x, 1))).toBeLessThan(b.tolerance);
    plan.dispose();
  });

  it.each([32, 4096, 65536])("real plan matches the copy API and the complex transform, N = %i", (n) => {
    const x = stored(seededNoise(`plan-real-${n}`, n), b.name);
    const plan = createRealPlan(n, b.name);
    const want = new Float64Array(n + 2);
    plan.input.set(x);
    plan.forward();
    createRealFft(n, b.name).forward(x, want);
    expect(plan.output.length).toBe(n + 2);
    expect(maxRelError(plan.output, want)).toBeLessThanOrEqual(b.agreement);
    const full = new Float64Array(2 * n);
    createComplexFft(n, b.name).forward(realToComplex(x), full);
    expect(maxRelError(plan.output, full.subarray(0, n + 2))).toBeLessThan(b.tolerance);
    plan.dispose();
  });

  it("exposes size, backend, precision and buffers of the documented types", () => {
    const plan = createComplexPlan(64, b.name);
    expect(plan.size).toBe(64);
    expect(plan.backend).toBe(b.name);
    expect(plan.precision).toBe(b.name === "pffft" ? "single" : "double");
    expect(plan.input).toBeInstanceOf(b.name === "pffft" ? Float32Array : Float64Array);
    expect(plan.input.length).toBe(128);
    expect(plan.output.length).toBe(128);
    plan.dispose();
  });

  it("throws after dispose()", () => {
    const plan = createComplexPlan(64, b.name);
    plan.dispose();
    plan.dispose(); // twice is harmless
    expect(() => plan.forward()).toThrow(InputError);
    expect(() => plan.inverse()).toThrow(InputError);
    const real = createRealPlan(64, b.name);
    real.dispose();
    expect(() => real.forward()).toThrow(InputError);
  });
});

describe("pffft plan buffers across WebAssembly memory growth", () => {
  it("input/output getters stay live after another plan grows the memory", () => {
    const n = 256;
    const x = stored(seededNoise("plan-growth", 2 * n), "pffft");
    const plan = createComplexPlan(n, "pffft");
    const oldView = plan.input;
    oldView.set(x);
    // 2 × 2^21 complex floats (32 MiB) plus a work buffer: far beyond the 16 MiB initial heap.
    const big = createComplexPlan(2 ** 21, "pffft");
    expect(oldView.length).toBe(0); // the earlier view was detached by the growth
    expect(Array.from(plan.input)).toEqual(Array.from(x)); // the getter returns a live view
    plan.forward();
    expect(maxRelError(plan.output, naiveDft(x, -1))).toBeLessThan(1e-4);
    big.dispose();
    plan.dispose();
  });
});

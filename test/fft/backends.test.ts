import { describe, expect, it } from "vitest";
import { InputError, createComplexFft, createComplexPlan, loadFftBackends, resolveFftBackend } from "@chirpsieve/core";
import { availableFftBackends } from "../../packages/core/src/fft/backends.js";
import { createRealFft, createRealPlan } from "../../packages/core/src/fft/create.js";
import { type FftBackendName } from "../../packages/core/src/fft/types.js";

// vitest runs each test file in its own module graph, so nothing is loaded when this file starts;
// the tests below run in order.
describe("loading FFT backends", () => {
  it("before loading: only fft.js, auto is fft.js, pffft throws a clear InputError", () => {
    expect(availableFftBackends()).toEqual(["fftjs"]);
    expect(resolveFftBackend("auto")).toBe("fftjs");
    expect(() => resolveFftBackend("pffft")).toThrow(/await loadFftBackends\(\) first/);
    expect(() => createComplexFft(64, "pffft")).toThrow(InputError);
    expect(() => createComplexFft(64, "pffft")).toThrow(/not loaded/);
    expect(() => createRealFft(64, "pffft")).toThrow(/not loaded/);
    expect(() => createComplexPlan(64, "pffft")).toThrow(/not loaded/);
    expect(() => createRealPlan(64, "pffft")).toThrow(/not loaded/);
  });

  it("loads the wasm from the installed package (no network) and is idempotent", async () => {
    await Promise.all([loadFftBackends(), loadFftBackends()]);
    const plan = createComplexPlan(64, "pffft");
    await loadFftBackends();
    plan.input[2] = 1; // a unit impulse at n = 1: X[k] = e^{−2πik/64}
    plan.forward();
    expect(plan.output[2]).toBeCloseTo(Math.cos((2 * Math.PI) / 64), 6);
    expect(plan.output[3]).toBeCloseTo(-Math.sin((2 * Math.PI) / 64), 6);
    plan.dispose();
  });

  it("after loading: pffft is available and preferred by auto", () => {
    expect(availableFftBackends()).toEqual(["pffft", "fftjs"]);
    expect(resolveFftBackend("auto")).toBe("pffft");
    expect(resolveFftBackend("pffft")).toBe("pffft");
    expect(resolveFftBackend("fftjs")).toBe("fftjs");
  });

  it("rejects an unknown backend name with an InputError naming the choices", () => {
    expect(() => resolveFftBackend("fftw" as never)).toThrow(/"auto", "pffft" or "fftjs" \(got "fftw"\)/);
    expect(() => createComplexFft(64, "fftw" as never)).toThrow(InputError);
    expect(() => createComplexPlan(64, "fftw" as never)).toThrow(InputError);
  });
});

describe("FFT size validation", () => {
  const creators = { createComplexFft, createRealFft, createComplexPlan, createRealPlan };
  const backends: FftBackendName[] = ["fftjs", "pffft"];

  for (const [name, create] of Object.entries(creators)) {
    it.each(backends)(`${name} rejects sizes that are not powers of two (%s)`, async (backend) => {
      await loadFftBackends();
      for (const size of [0, 1, 3, 24, 48, 1000, 2.5, -16, Number.NaN, Infinity]) {
        expect(() => create(size, backend)).toThrow(InputError);
        expect(() => create(size, backend)).toThrow(/power of two/);
      }
    });
  }

  it("pffft needs N ≥ 16 complex and N ≥ 32 real (PFFFT's SIMD layout), and says so", async () => {
    await loadFftBackends();
    expect(() => createComplexFft(8, "pffft")).toThrow(/pffft backend \(complex\) must be a power of two ≥ 16 \(got 8\)/);
    expect(() => createComplexPlan(8, "pffft")).toThrow(InputError);
    expect(() => createRealFft(16, "pffft")).toThrow(/pffft backend \(real\) must be a power of two ≥ 32 \(got 16\)/);
    expect(() => createRealPlan(16, "pffft")).toThrow(InputError);
    // The module still works after those refusals (PFFFT's own assertion would have aborted it).
    expect(() => createComplexFft(16, "pffft")).not.toThrow();
    expect(() => createRealFft(32, "pffft")).not.toThrow();
  });

  it("pffft's copy API rejects arrays shorter than the transform", async () => {
    await loadFftBackends();
    const fft = createComplexFft(64, "pffft");
    expect(() => fft.forward(new Float64Array(64), new Float64Array(128))).toThrow(/input array must have length ≥ 128 \(got 64\)/);
    expect(() => fft.inverse(new Float64Array(128), new Float64Array(10))).toThrow(InputError);
    expect(() => createRealFft(64, "pffft").forward(new Float64Array(64), new Float64Array(64))).toThrow(/≥ 66/);
  });
});

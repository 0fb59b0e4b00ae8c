import { InputError } from "../errors.js";
import { createFftjsComplex, createFftjsComplexPlan, createFftjsReal, createFftjsRealPlan } from "./fftjs.js";
import { createPffftComplex, createPffftComplexPlan, createPffftReal, createPffftRealPlan } from "./pffft.js";
import type { ComplexFft, ComplexPlan, FftBackendName, RealFft, RealPlan } from "./types.js";

/**
 * Sizes are powers of two for every backend. fft.js accepts any power of two ≥ 2; pffft needs
 * ≥ 16 for complex and ≥ 32 for real transforms (checked in pffft.ts).
 */
function checkSize(size: number): void {
  if (!Number.isInteger(size) || size < 2 || (size & (size - 1)) !== 0) {
    throw new InputError(`FFT size must be a power of two ≥ 2 (got ${size})`);
  }
}

function unknownBackend(backend: unknown): InputError {
  return new InputError(`FFT backend must be "pffft" or "fftjs" (got ${JSON.stringify(backend)})`);
}

/**
 * A complex FFT plan of `size` points with the named backend (default fft.js). "pffft" needs
 * `await loadFftBackends()` first on this thread; its copy API converts float64 ↔ float32.
 */
export function createComplexFft(size: number, backend: FftBackendName = "fftjs"): ComplexFft {
  checkSize(size);
  if (backend === "fftjs") return createFftjsComplex(size);
  if (backend === "pffft") return createPffftComplex(size);
  throw unknownBackend(backend);
}

/** A real-input forward FFT plan of `size` points with the named backend (default fft.js). */
export function createRealFft(size: number, backend: FftBackendName = "fftjs"): RealFft {
  checkSize(size);
  if (backend === "fftjs") return createFftjsReal(size);
  if (backend === "pffft") return createPffftReal(size);
  throw unknownBackend(backend);
}

/**
 * A buffer-owning complex plan for hot loops (see ComplexPlan): float64 buffers for fft.js,
 * float32 views onto WebAssembly memory for pffft (no copies). Call dispose() when done.
 */
export function createComplexPlan(size: number, backend: FftBackendName): ComplexPlan {
  checkSize(size);
  if (backend === "fftjs") return createFftjsComplexPlan(size);
  if (backend === "pffft") return createPffftComplexPlan(size);
  throw unknownBackend(backend);
}

/** A buffer-owning real-input forward plan (see RealPlan). Call dispose() when done. */
export function createRealPlan(size: number, backend: FftBackendName): RealPlan {
  checkSize(size);
  if (backend === "fftjs") return createFftjsRealPlan(size);
  if (backend === "pffft") return createPffftRealPlan(size);
  throw unknownBackend(backend);
}

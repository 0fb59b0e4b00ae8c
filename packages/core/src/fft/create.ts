import { InputError } from "../errors.js";
import { createFftjsComplex, createFftjsReal } from "./fftjs.js";
import type { ComplexFft, FftBackendName, RealFft } from "./types.js";

function checkSize(size: number): void {
  if (!Number.isInteger(size) || size < 2 || (size & (size - 1)) !== 0) {
    throw new InputError(`FFT size must be a power of two ≥ 2 (got ${size})`);
  }
}

/** A complex FFT plan of `size` points with the named backend (default fft.js). */
export function createComplexFft(size: number, backend: FftBackendName = "fftjs"): ComplexFft {
  checkSize(size);
  if (backend === "fftjs") return createFftjsComplex(size);
  throw new InputError(`FFT backend "${backend}" is not available`);
}

/** A real-input forward FFT plan of `size` points with the named backend (default fft.js). */
export function createRealFft(size: number, backend: FftBackendName = "fftjs"): RealFft {
  checkSize(size);
  if (backend === "fftjs") return createFftjsReal(size);
  throw new InputError(`FFT backend "${backend}" is not available`);
}

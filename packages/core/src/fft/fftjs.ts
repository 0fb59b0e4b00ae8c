import FFT from "fft.js";
import { InputError } from "../errors.js";
import type { ComplexFft, ComplexPlan, RealFft, RealPlan } from "./types.js";

/** Complex FFT plan in double precision backed by fft.js (radix-4, pure JavaScript). */
export function createFftjsComplex(size: number): ComplexFft {
  const fft = new FFT(size);
  const scratch = new Float64Array(2 * size);
  return {
    size,
    backend: "fftjs",
    precision: "double",
    forward(input, output) {
      fft.transform(output, input);
    },
    inverse(input, output) {
      // Unnormalised inverse via conjugation: x = conj(FFT(conj(X))).
      for (let i = 0; i < 2 * size; i += 2) {
        scratch[i] = input[i];
        scratch[i + 1] = -input[i + 1];
      }
      fft.transform(output, scratch);
      for (let i = 1; i < 2 * size; i += 2) output[i] = -output[i];
    },
  };
}

/** Real-input forward FFT in double precision backed by fft.js. */
export function createFftjsReal(size: number): RealFft {
  const fft = new FFT(size);
  const full = new Float64Array(2 * size);
  return {
    size,
    backend: "fftjs",
    precision: "double",
    forward(input, output) {
      fft.realTransform(full, input);
      // realTransform fills bins 0..N/2 (the rest is the conjugate mirror, not needed).
      output.set(full.subarray(0, size + 2));
    },
  };
}

/** Buffer-owning complex plan in double precision backed by fft.js. */
export function createFftjsComplexPlan(size: number): ComplexPlan {
  const fft = new FFT(size);
  const input = new Float64Array(2 * size);
  const output = new Float64Array(2 * size);
  let disposed = false;
  return {
    size,
    backend: "fftjs",
    precision: "double",
    input,
    output,
    forward() {
      if (disposed) throw disposedError();
      fft.transform(output, input);
    },
    inverse() {
      if (disposed) throw disposedError();
      // fft.js's inverse divides by N; multiplying back by N = 2^k is exact in floating point.
      fft.inverseTransform(output, input);
      for (let i = 0; i < 2 * size; i++) output[i] *= size;
    },
    dispose() {
      disposed = true;
    },
  };
}

/** Buffer-owning real-input forward plan in double precision backed by fft.js. */
export function createFftjsRealPlan(size: number): RealPlan {
  const fft = new FFT(size);
  const input = new Float64Array(size);
  const output = new Float64Array(size + 2);
  // fft.js's realTransform needs a full 2·N output array even though it only fills bins 0..N/2.
  const full = new Float64Array(2 * size);
  let disposed = false;
  return {
    size,
    backend: "fftjs",
    precision: "double",
    input,
    output,
    forward() {
      if (disposed) throw disposedError();
      fft.realTransform(full, input);
      output.set(full.subarray(0, size + 2));
    },
    dispose() {
      disposed = true;
    },
  };
}

function disposedError(): InputError {
  return new InputError("FFT plan was used after dispose(); create a new plan");
}

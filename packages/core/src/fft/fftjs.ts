import FFT from "fft.js";
import type { ComplexFft, RealFft } from "./types.js";

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

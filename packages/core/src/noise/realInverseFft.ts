import { createComplexFft } from "../fft/create.js";
import type { ComplexFft, FftBackendName } from "../fft/types.js";

/**
 * Inverse of a real-input FFT of (even, power-of-two) size N, unnormalised like the complex
 * inverse in fft/types.ts: from bins X[0..N/2] (interleaved re, im; length N + 2) of a real
 * series it writes x[n] = Σ_{k=0}^{N−1} X[k] e^{+2πikn/N} (so inverse(forward(x)) = N·x), with
 * X[N−k] = conj(X[k]). The imaginary parts of X[0] and X[N/2] are ignored.
 *
 * Method (common practice, no source): with M = N/2, the even and odd samples are the inverse
 * M-point transforms of E[k] = X[k] + X[k+M] and O[k] = (X[k] − X[k+M]) e^{+2πik/N}, both of which
 * are Hermitian, so one complex inverse FFT of Z[k] = E[k] + i O[k] gives x[2m] + i x[2m+1].
 * Internal to the noise layer (the FFT interface has no inverse real transform yet).
 */
export interface RealInverseFft {
  readonly size: number;
  inverse(input: Float64Array, output: Float64Array): void;
}

/** `backend`: the complex FFT under it (default fft.js, double precision; pffft is single). */
export function createRealInverseFft(size: number, backend: FftBackendName = "fftjs"): RealInverseFft {
  const m = size / 2;
  const fft: ComplexFft = createComplexFft(m, backend);
  const z = new Float64Array(2 * m);
  const cosT = new Float64Array(m);
  const sinT = new Float64Array(m);
  for (let k = 0; k < m; k++) {
    cosT[k] = Math.cos((2 * Math.PI * k) / size);
    sinT[k] = Math.sin((2 * Math.PI * k) / size);
  }
  return {
    size,
    inverse(input: Float64Array, output: Float64Array): void {
      for (let k = 0; k < m; k++) {
        const ar = input[2 * k];
        const ai = k === 0 ? 0 : input[2 * k + 1];
        // X[k+M] = conj(X[M−k]); for k = 0 that is the (real) Nyquist bin.
        const br = input[2 * (m - k)];
        const bi = k === 0 ? 0 : -input[2 * (m - k) + 1];
        const er = ar + br;
        const ei = ai + bi;
        const dr = ar - br;
        const di = ai - bi;
        const orr = dr * cosT[k] - di * sinT[k];
        const oi = dr * sinT[k] + di * cosT[k];
        // Z = E + i·O
        z[2 * k] = er - oi;
        z[2 * k + 1] = ei + orr;
      }
      // The interleaved complex result (x[2m], x[2m+1]) is exactly the real series in order.
      fft.inverse(z, output);
    },
  };
}

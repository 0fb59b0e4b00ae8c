/** Names of the FFT backends the search can use. */
export type FftBackendName = "fftjs" | "pffft";

/**
 * A complex FFT plan of one size. Arrays are interleaved (re, im), length 2·size.
 * Convention (common practice, no source): forward X[k] = Σ_n x[n] e^{−2πikn/N};
 * inverse is unnormalised, x[n] = Σ_k X[k] e^{+2πikn/N} (so inverse(forward(x)) = N·x).
 * `input` and `output` must not be the same array. Plans are not thread-safe.
 */
export interface ComplexFft {
  readonly size: number;
  readonly backend: FftBackendName;
  readonly precision: "double" | "single";
  forward(input: Float64Array, output: Float64Array): void;
  inverse(input: Float64Array, output: Float64Array): void;
}

/**
 * A real-input forward FFT of one (even) size N: writes bins k = 0..N/2 of
 * X[k] = Σ_n x[n] e^{−2πikn/N}, interleaved, into `output` of length N + 2.
 */
export interface RealFft {
  readonly size: number;
  readonly backend: FftBackendName;
  readonly precision: "double" | "single";
  forward(input: Float64Array, output: Float64Array): void;
}

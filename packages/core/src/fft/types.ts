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

/** What a caller may ask for: a backend by name, or "auto" (pffft when loaded, else fft.js). */
export type FftBackendChoice = FftBackendName | "auto";

/**
 * A buffer-owning complex FFT plan of one size, for hot loops: write `input`, call `forward()` or
 * `inverse()`, read `output`. No copies and no allocation per call. Arrays are interleaved
 * (re, im), length 2·size, ordered as in {@link ComplexFft} (same sign and normalisation
 * convention; common practice, no source). `input` is left unchanged by a transform.
 *
 * For the pffft backend `input` and `output` are Float32Array views onto WebAssembly memory.
 * That memory grows when any pffft plan or buffer is created on the same thread, and growth
 * detaches every earlier view; the `input`/`output` getters always return a live view, so
 * read them again after creating another plan (do not keep a view across plan creation).
 * Plans are not thread-safe; call `dispose()` to free the WebAssembly buffers (a forgotten plan
 * is freed when garbage-collected). Using a plan after `dispose()` throws.
 */
export interface ComplexPlan {
  readonly size: number;
  readonly backend: FftBackendName;
  readonly precision: "double" | "single";
  /** Length 2·size, interleaved, owned by the plan. */
  readonly input: Float32Array | Float64Array;
  /** Length 2·size, interleaved, owned by the plan. */
  readonly output: Float32Array | Float64Array;
  /** output = DFT(input), X[k] = Σ_n x[n] e^{−2πikn/N}, ordered k = 0..N−1. */
  forward(): void;
  /** output = unnormalised inverse DFT(input), x[n] = Σ_k X[k] e^{+2πikn/N}. */
  inverse(): void;
  dispose(): void;
}

/**
 * A buffer-owning real-input forward FFT plan of one size N (see {@link ComplexPlan} for the
 * buffer rules): `input` has length N; `forward()` writes bins k = 0..N/2 of
 * X[k] = Σ_n x[n] e^{−2πikn/N}, interleaved and ordered, into `output` of length N + 2
 * (the imaginary parts of bins 0 and N/2 are written as 0).
 */
export interface RealPlan {
  readonly size: number;
  readonly backend: FftBackendName;
  readonly precision: "double" | "single";
  readonly input: Float32Array | Float64Array;
  readonly output: Float32Array | Float64Array;
  forward(): void;
  dispose(): void;
}

import { InputError } from "../errors.js";
import { createRealFft } from "../fft/create.js";
import type { FftBackendName, RealFft } from "../fft/types.js";
import { createRealInverseFft, type RealInverseFft } from "./realInverseFft.js";

/**
 * The transforms of the last size used, kept: a search truncates one PSD per segment, all of one size,
 * and building the tables of a 2^21-point transform costs more than running it.
 */
interface Plans {
  size: number;
  backend: FftBackendName;
  inverse: RealInverseFft;
  forward: RealFft;
  /** Work arrays of the two transforms (N + 2 and N samples), reused: zero-filling 2^22-sample arrays per segment costs tens of ms. */
  spec: Float64Array;
  r: Float64Array;
}
let plans: Plans | undefined;
function plansFor(size: number, backend: FftBackendName): Plans {
  if (plans?.size !== size || plans.backend !== backend) {
    plans = { size, backend, inverse: createRealInverseFft(size, backend), forward: createRealFft(size, backend), spec: new Float64Array(size + 2), r: new Float64Array(size) };
  }
  return plans;
}

export interface InverseSpectrumTruncationOptions {
  /** Sample rate of the series the PSD describes (Hz); the grid is df = fs/N, N = 2·(bins − 1). */
  sampleRate: number;
  /** Length of the inverse-ASD filter kept, in samples (even, 2 ≤ L ≤ N); or give `lengthSeconds`. */
  lengthSamples?: number;
  /** Length of the inverse-ASD filter kept, in seconds (rounded to an even number of samples). */
  lengthSeconds?: number;
  /** Bins below this frequency (Hz) get a zero inverse ASD before truncation (default 0). */
  fMinHz?: number;
  /**
   * FFT backend of the two transforms (default fft.js, double precision). pffft (single precision)
   * is ~6× faster at search sizes; its rounding (~1e-6 of the largest R̃) is far below what
   * a PSD estimate resolves.
   */
  backend?: FftBackendName;
}

export interface TruncatedPsd {
  /** The modified PSD S̃ = 1/R̃² on the input grid (+Infinity where R̃ = 0). */
  readonly psd: Float64Array;
  /** The truncated inverse ASD R̃(f_k), real (its impulse response is real and even). */
  readonly inverseAsd: Float64Array;
  readonly df: number;
  /** Length L of the inverse-ASD impulse response kept, in samples. */
  readonly lengthSamples: number;
}

/**
 * Inverse spectrum truncation (Allen et al., Phys. Rev. D 85, 122006 (2012), the section on
 * inverse spectrum truncation (section number from memory); common practice). The inverse
 * amplitude spectrum R(f) = 1/√S(f), set to zero below fMinHz and where S is not positive and
 * finite, is taken to the time domain (a real, even impulse response r[n] of N = 2·(bins − 1)
 * samples), kept only for |n| < L/2 with a half-Hann taper toward the cut, r[n]·½(1 + cos(2πn/L)),
 * set to zero elsewhere, and transformed back to R̃. The returned PSD S̃ = 1/R̃² is the given PSD
 * smoothed so that a whitening filter by R̃ spans L samples (lags −L/2 < n < L/2) and the
 * over-whitening filter 1/S̃ = R̃² about 2L, which bounds how much of each end of a circularly
 * filtered segment is corrupted by wrap-around. Away from sharp spectral features S̃ ≈ S; narrow
 * lines are broadened to ≈ fs/L. Below fMinHz S̃ is large or +Infinity (a filter integrating from
 * fMinHz ignores it).
 */
export function truncateInverseSpectrum(psd: Float64Array, options: InverseSpectrumTruncationOptions): TruncatedPsd {
  const { sampleRate } = options;
  if (!(psd instanceof Float64Array)) throw new InputError("inverse spectrum truncation: psd must be a Float64Array");
  const bins = psd.length;
  const n = 2 * (bins - 1);
  if (n < 4 || (n & (n - 1)) !== 0) {
    throw new InputError(`inverse spectrum truncation: psd must have N/2 + 1 bins with N a power of two ≥ 4 (got ${bins} bins)`);
  }
  if (!(sampleRate > 0) || !Number.isFinite(sampleRate)) {
    throw new InputError(`inverse spectrum truncation: sampleRate must be a positive number of Hz (got ${sampleRate})`);
  }
  let length: number;
  if (options.lengthSamples !== undefined) length = options.lengthSamples;
  else if (options.lengthSeconds !== undefined) length = 2 * Math.round((options.lengthSeconds * sampleRate) / 2);
  else throw new InputError("inverse spectrum truncation: give lengthSamples or lengthSeconds");
  if (!Number.isInteger(length) || length < 2 || length % 2 !== 0 || length > n) {
    throw new InputError(`inverse spectrum truncation: filter length must be an even number of samples in [2, ${n}] (got ${length})`);
  }
  const fLow = options.fMinHz ?? 0;
  if (!(fLow >= 0) || !Number.isFinite(fLow)) throw new InputError(`inverse spectrum truncation: fMinHz must be ≥ 0 (got ${fLow})`);
  const df = sampleRate / n;

  const { inverse, forward, spec, r } = plansFor(n, options.backend ?? "fftjs");
  for (let k = 0; k < bins; k++) {
    const s = psd[k];
    spec[2 * k] = k * df >= fLow && s > 0 && Number.isFinite(s) ? 1 / Math.sqrt(s) : 0;
    spec[2 * k + 1] = 0;
  }
  inverse.inverse(spec, r);
  const half = length / 2;
  for (let i = 0; i < n; i++) {
    const lag = i <= n / 2 ? i : n - i; // |n| of the even impulse response
    r[i] = lag < half ? (r[i] / n) * 0.5 * (1 + Math.cos((2 * Math.PI * lag) / length)) : 0;
  }
  forward.forward(r, spec);
  const inverseAsd = new Float64Array(bins);
  const out = new Float64Array(bins);
  for (let k = 0; k < bins; k++) {
    const q = spec[2 * k]; // the imaginary part is zero up to rounding: r̃ is real and even
    inverseAsd[k] = q;
    out[k] = q === 0 ? Infinity : 1 / (q * q);
  }
  return { psd: out, inverseAsd, df, lengthSamples: length };
}

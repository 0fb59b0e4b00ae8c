import { InputError } from "../errors.js";
import { createRealFft } from "../fft/create.js";
import { asPsdModel, isSampledPsd, type PsdInput } from "./interpolatePsd.js";
import { createRealInverseFft } from "./realInverseFft.js";

export interface WhitenOptions {
  /** Bins below this frequency (Hz) are set to zero (default 0). */
  fMinHz?: number;
  /** Bins above this frequency (Hz) are set to zero (default: none). */
  fMaxHz?: number;
}

/**
 * Whitens a series by a one-sided PSD: X = FFT(x), Y[k] = X[k] / √(S(f_k)·fs/2), y = IFFT(Y)/N.
 * For stationary noise with PSD S, E|X[k]|² = N·fs·S(f_k)/2 (one-sided convention), so E|Y[k]|² = N
 * and y has unit variance and a flat one-sided PSD 2/fs (common practice, no source). Bins below
 * fMinHz or above fMaxHz, and bins where S is not positive and finite (e.g. +Infinity outside a
 * table), are set to zero; the output variance is then the fraction of the band kept
 * (≈ 1 − 2·fMinHz/fs).
 *
 * The FFT is of the next power of two ≥ length, the series being zero-padded; the filtering is
 * circular, so samples within the whitening filter's length of either end are corrupted (truncate
 * the PSD's inverse spectrum to bound that length). A sampled PSD is interpolated onto the grid of
 * this FFT (see interpolatePsd).
 */
export function whiten(series: Float64Array, sampleRate: number, psd: PsdInput, options: WhitenOptions = {}): Float64Array {
  if (!(series instanceof Float64Array)) throw new InputError("whiten: series must be a Float64Array");
  if (series.length < 4) throw new InputError(`whiten: the series needs at least 4 samples (got ${series.length})`);
  if (!(sampleRate > 0) || !Number.isFinite(sampleRate)) throw new InputError(`whiten: sampleRate must be a positive number of Hz (got ${sampleRate})`);
  const fLow = options.fMinHz ?? 0;
  const fHigh = options.fMaxHz ?? Infinity;
  if (!(fLow >= 0)) throw new InputError(`whiten: fMinHz must be ≥ 0 (got ${fLow})`);
  if (!(fHigh > fLow)) throw new InputError(`whiten: fMaxHz must be above fMinHz (got ${fHigh} ≤ ${fLow})`);
  const model = asPsdModel(psd);
  let n = 4;
  while (n < series.length) n *= 2;
  const df = sampleRate / n;
  const padded = new Float64Array(n);
  padded.set(series);
  const spec = new Float64Array(n + 2);
  createRealFft(n).forward(padded, spec);
  const sampled = isSampledPsd(psd) ? psd : null;
  for (let k = 0; k <= n / 2; k++) {
    const f = k * df;
    // Same grid: use the bin directly (no interpolation).
    const s = sampled && sampled.df === df && k < sampled.psd.length ? sampled.psd[k] : model.evaluate(f);
    const keep = f >= fLow && f <= fHigh && s > 0 && Number.isFinite(s);
    const g = keep ? 1 / (Math.sqrt((s * sampleRate) / 2) * n) : 0;
    spec[2 * k] *= g;
    spec[2 * k + 1] *= g;
  }
  createRealInverseFft(n).inverse(spec, padded);
  return padded.slice(0, series.length);
}

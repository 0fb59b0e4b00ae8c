/**
 * The reduced output rate of one template. The SNR series of a template whose filter input is
 * non-zero only on bins [kFrom, kUse) of an N-point grid is z[j] = Σ_k q[k] e^{2πijk/N}; when
 * kUse ≤ M for a power of two M dividing N, the M-point inverse DFT of q[0..M) gives exactly
 * z[m·N/M] (the exponent 2πi(mN/M)k/N = 2πimk/M), i.e. z at a rate M/N of the data's.
 * The band is cut where the template has kept 1 − ε of its SNR² in the segment's PSD (the running
 * sums C of segmentWeights.ts: SNR² of the band [k₀, k) ∝ C[k] − C[k₀]), and M is chosen so that
 * the band fills at most {@link RATE_GUARD} of it, which leaves the guard band the sub-sample
 * interpolation of filter/bandLimitedPeaks.ts needs.
 */

/**
 * Default ε: the fraction of its SNR² a template may lose to the band cut. A signal matching the
 * template then keeps at least sqrt(1 − ε) = 0.9995 of its SNR (a loss of at most 0.05%).
 */
export const DEFAULT_BAND_POWER_LOSS = 1e-3;

/** Largest fraction of the reduced rate's bins [0, M) the template's band may occupy. */
export const RATE_GUARD = 0.875;

/** Shortest reduced series (samples): below it the saving is nothing and the interpolator's support would wrap. */
export const MIN_RATE_LENGTH = 256;

/** Where a template's band is cut and the length of its inverse FFT (written by {@link chooseOutputRate}). */
export interface OutputRate {
  /** One past the last bin used. */
  kUse: number;
  /** Inverse-FFT length M (a power of two, N/M an integer). */
  length: number;
}

/**
 * Chooses the band [kFrom, kUse) and the inverse-FFT length M of a template whose full band is
 * [kFrom, kTo) on an N-point grid, from the running sums C (C[k] − C[kFrom] ∝ SNR² below bin k):
 * the smallest cut k with C[k] − C[kFrom] ≥ (1 − ε)(C[kTo] − C[kFrom]), the smallest power of two
 * M ≥ k / RATE_GUARD (at least MIN_RATE_LENGTH, at most N), and kUse = min(kTo, ⌊RATE_GUARD·M⌋)
 * (bins that fit below the guard are kept: they cost nothing). With M = N the band is not cut.
 * No allocation: writes `out`.
 */
export function chooseOutputRate(cumulative: Float64Array, kFrom: number, kTo: number, loss: number, size: number, out: OutputRate): OutputRate {
  const c0 = cumulative[kFrom];
  const need = c0 + (1 - loss) * (cumulative[kTo] - c0);
  // Smallest k in (kFrom, kTo] with C[k] ≥ need (C is non-decreasing).
  let lo = kFrom + 1;
  let hi = kTo;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (cumulative[mid] >= need) hi = mid;
    else lo = mid + 1;
  }
  let m = MIN_RATE_LENGTH;
  while (m < size && RATE_GUARD * m < lo) m *= 2;
  if (m >= size) {
    out.length = size;
    out.kUse = kTo;
  } else {
    out.length = m;
    out.kUse = Math.min(kTo, Math.floor(RATE_GUARD * m));
  }
  return out;
}

/**
 * RMS bandwidth (Hz) of a template's SNR² about its mean frequency over bins [kFrom, kUse), from
 * the running sums C (weights C[k+1] − C[k] at f = k·df), sampled in at most 256 blocks: O(1) in
 * the band length. (Second moment of the power spectrum: common practice, no source.)
 */
export function bandSpreadHz(cumulative: Float64Array, kFrom: number, kUse: number, df: number): number {
  const span = kUse - kFrom;
  if (span <= 1) return 0;
  const step = Math.max(1, Math.ceil(span / 256));
  let w0 = 0;
  let w1 = 0;
  let w2 = 0;
  for (let k = kFrom; k < kUse; k += step) {
    const k1 = Math.min(kUse, k + step);
    const w = cumulative[k1] - cumulative[k];
    const f = 0.5 * (k + k1 - 1) * df;
    w0 += w;
    w1 += w * f;
    w2 += w * f * f;
  }
  if (!(w0 > 0)) return 0;
  const mean = w1 / w0;
  const blockVariance = (step * df) ** 2 / 12;
  return Math.sqrt(Math.max(0, w2 / w0 - mean * mean) + blockVariance);
}

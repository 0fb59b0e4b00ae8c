// Samples no detector can record: far above the noise of their segment.
import { selectInPlace } from "../noise/welch.js";

/**
 * A sample is corrupt when its magnitude exceeds this many times the segment's median absolute
 * sample (0.674 σ for Gaussian noise). 10⁸ is far beyond any signal or instrumental glitch we know of
 * (those reach 10²–10⁴ σ), and below where the single-precision FFT overflows: a sample 10^10 times
 * the noise makes the whitened spectrum X/S exceed 3.4e38 in float32 and the filter output turn to
 * NaN, which silently dropped every candidate of the segment. Ours; common practice, no source.
 */
export const CORRUPT_OVER_MEDIAN = 1e8;

/** Most samples the median magnitude is taken from (evenly strided): at a factor of 10⁸, a rough median is enough. */
const MEDIAN_SAMPLES = 65536;

/**
 * Median magnitude of `samples`, from at most MEDIAN_SAMPLES evenly strided samples (non-finite
 * ones count as larger than any finite one); 0 for an empty or mostly zero array.
 */
export function medianMagnitude(samples: Float64Array): number {
  const n = samples.length;
  if (n === 0) return 0;
  const stride = Math.ceil(n / MEDIAN_SAMPLES);
  const mags = new Float64Array(Math.ceil(n / stride));
  for (let i = 0, k = 0; i < n; i += stride, k++) {
    const m = Math.abs(samples[i]);
    mags[k] = m === m ? m : Infinity;
  }
  return selectInPlace(mags, mags.length >> 1);
}

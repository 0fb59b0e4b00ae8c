import ndarray from "ndarray";
import { InputError } from "../errors.js";
import { createRealFft } from "../fft/create.js";
import { resolveFftBackend } from "../fft/backends.js";
import type { SampledPsd } from "./interpolatePsd.js";

/** How the periodograms of the segments are combined. */
export type WelchAverage = "mean" | "median";

export interface WelchOptions {
  /** Samples per segment, a power of two ≥ 4. */
  segmentLength: number;
  /** Fraction of a segment shared with the next one, in [0, 1); default 0.5. */
  overlap?: number;
  /** "mean" (default) or "median" (bias-corrected; robust to glitches). */
  average?: WelchAverage;
  /**
   * Sample ranges [start, end) of `data` to estimate from (default: all of it). Segments are laid
   * in each range from its start and never cross its end, so samples outside every range (gaps,
   * bad data) are never used.
   */
  intervals?: readonly { readonly start: number; readonly end: number }[];
}

/**
 * Fewest samples in one Welch segment of a PSD estimate that a search or `psd` accepts: fewer give
 * a handful of bins, no spectrum to whiten with. Ours; common practice, no source.
 */
export const MIN_WELCH_SEGMENT_SAMPLES = 16;

/** A Welch PSD estimate: bin k at frequency k·df, k = 0…segmentLength/2. */
export interface WelchPsd extends SampledPsd {
  readonly frequencies: Float64Array;
  readonly psd: Float64Array;
  readonly df: number;
  /** Number of segments averaged. */
  readonly segments: number;
  readonly segmentLength: number;
  readonly average: WelchAverage;
}

/**
 * Expected median of K independent unit-mean exponential variables, by which a median of K
 * periodogram values is divided to estimate their mean. For odd K this is
 * β(K) = Σ_{l=1..K} (−1)^{l+1}/l (Allen et al., Phys. Rev. D 85, 122006 (2012), appendix;
 * → ln 2 as K → ∞). For even K we take the median as the mean of the two middle values, whose
 * expectation is H_K − H_{K/2} + 1/K (H_n the harmonic numbers), from the expected order
 * statistics of the exponential distribution E[X_(i)] = Σ_{j=K−i+1..K} 1/j (Rényi's
 * representation; David & Nagaraja, Order Statistics, 3rd ed. (2003), Sec. 2.5).
 * The two formulas agree: for odd K = 2m+1, Σ(−1)^{l+1}/l = H_K − H_m.
 */
export function medianBiasFactor(k: number): number {
  if (!Number.isInteger(k) || k < 1) throw new InputError(`medianBiasFactor: number of segments must be a positive integer (got ${k})`);
  if (k % 2 === 1) {
    let b = 0;
    for (let l = 1; l <= k; l++) b += (l % 2 === 1 ? 1 : -1) / l;
    return b;
  }
  let b = 1 / k;
  for (let j = k / 2 + 1; j <= k; j++) b += 1 / j;
  return b;
}

/**
 * Welch's method (Welch, IEEE Trans. Audio Electroacoust. 15, 70 (1967)): the series is cut into
 * segments of `segmentLength` samples overlapping by `overlap` (default 50%), each multiplied by a
 * Hann window w[n] = ½ − ½ cos(2πn/N), and the one-sided periodograms
 *   P[k] = 2 |X[k]|² / (fs Σ w²)   (0 < k < N/2; the DC and Nyquist bins without the factor 2)
 * are averaged by the mean, or by the median divided by {@link medianBiasFactor}. This window-power
 * normalisation makes white noise of variance σ² at rate fs come out at 2σ²/fs (common practice,
 * no source). Segments start at 0, step, 2·step… (in each of `intervals`, from its start) and
 * samples after the last whole segment are not used. The mean of each segment is not removed (the DC bin of a Hann window leaks only into bins
 * 0 and 1).
 */
export function welchPsd(data: Float64Array, sampleRate: number, options: WelchOptions): WelchPsd {
  const n = options.segmentLength;
  const overlap = options.overlap ?? 0.5;
  const average = options.average ?? "mean";
  if (!(data instanceof Float64Array)) throw new InputError("welchPsd: data must be a Float64Array");
  if (!(sampleRate > 0) || !Number.isFinite(sampleRate)) throw new InputError(`welchPsd: sampleRate must be a positive number of Hz (got ${sampleRate})`);
  if (!Number.isInteger(n) || n < 4 || (n & (n - 1)) !== 0) {
    throw new InputError(`welchPsd: segmentLength must be a power of two ≥ 4 samples (got ${n})`);
  }
  if (!(overlap >= 0 && overlap < 1)) throw new InputError(`welchPsd: overlap must be a fraction in [0, 1) (got ${overlap})`);
  if (average !== "mean" && average !== "median") throw new InputError(`welchPsd: average must be "mean" or "median" (got "${average}")`);
  if (data.length < n) {
    throw new InputError(`welchPsd: the series (${data.length} samples) is shorter than one segment (${n} samples)`);
  }
  const step = Math.max(1, Math.round(n * (1 - overlap)));
  const starts = segmentStarts(options.intervals ?? [{ start: 0, end: data.length }], data.length, n, step);
  const segments = starts.length;
  const bins = n / 2 + 1;

  const window = new Float64Array(n);
  let sumW2 = 0;
  for (let i = 0; i < n; i++) {
    const w = 0.5 - 0.5 * Math.cos((2 * Math.PI * i) / n);
    window[i] = w;
    sumW2 += w * w;
  }
  const fft = createRealFft(n, resolveFftBackend("auto"));
  const seg = new Float64Array(n);
  const spec = new Float64Array(n + 2);
  const scale = 2 / (sampleRate * sumW2);
  const psd = new Float64Array(bins);
  // For the median every periodogram is kept: a bins × segments matrix, row k holding bin k of
  // every segment, so that each bin's values are contiguous for the selection. The fill below
  // writes through the matrix's data and row stride (set(k, s, p) measured 1.1–1.2× slower there).
  const periodograms = average === "median" ? ndarray(new Float64Array(bins * segments), [bins, segments]) : null;
  const matrix = periodograms?.data;
  const rowStride = periodograms ? periodograms.stride[0] : 0;

  for (let s = 0; s < segments; s++) {
    const start = starts[s];
    for (let i = 0; i < n; i++) seg[i] = data[start + i] * window[i];
    fft.forward(seg, spec);
    const column = periodograms ? periodograms.index(0, s) : 0; // where segment s's column starts
    for (let k = 0; k < bins; k++) {
      const re = spec[2 * k];
      const im = spec[2 * k + 1];
      let p = (re * re + im * im) * scale;
      if (k === 0 || k === bins - 1) p *= 0.5;
      if (matrix) matrix[column + k * rowStride] = p;
      else psd[k] += p;
    }
  }
  if (periodograms) {
    const beta = medianBiasFactor(segments);
    const half = segments >> 1;
    for (let k = 0; k < bins; k++) {
      // Row k (stride 1) as a typed array for the selection.
      const rowStart = periodograms.index(k, 0);
      const v = periodograms.data.subarray(rowStart, rowStart + segments);
      const upper = selectInPlace(v, half);
      let med = upper;
      if (segments % 2 === 0) {
        // The other middle value is the largest of the lower part left by the selection.
        let lower = v[0];
        for (let i = 1; i < half; i++) if (v[i] > lower) lower = v[i];
        med = 0.5 * (lower + upper);
      }
      psd[k] = med / beta;
    }
  } else {
    for (let k = 0; k < bins; k++) psd[k] /= segments;
  }
  const df = sampleRate / n;
  const frequencies = new Float64Array(bins);
  for (let k = 0; k < bins; k++) frequencies[k] = k * df;
  return { frequencies, psd, df, segments, segmentLength: n, average };
}

/** First sample of every whole segment of n samples, `step` apart, inside each interval (checked here). */
function segmentStarts(intervals: readonly { readonly start: number; readonly end: number }[], length: number, n: number, step: number): number[] {
  const starts: number[] = [];
  for (const iv of intervals) {
    if (!(Number.isInteger(iv.start) && Number.isInteger(iv.end) && 0 <= iv.start && iv.start <= iv.end && iv.end <= length)) {
      throw new InputError(`welchPsd: an interval must be whole samples with 0 ≤ start ≤ end ≤ ${length} (got [${iv.start}, ${iv.end}))`);
    }
    for (let a = iv.start; a + n <= iv.end; a += step) starts.push(a);
  }
  if (starts.length === 0) throw new InputError(`welchPsd: no interval holds one segment (${n} samples)`);
  return starts;
}

/**
 * Rearranges v so that v[k] holds the value it would have if v were sorted, everything before it
 * is ≤ and everything after ≥ (Hoare's selection, "FIND", Commun. ACM 4, 321 (1961), with a
 * median-of-three pivot); returns v[k]. Expected O(n) instead of the O(n log n) of a full sort.
 */
export function selectInPlace(v: Float64Array, k: number): number {
  let lo = 0;
  let hi = v.length - 1;
  while (hi > lo) {
    const mid = (lo + hi) >> 1;
    // Median of three as the pivot, left at v[mid].
    if (v[mid] < v[lo]) swap(v, mid, lo);
    if (v[hi] < v[lo]) swap(v, hi, lo);
    if (v[hi] < v[mid]) swap(v, hi, mid);
    const pivot = v[mid];
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (v[i] < pivot) i++;
      while (v[j] > pivot) j--;
      if (i <= j) {
        swap(v, i, j);
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else break;
  }
  return v[k];
}

function swap(v: Float64Array, a: number, b: number): void {
  const t = v[a];
  v[a] = v[b];
  v[b] = t;
}

import type { RealFft } from "../fft/types.js";

/**
 * The per-segment quantities every template shares: the data spectrum weighted by the inverse
 * PSD, w[k] = d̃[k] / S_n(f_k), and 1/S_n itself, on bins k = 0..N/2 of a segment of N samples.
 * d̃[k] = Δt · DFT(d)[k] approximates the continuous transform ∫ d(t) e^{−2πift} dt
 * (the project's Fourier convention). Bins outside [kLow, kHigh) are zero, so they drop out of
 * every inner product. (Common practice, no source.)
 */
export interface SegmentSpectrum {
  /** Samples in the segment (a power of two). */
  readonly size: number;
  readonly sampleRate: number;
  /** Frequency resolution 1/T (Hz). */
  readonly df: number;
  /** First bin inside the analysis band (fmin). */
  readonly kLow: number;
  /** One past the last bin inside the band. */
  readonly kHigh: number;
  /** d̃[k]/S[k], interleaved complex, length N + 2. */
  readonly weighted: Float64Array;
  /** 1/S[k] (1/Hz⁻¹), zero outside the band, length N/2 + 1. */
  readonly inversePsd: Float64Array;
}

/**
 * Fills a SegmentSpectrum from a segment of strain and its one-sided PSD sampled on the same
 * bins (psd.length = N/2 + 1, 1/Hz). `spectrumScratch` (length N + 2) receives d̃; `out` is reused.
 */
export function computeSegmentSpectrum(
  segment: Float64Array,
  psd: Float64Array,
  sampleRate: number,
  fMinHz: number,
  fMaxHz: number,
  fft: RealFft,
  out: { weighted: Float64Array; inversePsd: Float64Array; spectrum: Float64Array },
): SegmentSpectrum {
  const n = segment.length;
  const nBins = n / 2 + 1;
  const df = sampleRate / n;
  const dt = 1 / sampleRate;
  const kLow = Math.max(1, Math.ceil(fMinHz / df));
  const kHigh = Math.min(nBins - 1, Math.floor(fMaxHz / df) + 1);
  fft.forward(segment, out.spectrum);
  const spec = out.spectrum;
  const w = out.weighted;
  const inv = out.inversePsd;
  w.fill(0);
  inv.fill(0);
  for (let k = kLow; k < kHigh; k++) {
    const s = psd[k];
    const is = s > 0 && Number.isFinite(s) ? 1 / s : 0;
    inv[k] = is;
    w[2 * k] = spec[2 * k] * dt * is;
    w[2 * k + 1] = spec[2 * k + 1] * dt * is;
  }
  return { size: n, sampleRate, df, kLow, kHigh, weighted: w, inversePsd: inv };
}

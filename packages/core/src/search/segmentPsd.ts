import { interpolatePsd } from "../noise/interpolatePsd.js";
import { truncateInverseSpectrum } from "../noise/inverseSpectrumTruncation.js";
import { welchPsd } from "../noise/welch.js";
import { nextPowerOfTwo } from "./segmentPlan.js";
import type { FftBackendName } from "../fft/types.js";
import type { PsdMethod } from "./types.js";

/**
 * The one-sided PSD (1/Hz) on the N/2 + 1 bins of an N-sample segment: a model evaluated at the
 * bins, or a Welch estimate (Hann, 50% overlap, mean or bias-corrected median) from the segment's
 * real data, interpolated onto the segment's grid; then inverse-spectrum truncated
 * (noise/inverseSpectrumTruncation.ts) so that the filter 1/S reaches at most `truncationSamples`
 * samples either way — the padding the segment plan leaves at each end of a segment. `backend`: the FFT
 * of the truncation (the search passes its own).
 */
export function segmentPsd(
  source: PsdMethod,
  segment: Float64Array,
  dataLength: number,
  sampleRate: number,
  size: number,
  fMinHz: number,
  truncationSamples: number,
  backend: FftBackendName = "fftjs",
): Float64Array {
  const nBins = size / 2 + 1;
  const df = sampleRate / size;
  let psd: Float64Array;
  if (source.kind === "model") {
    psd = interpolatePsd(source.model, df, nBins);
  } else {
    const welchLength = nextPowerOfTwo(Math.round(source.segmentSeconds * sampleRate));
    const est = welchPsd(segment.subarray(0, dataLength), sampleRate, { segmentLength: welchLength, average: source.average });
    psd = interpolatePsd(est, df, nBins);
  }
  const length = Math.min(size, 2 * Math.max(1, Math.floor(truncationSamples / 2)));
  return truncateInverseSpectrum(psd, { sampleRate, lengthSamples: length, fMinHz: fMinHz, backend }).psd;
}

import { interpolatePsd } from "../noise/interpolatePsd.js";
import { welchPsd } from "../noise/welch.js";
import { nextPowerOfTwo } from "./segmentPlan.js";
import type { PsdSource } from "./types.js";

/**
 * The one-sided PSD (1/Hz) on the N/2 + 1 bins of an N-sample segment: a model evaluated at the
 * bins, or a Welch estimate (Hann, 50% overlap, mean or bias-corrected median) from the segment's
 * real data, interpolated onto the segment's grid. The estimate's resolution sets the length of
 * the inverse-PSD filter, which the segment plan pads for.
 */
export function segmentPsd(
  source: PsdSource,
  segment: Float64Array,
  dataLength: number,
  sampleRate: number,
  size: number,
  _fMinHz: number,
  _truncationSamples: number,
): Float64Array {
  const nBins = size / 2 + 1;
  const df = sampleRate / size;
  if (source.kind === "model") return interpolatePsd(source.model, df, nBins);
  const welchLength = nextPowerOfTwo(Math.round(source.segmentSeconds * sampleRate));
  const est = welchPsd(segment.subarray(0, dataLength), sampleRate, { segmentLength: welchLength, average: source.average });
  return interpolatePsd(est, df, nBins);
}

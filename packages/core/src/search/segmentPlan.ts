import { InputError } from "../errors.js";

/** One analysis segment: N samples read from `start`, searched over [searchStart, searchEnd). */
export interface Segment {
  /** First sample of the segment in the series (may leave zero padding past the data's end). */
  readonly start: number;
  /** Samples of real data in the segment (≤ N; the rest is zero padding). */
  readonly dataLength: number;
  /** Absolute sample range whose SNR this segment reports (no filter wrap-around there). */
  readonly searchStart: number;
  readonly searchEnd: number;
}

export interface SegmentPlan {
  /** Samples per segment N (a power of two). */
  readonly size: number;
  /** Samples at the start of each segment corrupted by wrap-around of the template and the inverse-PSD filter. */
  readonly invalidStart: number;
  /** Samples at the end of each segment corrupted by the inverse-PSD filter. */
  readonly invalidEnd: number;
  readonly segments: readonly Segment[];
}

/**
 * Most samples in one analysis segment (2^23: 2048 s at 4096 Hz). A search holds a few dozen bytes
 * per segment sample and thread (data, spectrum, weights, SNR series), so this keeps a search
 * within a few GB. It bounds a segment length the caller asks for; the default length follows the
 * longest template (four times its padding, at least 64 s).
 */
export const MAX_SEGMENT_SAMPLES = 2 ** 23;

/** Smallest power of two ≥ n. */
export function nextPowerOfTwo(n: number): number {
  let p = 1;
  while (p < n) p *= 2;
  return p;
}

/**
 * Tiles a series of `length` samples with overlapping segments of `size` samples so that the
 * valid parts [start + invalidStart, start + size − invalidEnd) cover every searchable sample
 * exactly once. Circular correlation of a template of L samples corrupts the first L samples of
 * the SNR series; a truncated inverse-PSD filter of T samples corrupts T more at each end
 * (Allen et al., Phys. Rev. D 85, 122006 (2012), Sec. VII; common practice). The last segment is
 * aligned to the end of the data; a series shorter than one segment is zero-padded.
 */
export function planSegments(length: number, size: number, invalidStart: number, invalidEnd: number): SegmentPlan {
  if (!(size > 0) || (size & (size - 1)) !== 0) throw new InputError(`segment length must be a power of two samples (got ${size})`);
  const stride = size - invalidStart - invalidEnd;
  if (stride <= 0) {
    throw new InputError(
      `segment of ${size} samples is too short for templates needing ${invalidStart + invalidEnd} samples of padding; use a longer segment or a higher low-frequency cutoff`,
    );
  }
  const segments: Segment[] = [];
  // The end of the data is an edge like a segment's end: the inverse-PSD filter reaches past it.
  const lastSearchable = length - invalidEnd;
  if (length <= size) {
    const end = lastSearchable;
    if (end > invalidStart) segments.push({ start: 0, dataLength: length, searchStart: invalidStart, searchEnd: end });
    return { size, invalidStart, invalidEnd, segments };
  }
  let covered = invalidStart;
  for (let start = 0; covered < lastSearchable; start += stride) {
    const s = Math.min(start, length - size);
    const searchEnd = Math.min(s + size - invalidEnd, lastSearchable);
    if (searchEnd > covered) {
      segments.push({ start: s, dataLength: size, searchStart: covered, searchEnd });
      covered = searchEnd;
    }
    if (s === length - size) break;
  }
  return { size, invalidStart, invalidEnd, segments };
}

import { planSegments, type Segment } from "./segmentPlan.js";

/** A time interval [start, end) in seconds, in the input's own time base. */
export interface TimeInterval {
  readonly start: number;
  readonly end: number;
}

/** A stretch of an input left out of the search before any filtering, and why. */
export interface ExcludedRange {
  /** Sample range [start, end) of the input. */
  readonly start: number;
  readonly end: number;
  readonly reason: string;
}

/** What to leave out of an input before the search plans its segments. */
export interface StreamExclusions {
  /** Search only inside these intervals (all of the input when absent). */
  readonly analysisIntervals?: readonly TimeInterval[];
  /** Never search inside these intervals. */
  readonly excludedIntervals?: readonly TimeInterval[];
  /** Unusable samples (dataQuality.ts), each with its reason. */
  readonly badData?: readonly ExcludedRange[];
}

/** The segments of an input split into valid intervals, with the bookkeeping of what was lost. */
export interface StreamPlan {
  /** Samples per segment N (a power of two), shared by every interval. */
  readonly size: number;
  readonly invalidStart: number;
  readonly invalidEnd: number;
  /** Every segment of every valid interval, in time order (sample indices of the input). */
  readonly segments: readonly Segment[];
  /** The valid intervals [start, end) (samples), searched separately. */
  readonly intervals: readonly { readonly start: number; readonly end: number }[];
  /** What was left out, with reasons (ranges of different reasons may overlap). */
  readonly excluded: readonly ExcludedRange[];
  /** Samples left out (the union of `excluded`). */
  readonly excludedSamples: number;
  /** Samples inside valid intervals where no coalescence time can be searched (filter edges, intervals too short). */
  readonly edgeSamples: number;
  /** Samples whose coalescence times are searched. */
  readonly searchedSamples: number;
}

/** Sample range [from, to) of the samples i with start ≤ t_i < end, clamped to the input. */
export function intervalSamples(iv: TimeInterval, startTime: number, sampleRate: number, length: number): { start: number; end: number } {
  // A tolerance of 1e-6 sample keeps an interval edge that falls on a sample from slipping by rounding.
  const from = Math.ceil((iv.start - startTime) * sampleRate - 1e-6);
  const to = Math.ceil((iv.end - startTime) * sampleRate - 1e-6);
  return { start: Math.min(length, Math.max(0, from)), end: Math.min(length, Math.max(0, to)) };
}

/** The union of ranges, sorted and merged. */
function union(ranges: readonly { start: number; end: number }[]): { start: number; end: number }[] {
  const sorted = ranges.filter((r) => r.end > r.start).map((r) => ({ start: r.start, end: r.end })).sort((a, b) => a.start - b.start);
  const out: { start: number; end: number }[] = [];
  for (const r of sorted) {
    const last = out[out.length - 1];
    if (last && r.start <= last.end) last.end = Math.max(last.end, r.end);
    else out.push(r);
  }
  return out;
}

/**
 * The valid intervals of an input of `length` samples: what is left after leaving out everything
 * outside the analysis intervals, inside the excluded intervals, or unusable; and the stretches
 * left out, each with its reason, sorted by start.
 */
export function validIntervals(
  length: number,
  sampleRate: number,
  startTime: number,
  exclusions: StreamExclusions = {},
): { intervals: { start: number; end: number }[]; excluded: ExcludedRange[] } {
  const excluded: ExcludedRange[] = [];
  if (exclusions.analysisIntervals) {
    const inside = union(exclusions.analysisIntervals.map((iv) => intervalSamples(iv, startTime, sampleRate, length)));
    let at = 0;
    for (const r of inside) {
      if (r.start > at) excluded.push({ start: at, end: r.start, reason: "outside the analysis intervals" });
      at = r.end;
    }
    if (at < length) excluded.push({ start: at, end: length, reason: "outside the analysis intervals" });
  }
  for (const iv of exclusions.excludedIntervals ?? []) {
    const r = intervalSamples(iv, startTime, sampleRate, length);
    if (r.end > r.start) excluded.push({ ...r, reason: "excluded interval" });
  }
  for (const b of exclusions.badData ?? []) excluded.push(b);
  excluded.sort((a, b) => a.start - b.start || a.end - b.end);
  const intervals: { start: number; end: number }[] = [];
  let at = 0;
  for (const r of union(excluded)) {
    if (r.start > at) intervals.push({ start: at, end: r.start });
    at = Math.max(at, r.end);
  }
  if (at < length) intervals.push({ start: at, end: length });
  return { intervals, excluded };
}

/**
 * Leaves out of an input of `length` samples everything outside the analysis intervals, inside the
 * excluded intervals, or unusable (validIntervals), and tiles each remaining interval with segments of
 * `size` samples as planSegments does for a whole input: each interval loses `invalidStart`
 * samples at its start (the longest template and the inverse-PSD filter) and `invalidEnd` at its
 * end (the filter), the least the filter's wrap-around forces (Allen et al., Phys. Rev. D 85,
 * 122006 (2012), Sec. VII; common practice). An interval too short for both searches nothing.
 */
export function planStream(
  length: number,
  sampleRate: number,
  startTime: number,
  size: number,
  invalidStart: number,
  invalidEnd: number,
  exclusions: StreamExclusions = {},
): StreamPlan {
  const { intervals, excluded } = validIntervals(length, sampleRate, startTime, exclusions);
  const segments: Segment[] = [];
  let searched = 0;
  let valid = 0;
  for (const iv of intervals) {
    const len = iv.end - iv.start;
    valid += len;
    if (len <= invalidStart + invalidEnd) continue;
    const plan = planSegments(len, size, invalidStart, invalidEnd);
    for (const s of plan.segments) {
      segments.push({ start: s.start + iv.start, dataLength: s.dataLength, searchStart: s.searchStart + iv.start, searchEnd: s.searchEnd + iv.start });
      searched += s.searchEnd - s.searchStart;
    }
  }
  return {
    size,
    invalidStart,
    invalidEnd,
    segments,
    intervals,
    excluded,
    excludedSamples: length - valid,
    edgeSamples: valid - searched,
    searchedSamples: searched,
  };
}

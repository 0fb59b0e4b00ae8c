import { InputError } from "../errors.js";
import { JULIAN_YEAR } from "../physics/constants.js";

/** A false-alarm rate and the matching false-alarm probability. */
export interface FalseAlarm {
  /** False-alarm rate, per Julian year. */
  falseAlarmRatePerYear: number;
  /** True when nothing in the reference set was as loud: the rate is then an upper limit, 1 / T_reference. */
  falseAlarmRateIsUpperLimit: boolean;
  /** Probability of at least one noise event this loud in the foreground time: 1 − exp(−FAR · T_foreground). */
  falseAlarmProbability: number;
}

/**
 * False-alarm rate from a count of louder reference events: FAR = N_louder / T_reference.
 * When N_louder = 0 the rate is below the resolution of the reference set; it is reported as the
 * upper limit FAR < 1 / T_reference and flagged. (Choice: N_louder rather than N_louder + 1, so that
 * the rate is an unbiased estimate when N_louder > 0; the zero case is the flagged limit.)
 * The false-alarm probability over a foreground time T is 1 − exp(−FAR · T), the Poisson
 * probability of one or more noise events at least as loud (common practice, no source).
 * Times in seconds; the rate is returned per Julian year.
 */
export function falseAlarmFromCount(louderCount: number, referenceSeconds: number, foregroundSeconds: number): FalseAlarm {
  if (!Number.isInteger(louderCount) || louderCount < 0) throw new InputError(`louderCount must be a whole number ≥ 0 (got ${louderCount})`);
  if (!(referenceSeconds > 0) || !Number.isFinite(referenceSeconds)) throw new InputError(`referenceSeconds must be a positive number (got ${referenceSeconds})`);
  if (!(foregroundSeconds >= 0) || !Number.isFinite(foregroundSeconds)) throw new InputError(`foregroundSeconds must be a non-negative number (got ${foregroundSeconds})`);
  const upper = louderCount === 0;
  const ratePerSecond = (upper ? 1 : louderCount) / referenceSeconds;
  return {
    falseAlarmRatePerYear: ratePerSecond * JULIAN_YEAR,
    falseAlarmRateIsUpperLimit: upper,
    falseAlarmProbability: -Math.expm1(-ratePerSecond * foregroundSeconds),
  };
}

/** Number of entries of the ascending array `sorted` that are ≥ x (binary search). */
export function countAtLeast(sorted: Float64Array, x: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] < x) lo = mid + 1;
    else hi = mid;
  }
  return sorted.length - lo;
}

/** Number of entries of the ascending array `sorted` that are > x (binary search). */
export function countAbove(sorted: Float64Array, x: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] <= x) lo = mid + 1;
    else hi = mid;
  }
  return sorted.length - lo;
}

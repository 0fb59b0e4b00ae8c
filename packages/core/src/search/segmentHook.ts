import type { SearchPlan } from "./scan.js";
import type { Candidate, GateRecord, SkippedStretch } from "./types.js";

/** A window peak of one template in one segment, as the per-segment clustering sees it. */
export interface SegmentPeak {
  /** Peak time (s, file time base): the template's ISCO time, with the sub-sample offset. */
  readonly time: number;
  /** |z| at the peak sample (the value the per-segment clustering compares). */
  readonly snr: number;
  readonly templateIndex: number;
  /** Sample index of the peak within the segment. */
  readonly index: number;
}

/** What searchStrain reports to a {@link SegmentHook} after each segment it searched. */
export interface SegmentOutcome {
  /** Samples of the segment's searched range (searchEnd − searchStart), whether searched or skipped. */
  readonly searchSamples: number;
  /** Set when the segment was skipped (records of earlier versions; bad data are now left out before segments are planned). */
  readonly skipped?: SkippedStretch;
  /** Loud transients gated out of the segment before filtering. */
  readonly gates?: readonly GateRecord[];
  /** Window peaks of the templates filtered in this segment, before clustering. */
  readonly triggers: readonly SegmentPeak[];
  /** The survivors of the per-segment clustering of `triggers`, in its output order ... */
  readonly survivors: readonly SegmentPeak[];
  /** ... and their candidates (chi-squared and all), parallel to `survivors`. */
  readonly candidates: readonly Candidate[];
}

/**
 * Lets a caller run part of a search and record it segment by segment (sharding, resume; see
 * shardRun.ts). searchStrain asks which segments to search and which templates to filter in each,
 * and reports every searched segment's outcome before it moves on.
 */
export interface SegmentHook {
  /**
   * The plan the caller already made of this input with these options (planSearch): searchStrain
   * uses it instead of screening the input a second time.
   */
  readonly plan?: SearchPlan;
  /** Indices (ascending) of the segments to search, out of the plan's `total`. */
  segments(total: number): number[];
  /** Templates [from, to) of the bank to filter in segment `segment`. */
  templates(segment: number): { from: number; to: number };
  /** Called once per searched segment, in order; throwing stops the search. */
  done(segment: number, outcome: SegmentOutcome): void;
}

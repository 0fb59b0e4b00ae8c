import type { SegmentOutcome, SegmentPeak } from "../search/segmentHook.js";
import type { Candidate, GateRecord, SkippedStretch } from "../search/types.js";
import { MASS_KEY_RENAMES, withCurrentKeys } from "../io/renamedKeys.js";

/** A candidate as a shard records it: with the sample and the raw |z| the per-segment clustering used. */
export interface RecordedCandidate extends Candidate {
  /** Sample index of the peak within its segment. */
  sample: number;
  /** |z| at the peak sample (Candidate.snr is the interpolated peak value). */
  peakSnr: number;
}

/** A peak kept for merging: [time (s), |z| at the sample, templateIndex, sample]. */
export type RecordedPeak = [number, number, number, number];

/**
 * What a shard (or a resume journal) keeps of one segment it searched with templates
 * `templates[0]..templates[1]`: enough to reproduce, together with the other shards' records of
 * the same segment, the per-segment clustering of a run over the whole bank exactly.
 */
export interface SegmentRecord {
  type: "segment";
  /** Index of the input file in the run. */
  input: number;
  /** Segment index within that input's plan. */
  segment: number;
  /** First and last template filtered (inclusive). */
  templates: [number, number];
  /** Samples of the segment's searched range (analysed, or skipped when `skipped` is set). */
  searchSamples: number;
  skipped?: SkippedStretch;
  /** Loud transients gated out of the segment before filtering. */
  gates?: GateRecord[];
  /** Survivors of the clustering over this record's templates, in its output order. */
  candidates: RecordedCandidate[];
  /**
   * Present when `templates` is not the whole bank: the peaks that can decide the clustering
   * over the whole bank (see {@link decidingPeaks}); includes every candidate's peak.
   */
  peaks?: RecordedPeak[];
}

/**
 * A segment record as read back from a journal or a shard's record file, its candidates' mass keys
 * under their current names (records written before the masses carried their unit use primaryMass,
 * secondaryMass and chirpMass).
 */
export function segmentRecordWithCurrentKeys(value: unknown): SegmentRecord {
  const rec = value as Record<string, unknown> | null;
  if (rec === null || typeof rec !== "object" || !Array.isArray(rec.candidates)) return value as SegmentRecord;
  return { ...rec, candidates: rec.candidates.map((c) => withCurrentKeys(c, MASS_KEY_RENAMES)) } as unknown as SegmentRecord;
}

/** Safety margin (s) on interval coverage: above the rounding of time differences near `scale`. */
function coverageMargin(scale: number): number {
  return 1e-9 + 16 * Number.EPSILON * scale;
}

/**
 * The peaks of one segment that can decide clusterByTime over a larger set, from one subset of
 * the bank. clusterByTime keeps an item iff no item within ±W is louder (ties: earlier in the
 * input order, here (templateIndex, sample)); a dropped item still drops its quieter neighbours,
 * so the subset's survivors alone are not enough to reproduce the whole-bank clustering. A peak p
 * may be dropped here when the ±W interval around it (widened by a rounding margin) is already
 * covered by the ±W intervals (narrowed by the margin) of louder kept peaks of the same subset:
 * any peak q that p beats lies within W of p, hence within W of one of those, which beats q too.
 * Peaks are taken loudest first; survivors of the subset clustering are always kept (a survivor
 * is never covered, and every whole-bank survivor survives its subset). What is left is a few
 * peaks per window, not one per template. Derived here for exact merging; no source.
 */
export function decidingPeaks(triggers: readonly SegmentPeak[], survivors: readonly SegmentPeak[], windowSeconds: number): SegmentPeak[] {
  if (triggers.length === 0) return [];
  const order = triggers.map((_, i) => i);
  order.sort((a, b) => {
    const p = triggers[a];
    const q = triggers[b];
    return q.snr - p.snr || p.templateIndex - q.templateIndex || p.index - q.index;
  });
  const must = new Set<string>();
  for (const s of survivors) must.add(`${s.templateIndex}:${s.index}`);
  let scale = windowSeconds;
  for (const t of triggers) scale = Math.max(scale, Math.abs(t.time) + windowSeconds);
  const m = coverageMargin(scale);
  const w = windowSeconds;
  // Disjoint closed intervals [lo[j], hi[j]], sorted.
  const lo: number[] = [];
  const hi: number[] = [];
  /** Index of the last interval with lo ≤ x, or −1. */
  const find = (x: number): number => {
    let a = 0;
    let b = lo.length - 1;
    let r = -1;
    while (a <= b) {
      const mid = (a + b) >> 1;
      if (lo[mid] <= x) {
        r = mid;
        a = mid + 1;
      } else b = mid - 1;
    }
    return r;
  };
  const insert = (a: number, b: number): void => {
    let j = find(a);
    if (j >= 0 && hi[j] >= a) {
      a = lo[j];
      b = Math.max(b, hi[j]);
    } else j++;
    // Swallow every following interval that starts at or before b.
    let k = j;
    while (k < lo.length && lo[k] <= b) {
      b = Math.max(b, hi[k]);
      k++;
    }
    lo.splice(j, k - j, a);
    hi.splice(j, k - j, b);
  };
  const kept: SegmentPeak[] = [];
  for (const i of order) {
    const p = triggers[i];
    const j = find(p.time - w - m);
    const covered = j >= 0 && hi[j] >= p.time + w + m;
    if (covered && !must.has(`${p.templateIndex}:${p.index}`)) continue;
    kept.push(p);
    if (w > m) insert(p.time - w + m, p.time + w - m);
  }
  kept.sort((a, b) => a.templateIndex - b.templateIndex || a.index - b.index);
  return kept;
}

/**
 * The record of one searched segment. `templates` is the inclusive range filtered; the deciding
 * peaks are kept only when it is not the whole bank of `templateCount` templates.
 */
export function segmentRecord(
  input: number,
  segment: number,
  templates: readonly [number, number],
  templateCount: number,
  windowSeconds: number,
  outcome: SegmentOutcome,
): SegmentRecord {
  const candidates: RecordedCandidate[] = outcome.candidates.map((c, k) => ({
    ...c,
    sample: outcome.survivors[k].index,
    peakSnr: outcome.survivors[k].snr,
  }));
  const record: SegmentRecord = {
    type: "segment",
    input,
    segment,
    templates: [templates[0], templates[1]],
    searchSamples: outcome.searchSamples,
    candidates,
  };
  if (outcome.skipped) record.skipped = { ...outcome.skipped };
  if (outcome.gates && outcome.gates.length > 0) record.gates = outcome.gates.map((g) => ({ ...g }));
  if (templates[0] > 0 || templates[1] < templateCount - 1) {
    record.peaks = decidingPeaks(outcome.triggers, outcome.survivors, windowSeconds).map((p) => [p.time, p.snr, p.templateIndex, p.index]);
  }
  return record;
}

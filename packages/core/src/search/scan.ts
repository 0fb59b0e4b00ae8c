import { InputError, parameterError } from "../errors.js";
import type { FftBackendName } from "../fft/types.js";
import { MAX_SEGMENT_SAMPLES, nextPowerOfTwo, planSegments, type Segment, type SegmentPlan } from "./segmentPlan.js";
import { MIN_WELCH_SEGMENT_SAMPLES } from "../noise/welch.js";
import { badDataError, describeBadStretch, screenInput } from "./dataQuality.js";
import { planStream, validIntervals, type ExcludedRange, type StreamPlan } from "./streamPlan.js";
import { defaultSearchThreads, maxSearchThreads } from "./workerPool.js";
import { templateDurationSeconds } from "./templateTiming.js";
import type { GateRecord, SearchInput, SearchOptions, SearchSummary, SkippedStretch } from "./types.js";

/** Checks search options once, at the door. */
export function validateSearchOptions(o: SearchOptions, sampleRate: number): void {
  if (o.templates.length === 0) throw new InputError("the template bank is empty");
  for (const [i, t] of o.templates.entries()) {
    if (!(t.primaryMassSolar > 0) || !(t.secondaryMassSolar > 0) || !Number.isFinite(t.primaryMassSolar + t.secondaryMassSolar)) {
      throw new InputError(`template ${i}: masses must be positive numbers`);
    }
    for (const s of [t.primarySpin ?? 0, t.secondarySpin ?? 0]) {
      if (!(Math.abs(s) < 1)) throw new InputError(`template ${i}: aligned spins must lie strictly between −1 and 1 (got ${s})`);
    }
  }
  if (!(o.fMinHz > 0)) throw parameterError("fMinHz", `must be a positive frequency (got ${o.fMinHz})`);
  if (o.fMinHz >= sampleRate / 2) {
    throw parameterError("fMinHz", `${o.fMinHz} Hz is at or above the Nyquist frequency ${sampleRate / 2} Hz of the data`);
  }
  if (!(o.snrThreshold > 0)) throw parameterError("snrThreshold", `must be positive (got ${o.snrThreshold})`);
  if (!Number.isInteger(o.chi2Bands) || o.chi2Bands < 0 || o.chi2Bands === 1) {
    throw parameterError("chi2Bands", `must be 0 (off) or an integer ≥ 2 (got ${o.chi2Bands})`);
  }
  if (!(o.loudestWithinSeconds > 0)) throw parameterError("loudestWithinSeconds", `the span kept to its loudest peak must be positive (got ${o.loudestWithinSeconds})`);
  if (o.chi2Allowance !== undefined && !(o.chi2Allowance >= 0 && Number.isFinite(o.chi2Allowance))) {
    throw parameterError("chi2Allowance", `must be a number ≥ 0 (got ${o.chi2Allowance})`);
  }
  if (o.bandPowerLoss !== undefined && !(o.bandPowerLoss > 0 && o.bandPowerLoss <= 0.1)) {
    throw new InputError(`the fraction of SNR² a template may lose to its output rate must be in (0, 0.1] (got ${o.bandPowerLoss})`);
  }
  if (o.threads !== undefined && !(Number.isInteger(o.threads) && o.threads >= 1)) {
    throw parameterError("threads", `must be a positive integer (got ${o.threads})`);
  }
  if (o.psd.kind === "estimate") {
    // Welch needs segments of a few samples at least, and bins finer than the lowest frequency searched.
    const seconds = o.psd.segmentSeconds;
    const samples = Math.round(seconds * sampleRate);
    if (!(samples >= MIN_WELCH_SEGMENT_SAMPLES)) {
      throw parameterError("psd.segmentSeconds", `${seconds} s is ${samples} samples at ${sampleRate} Hz; the PSD estimate needs at least ${MIN_WELCH_SEGMENT_SAMPLES}`);
    }
    if (!(1 / seconds <= o.fMinHz)) {
      throw parameterError(
        "psd.segmentSeconds",
        `${seconds} s gives PSD bins ${(1 / seconds).toPrecision(3)} Hz wide, coarser than the low-frequency cutoff ${o.fMinHz} Hz; use at least ${(1 / o.fMinHz).toPrecision(3)} s`,
      );
    }
  }
}


/** Segment length and the padding each segment loses at its ends, for a search of `length` samples. */
export interface SegmentLayout {
  readonly size: number;
  readonly invalidStart: number;
  readonly invalidEnd: number;
  /** Why no segment fits in `length` samples (when set, nothing can be searched). */
  readonly unsearchable?: string;
  /** What needs most of the length: the longest template, or the inverse-PSD filter (an estimate's segment). */
  readonly limitedBy: "template" | "filter";
}

/** Longest template (s) of the bank from fmin. */
function longestTemplateSeconds(o: SearchOptions): number {
  let longest = 0;
  for (const t of o.templates) longest = Math.max(longest, templateDurationSeconds(t.primaryMassSolar, t.secondaryMassSolar, o.fMinHz));
  return longest;
}

/**
 * Chooses the segment length for data whose longest stretch is `length` samples, from the longest
 * template and the inverse-PSD filter length. A segment length the caller asked for that cannot
 * hold both is an InputError; data too short for them is reported in `unsearchable`.
 */
export function chooseSegmentLayout(o: SearchOptions, sampleRate: number, length: number): SegmentLayout {
  const longest = longestTemplateSeconds(o);
  const truncSeconds = truncationSeconds(o);
  const invalidStart = Math.ceil((longest + truncSeconds) * sampleRate);
  const invalidEnd = Math.ceil(truncSeconds * sampleRate);
  let size: number;
  if (o.segmentSeconds !== undefined) {
    // Never longer than the data needs (zero padding beyond it buys nothing), nor than MAX_SEGMENT_SAMPLES.
    size = Math.min(nextPowerOfTwo(Math.round(o.segmentSeconds * sampleRate)), Math.max(nextPowerOfTwo(length), nextPowerOfTwo(invalidStart + invalidEnd + 1)));
    if (size > MAX_SEGMENT_SAMPLES) {
      throw parameterError("segmentSeconds", `${o.segmentSeconds} s at ${sampleRate} Hz is more than ${MAX_SEGMENT_SAMPLES} (2^23) samples per segment; use a shorter segment`);
    }
  } else {
    // Four times the padding keeps ≥ ~3/4 of each segment searchable; at least 64 s.
    size = nextPowerOfTwo(Math.max(4 * (invalidStart + invalidEnd), 64 * sampleRate));
    size = Math.min(size, Math.max(nextPowerOfTwo(length), 1));
  }
  const limitedBy = o.psd.kind === "estimate" && 2 * truncSeconds > longest ? "filter" : "template";
  const need = `templates need ${(longest + truncSeconds).toFixed(1)} s of data before a coalescence (the longest, ${longest.toFixed(1)} s from ${o.fMinHz} Hz, and the inverse-PSD filter) and ${truncSeconds.toFixed(1)} s after`;
  if (size <= invalidStart + invalidEnd) {
    if (o.segmentSeconds !== undefined) {
      throw new InputError(`a segment of ${(size / sampleRate).toFixed(1)} s is too short: ${need}; use a longer segment`);
    }
    return { size: Math.max(size, 2), invalidStart, invalidEnd, limitedBy, unsearchable: `${(length / sampleRate).toFixed(1)} s of data is too short to search: ${need}` };
  }
  if (length <= invalidStart + invalidEnd) {
    return { size, invalidStart, invalidEnd, limitedBy, unsearchable: `${(length / sampleRate).toFixed(1)} s of data is too short to search: ${need}` };
  }
  return { size, invalidStart, invalidEnd, limitedBy };
}

/**
 * Chooses the segment plan for a whole clean series of `length` samples (no exclusions): the
 * layout of chooseSegmentLayout tiled by planSegments. Data too short to search is an InputError.
 */
export function chooseSegmentPlan(o: SearchOptions, sampleRate: number, length: number): SegmentPlan {
  const layout = chooseSegmentLayout(o, sampleRate, length);
  if (layout.unsearchable) throw new InputError(`${layout.unsearchable}; raise the low-frequency cutoff, use heavier masses or longer data`);
  return planSegments(length, layout.size, layout.invalidStart, layout.invalidEnd);
}

/** A search's plan of one input: its bad data, what is left out, and the segments of the rest. */
export interface SearchPlan extends StreamPlan {
  /** Why nothing can be searched, when `segments` is empty. */
  readonly unsearchable?: string;
  /** What needs most of a segment: the longest template, or the inverse-PSD filter. */
  readonly limitedBy: "template" | "filter";
}

/**
 * Plans the search of one input: screens it for unusable samples (dataQuality.ts; an InputError
 * naming the input and the first bad stretch when `badData` is "reject"), leaves out those stretches
 * and the excluded or non-analysis intervals, and tiles each remaining interval with segments
 * (streamPlan.ts) of one length chosen for the longest interval.
 */
export async function planSearch(source: SearchInput, o: SearchOptions): Promise<SearchPlan> {
  const fs = source.sampleRate;
  const policy = o.badData ?? "reject";
  const bad = policy === "ignore" ? [] : await screenInput(source);
  if (bad.length > 0 && policy === "reject") throw badDataError(source, bad);
  const badData: ExcludedRange[] = bad.map((b) => ({ start: b.start, end: b.end, reason: describeBadStretch(b) }));
  const exclusions = { analysisIntervals: o.analysisIntervals, excludedIntervals: o.excludedIntervals, badData };
  // The segment length follows the longest valid interval: plan once to find the intervals.
  const longest = validIntervals(source.length, fs, source.startTime, exclusions).intervals.reduce((m, iv) => Math.max(m, iv.end - iv.start), 0);
  const layout = chooseSegmentLayout(o, fs, Math.max(longest, 1));
  const plan = planStream(source.length, fs, source.startTime, layout.size, layout.invalidStart, layout.invalidEnd, exclusions);
  if (plan.segments.length > 0) return { ...plan, limitedBy: layout.limitedBy };
  const why = longest === 0 ? "nothing is left after the exclusions" : (layout.unsearchable ?? "no valid interval is long enough to search");
  return { ...plan, unsearchable: why, limitedBy: layout.limitedBy };
}

/** Length (s) of the inverse-PSD filter the segments are padded for. */
export function truncationSeconds(o: SearchOptions): number {
  return o.truncationSeconds ?? (o.psd.kind === "estimate" ? o.psd.segmentSeconds : 2);
}

/** Below this many template-samples (templates × segments × N) the default is one thread. */
const SMALL_JOB = 2 ** 25;

/**
 * Threads a search uses: the caller's `threads` (at most one per template), else
 * defaultSearchThreads() unless the whole job is so small (< 2^25 template-samples, ~0.2 s of
 * FFTs) that starting workers would cost more than they save.
 */
export function searchThreads(o: SearchOptions, plan: { segments: readonly Segment[]; size: number }): number {
  const count = o.templates.length;
  if (o.threads !== undefined) return Math.min(o.threads, maxSearchThreads(), count);
  if (count * plan.segments.length * plan.size < SMALL_JOB) return 1;
  return Math.min(defaultSearchThreads(), count);
}

/** What a search of one input covered: its plan's bookkeeping and what the run measured. */
export function searchSummary(
  source: SearchInput,
  options: SearchOptions,
  plan: SearchPlan,
  run: { analysedSamples: number; gates: GateRecord[]; threads: number; backend: FftBackendName; wallSeconds: number },
): SearchSummary {
  const fs = source.sampleRate;
  return {
    file: source.file,
    templates: options.templates.length,
    segments: plan.segments.length,
    segmentSamples: plan.size,
    sampleRate: fs,
    analysedSeconds: run.analysedSamples / fs,
    dataSeconds: source.length / fs,
    leadInSeconds: plan.invalidStart / fs,
    tailSeconds: plan.invalidEnd / fs,
    skippedSeconds: plan.excludedSamples / fs,
    skipped: plan.excluded.map((r): SkippedStretch => ({ startTime: source.startTime + r.start / fs, endTime: source.startTime + r.end / fs, reason: r.reason })),
    lostToEdgesSeconds: plan.edgeSamples / fs,
    intervals: plan.intervals.length,
    gates: run.gates,
    ...(plan.unsearchable ? { unsearchable: plan.unsearchable, unsearchableLimitedBy: plan.limitedBy } : {}),
    fftBackend: run.backend,
    threads: run.threads,
    wallSeconds: run.wallSeconds,
  };
}

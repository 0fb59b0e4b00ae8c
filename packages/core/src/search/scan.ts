import { InputError, parameterError } from "../errors.js";
import { resolveFftBackend } from "../fft/backends.js";
import type { FftBackendName } from "../fft/types.js";
import { chiSquared } from "../filter/chisq.js";
import { parabolicPeak, type Trigger } from "../filter/peaks.js";
import { reweightedSnr } from "../filter/reweight.js";
import { M_SUN } from "../physics/constants.js";
import { chirpMass } from "../physics/masses.js";
import { clusterByTime } from "./cluster.js";
import { MAX_SEGMENT_SAMPLES, nextPowerOfTwo, planSegments, type Segment, type SegmentPlan } from "./segmentPlan.js";
import { segmentPsd } from "./segmentPsd.js";
import { describeBadSample, firstCorruptSample } from "./corruptSample.js";
import { createBankFilter, type BankFilterConfig, type PeakWindow } from "./bankFilter.js";
import { createSegmentFilter } from "./segmentFilter.js";
import { createSearchPool, defaultSearchThreads, maxSearchThreads, type SearchPool } from "./workerPool.js";
import { templateDurationSeconds, templateIscoTimeOffset } from "./templateTiming.js";
import type { Candidate, SearchInput, SearchOptions, SearchSummary, SkippedStretch } from "./types.js";

/** Checks search options once, at the door. */
export function validateSearchOptions(o: SearchOptions, sampleRate: number): void {
  if (o.templates.length === 0) throw new InputError("the template bank is empty");
  for (const [i, t] of o.templates.entries()) {
    if (!(t.primaryMass > 0) || !(t.secondaryMass > 0) || !Number.isFinite(t.primaryMass + t.secondaryMass)) {
      throw new InputError(`template ${i}: masses must be positive numbers`);
    }
  }
  if (!(o.fMinHz > 0)) throw new InputError(`fmin must be a positive frequency (got ${o.fMinHz})`);
  if (o.fMinHz >= sampleRate / 2) {
    throw new InputError(`fmin ${o.fMinHz} Hz is at or above the Nyquist frequency ${sampleRate / 2} Hz of the data`);
  }
  if (!(o.snrThreshold > 0)) throw new InputError(`the SNR threshold must be positive (got ${o.snrThreshold})`);
  if (!Number.isInteger(o.chi2Bins) || o.chi2Bins < 0 || o.chi2Bins === 1) {
    throw new InputError(`chi-squared bands must be 0 (off) or an integer ≥ 2 (got ${o.chi2Bins})`);
  }
  if (!(o.clusterWindowSeconds > 0)) throw new InputError(`the cluster window must be positive (got ${o.clusterWindowSeconds})`);
  if (o.chi2Allowance !== undefined && !(o.chi2Allowance >= 0 && Number.isFinite(o.chi2Allowance))) {
    throw new InputError(`the chi-squared allowance must be a number ≥ 0 (got ${o.chi2Allowance})`);
  }
  if (o.threads !== undefined && !(Number.isInteger(o.threads) && o.threads >= 1)) {
    throw new InputError(`threads must be a positive integer (got ${o.threads})`);
  }
  if (o.psd.kind === "estimate") {
    // Welch needs segments of a few samples at least, and bins finer than the lowest frequency searched.
    const seconds = o.psd.segmentSeconds;
    const samples = Math.round(seconds * sampleRate);
    if (!(samples >= MIN_PSD_SEGMENT_SAMPLES)) {
      throw new InputError(
        `--psd-segment: ${seconds} s is ${samples} samples at ${sampleRate} Hz; the PSD estimate needs at least ${MIN_PSD_SEGMENT_SAMPLES}`,
      );
    }
    if (!(1 / seconds <= o.fMinHz)) {
      throw new InputError(
        `--psd-segment: ${seconds} s gives PSD bins ${(1 / seconds).toPrecision(3)} Hz wide, coarser than fmin ${o.fMinHz} Hz; ` +
          `use at least ${(1 / o.fMinHz).toPrecision(3)} s`,
      );
    }
  }
}

/** Fewest samples in one Welch segment of a search's PSD estimate. */
const MIN_PSD_SEGMENT_SAMPLES = 16;

/** Chooses the segment plan for a series from the longest template and the inverse-PSD filter length. */
export function chooseSegmentPlan(o: SearchOptions, sampleRate: number, length: number): SegmentPlan {
  let longest = 0;
  for (const t of o.templates) longest = Math.max(longest, templateDurationSeconds(t.primaryMass, t.secondaryMass, o.fMinHz));
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
    size = Math.min(size, nextPowerOfTwo(length));
  }
  const tooShort = (): InputError =>
    new InputError(
      `the data (${(length / sampleRate).toFixed(1)} s) is too short to search: templates need ${(longest + truncSeconds).toFixed(1)} s of data ` +
        `before a coalescence and the inverse-PSD filter ${truncSeconds.toFixed(1)} s at each end` +
        (o.psd.kind === "estimate" && 2 * truncSeconds > longest
          ? ` (the --psd-segment length); use a shorter --psd-segment or a longer file`
          : `; raise --fmin, use heavier masses or a longer file`),
    );
  if (o.segmentSeconds === undefined && length <= invalidStart + invalidEnd) throw tooShort();
  if (size <= invalidStart + invalidEnd) {
    // Name what dominates: the template, or the inverse-PSD filter (as long as the PSD segment).
    const filterDominates = o.psd.kind === "estimate" && 2 * truncSeconds > longest;
    const need =
      `the longest template (${longest.toFixed(1)} s from ${o.fMinHz} Hz) and the inverse-PSD filter at both ends ` +
      `(2 × ${truncSeconds.toFixed(1)} s${o.psd.kind === "estimate" ? ", the --psd-segment length" : ""}) ` +
      `need more than ${(size / sampleRate).toFixed(1)} s segments`;
    const remedy =
      o.segmentSeconds !== undefined
        ? "use a longer --segment"
        : filterDominates
          ? "the data is too short for that; use a shorter --psd-segment"
          : "the data is too short for that; raise --fmin or use heavier masses";
    throw new InputError(`${need}; ${remedy}`);
  }
  const plan = planSegments(length, size, invalidStart, invalidEnd);
  if (plan.segments.length === 0) throw tooShort();
  return plan;
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
function searchThreads(o: SearchOptions, plan: SegmentPlan): number {
  const count = o.templates.length;
  if (o.threads !== undefined) return Math.min(o.threads, maxSearchThreads(), count);
  if (count * plan.segments.length * plan.size < SMALL_JOB) return 1;
  return Math.min(defaultSearchThreads(), count);
}

interface PreparedSegment {
  seg: Segment;
  /** The segment's samples, zero-padded to the segment length. */
  data: Float64Array;
  dataLength: number;
  /** Index of the first non-finite or corrupt sample (corruptSample.ts), or −1. */
  bad: number;
  /** Its time and what is wrong with it ("(t = … s) is non-finite", or its value against the segment's median). */
  badWhat: string;
  /** The segment's PSD when it was estimated ahead. */
  psd?: Float64Array;
}

interface RawTrigger extends Trigger {
  time: number;
  sigma: number;
}

/**
 * Runs the matched-filter search of a bank over one strain source, segment by segment, reading
 * only one segment's samples at a time: PSD per segment, one forward FFT of the data and the
 * template-independent filter weights, then per template the fast phase product and one inverse
 * FFT with windowed peaks above threshold (spread over `threads` worker threads that share the
 * weights); clustering across the bank and time; the chi-squared discriminator and reweighted SNR
 * for the survivors. Memory is bounded by the segment length and the thread count, not by the
 * length of the input. The candidates do not depend on the thread count.
 * A candidate is not a detection.
 */
export async function searchSource(
  source: SearchInput,
  options: SearchOptions,
): Promise<{ candidates: Candidate[]; summary: SearchSummary }> {
  const wallStart = performance.now();
  const fs = source.sampleRate;
  validateSearchOptions(options, fs);
  const backend: FftBackendName = resolveFftBackend(options.fftBackend ?? "auto");
  let plan: SegmentPlan;
  try {
    plan = chooseSegmentPlan(options, fs, source.length);
  } catch (err) {
    // Which file was too short (or too long for the segment) matters when several are scanned.
    if (err instanceof InputError && !err.parameter) throw new InputError(`${source.file}: ${err.message}`);
    throw err;
  }
  const n = plan.size;
  const fMax = Math.min(options.fMaxHz ?? 0.95 * (fs / 2), fs / 2);
  const templates = options.templates;
  const threads = searchThreads(options, plan);
  const window = Math.max(1, Math.round(options.clusterWindowSeconds * fs));
  const truncSamples = Math.round(truncationSeconds(options) * fs);
  const filter = createSegmentFilter({
    size: n,
    sampleRate: fs,
    fMinHz: options.fMinHz,
    fMaxHz: fMax,
    psd: options.psd,
    truncationSamples: truncSamples,
    backend,
    shared: threads > 1,
  });
  const config: BankFilterConfig = { size: n, sampleRate: fs, fMinHz: options.fMinHz, fMaxHz: fMax, backend };
  const masses = new Float64Array(2 * templates.length);
  templates.forEach((t, i) => {
    masses[2 * i] = t.primaryMass;
    masses[2 * i + 1] = t.secondaryMass;
  });
  // One thread filters on this thread; more start workers now, while the first segment is read.
  const inline = threads === 1 ? createBankFilter(config) : undefined;
  const poolStart: Promise<SearchPool> | undefined = threads > 1 ? createSearchPool(threads, config, filter.weights, masses) : undefined;
  poolStart?.catch(() => {}); // awaited below; this only keeps an early failure from going unhandled
  let pool: SearchPool | undefined;
  const inlineSigmas = new Float64Array(templates.length);
  const buffers = [new Float64Array(n), new Float64Array(n)];
  const iscoOffsets = templates.map((t) => templateIscoTimeOffset(t.primaryMass, t.secondaryMass, options.fMinHz));
  const hook = options.segmentHook;
  // The segments to search, in order: all of them, or those the hook picks (sharding, resume).
  const todo = hook ? hook.segments(plan.segments.length) : plan.segments.map((_, i) => i);

  /** Reads segment i into buffers[i % 2]; with `withPsd`, also its PSD (done while workers filter the previous one). */
  const prepare = async (i: number, withPsd: boolean): Promise<PreparedSegment> => {
    const seg = plan.segments[todo[i]];
    const data = buffers[i % 2];
    const raw = await source.read(seg.start, Math.min(seg.dataLength, source.length - seg.start));
    data.fill(0);
    data.set(raw);
    let bad = -1;
    for (let j = 0; j < raw.length; j++) {
      if (!Number.isFinite(raw[j])) {
        bad = j;
        break;
      }
    }
    if (bad < 0) bad = firstCorruptSample(raw);
    // "sample at index i (t = … s) is <what>": the error, and (without the index) the skip reason.
    const badWhat = bad < 0 ? "" : `(t = ${(source.startTime + (seg.start + bad) / fs).toFixed(4)} s) is ${describeBadSample(raw[bad])}`;
    if (bad >= 0 && !options.skipNonFinite) throw new InputError(`${source.file}: sample at index ${seg.start + bad} ${badWhat}; corrupt data are rejected`);
    const psd = withPsd && bad < 0 ? segmentPsd(options.psd, data, raw.length, fs, n, options.fMinHz, truncSamples) : undefined;
    return { seg, data, dataLength: raw.length, bad, badWhat, psd };
  };

  const all: Candidate[] = [];
  const skipped: SkippedStretch[] = [];
  let analysed = 0;
  let skippedSamples = 0;
  let done = 0;
  const total = todo.length;
  try {
    let next: Promise<PreparedSegment> | undefined = total > 0 ? prepare(0, false) : undefined;
    for (let step = 0; step < total; step++) {
      const segIndex = todo[step];
      const cur = await next!;
      next = undefined;
      const seg = cur.seg;
      const searchSamples = seg.searchEnd - seg.searchStart;
      const hasNext = step + 1 < total;
      if (cur.bad >= 0) {
        skipped.push({
          startTime: source.startTime + seg.searchStart / fs,
          endTime: source.startTime + seg.searchEnd / fs,
          reason: `sample ${cur.badWhat}`,
        });
        skippedSamples += searchSamples;
        hook?.done(segIndex, { searchSamples, skipped: skipped[skipped.length - 1], triggers: [], survivors: [], candidates: [] });
        options.onProgress?.(++done, total);
        if (hasNext) next = prepare(step + 1, false);
        continue;
      }
      const spec = filter.load(cur.data, cur.dataLength, cur.psd);
      const peaks: PeakWindow = { start: seg.searchStart - seg.start, end: seg.searchEnd - seg.start, threshold: options.snrThreshold, window };
      const part = hook ? hook.templates(segIndex) : { from: 0, to: templates.length };
      let triggers: Trigger[];
      let sigmas: Float64Array;
      if (inline) {
        triggers = [];
        inline.scan(filter.weights, masses, part.from, part.to, peaks, inlineSigmas, triggers);
        sigmas = inlineSigmas;
      } else {
        pool ??= await poolStart!;
        // The workers filter this segment while this thread reads the next one and estimates its
        // PSD (into the other buffer); the loaded spectrum and weights stay untouched until then.
        const running = pool.run(segIndex, filter.weights, peaks, part.from, part.to);
        running.catch(() => {}); // awaited just below
        if (hasNext) {
          next = prepare(step + 1, true);
          next.catch(() => {}); // awaited at the top of the next iteration
        }
        triggers = await running;
        sigmas = pool.sigmas;
      }
      analysed += searchSamples;
      const segStartTime = source.startTime + seg.start / fs;
      const timed: RawTrigger[] = triggers.map((tr) => {
        const { offset } = parabolicPeak(tr.before, tr.snr, tr.after);
        return { ...tr, time: segStartTime + (tr.index + offset) / fs + iscoOffsets[tr.templateIndex], sigma: sigmas[tr.templateIndex] };
      });
      const first = all.length;
      const kept = clusterByTime(timed, options.clusterWindowSeconds);
      for (const tr of kept) {
        const t = templates[tr.templateIndex];
        const kEnd = filter.generate(t);
        const { chi2, dof } = options.chi2Bins >= 2 ? chiSquared(spec, filter.template, kEnd, tr.index, options.chi2Bins) : { chi2: 0, dof: 0 };
        const peak = parabolicPeak(tr.before, tr.snr, tr.after);
        all.push({
          coalescenceTime: tr.time,
          snr: peak.value,
          phase: Math.atan2(tr.im, tr.re),
          chi2,
          chi2Dof: dof,
          reweightedSnr: reweightedSnr(peak.value, chi2, dof, options.chi2Allowance ?? 0),
          primaryMass: t.primaryMass,
          secondaryMass: t.secondaryMass,
          chirpMass: chirpMass(t.primaryMass * M_SUN, t.secondaryMass * M_SUN) / M_SUN,
          effectiveDistanceMpc: tr.sigma / peak.value,
          templateIndex: tr.templateIndex,
          file: source.file,
        });
      }
      hook?.done(segIndex, { searchSamples, triggers: timed, survivors: kept, candidates: all.slice(first) });
      options.onProgress?.(++done, total);
      if (hasNext && next === undefined) next = prepare(step + 1, false);
    }
  } finally {
    inline?.dispose();
    filter.dispose();
    if (poolStart) await (pool ?? (await poolStart.catch(() => undefined)))?.close();
  }
  const candidates = clusterByTime(
    all.map((c) => ({ ...c, time: c.coalescenceTime })),
    options.clusterWindowSeconds,
  ).map(({ time: _t, ...c }) => c as Candidate);
  return {
    candidates,
    summary: {
      file: source.file,
      templates: templates.length,
      segments: plan.segments.length,
      segmentSamples: n,
      sampleRate: fs,
      analysedSeconds: analysed / fs,
      dataSeconds: source.length / fs,
      leadInSeconds: plan.invalidStart / fs,
      tailSeconds: plan.invalidEnd / fs,
      skippedSeconds: skippedSamples / fs,
      skipped,
      fftBackend: backend,
      threads,
      wallSeconds: (performance.now() - wallStart) / 1000,
    },
  };
}

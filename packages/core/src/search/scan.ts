import { InputError } from "../errors.js";
import { resolveFftBackend } from "../fft/backends.js";
import type { FftBackendName } from "../fft/types.js";
import { chiSquared } from "../filter/chisq.js";
import { findWindowPeaks, parabolicPeak, type Trigger } from "../filter/peaks.js";
import { reweightedSnr } from "../filter/reweight.js";
import { M_SUN } from "../physics/constants.js";
import { chirpMass } from "../physics/masses.js";
import { clusterByTime } from "./cluster.js";
import { nextPowerOfTwo, planSegments, type SegmentPlan } from "./segmentPlan.js";
import { createSegmentFilter } from "./segmentFilter.js";
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
}

/** Chooses the segment plan for a series from the longest template and the inverse-PSD filter length. */
export function chooseSegmentPlan(o: SearchOptions, sampleRate: number, length: number): SegmentPlan {
  let longest = 0;
  for (const t of o.templates) longest = Math.max(longest, templateDurationSeconds(t.primaryMass, t.secondaryMass, o.fMinHz));
  const truncSeconds = truncationSeconds(o);
  const invalidStart = Math.ceil((longest + truncSeconds) * sampleRate);
  const invalidEnd = Math.ceil(truncSeconds * sampleRate);
  let size: number;
  if (o.segmentSeconds !== undefined) {
    size = nextPowerOfTwo(Math.round(o.segmentSeconds * sampleRate));
  } else {
    // Four times the padding keeps ≥ ~3/4 of each segment searchable; at least 64 s.
    size = nextPowerOfTwo(Math.max(4 * (invalidStart + invalidEnd), 64 * sampleRate));
    size = Math.min(size, nextPowerOfTwo(length));
  }
  if (size <= invalidStart + invalidEnd) {
    throw new InputError(
      `the longest template lasts ${longest.toFixed(1)} s from ${o.fMinHz} Hz, too long for ${(size / sampleRate).toFixed(1)} s segments` +
        (o.segmentSeconds === undefined ? " (the data is too short; raise --fmin or use heavier masses)" : "; use a longer --segment"),
    );
  }
  return planSegments(length, size, invalidStart, invalidEnd);
}

/** Length (s) of the inverse-PSD filter the segments are padded for. */
export function truncationSeconds(o: SearchOptions): number {
  return o.truncationSeconds ?? (o.psd.kind === "estimate" ? o.psd.segmentSeconds : 2);
}

interface RawTrigger extends Trigger {
  time: number;
  sigma: number;
}

/**
 * Runs the matched-filter search of a bank over one strain source, segment by segment, reading
 * only one segment's samples at a time: PSD per segment, one forward FFT of the data, then per
 * template one product and one inverse FFT; windowed peaks above threshold; clustering across the
 * bank and time; the chi-squared discriminator and reweighted SNR for the survivors.
 * A candidate is not a detection.
 */
export async function searchSource(
  source: SearchInput,
  options: SearchOptions,
): Promise<{ candidates: Candidate[]; summary: SearchSummary }> {
  const wallStart = performance.now();
  const fs = source.sampleRate;
  validateSearchOptions(options, fs);
  const backend: FftBackendName = resolveFftBackend(options.fftBackend ?? "fftjs");
  const plan = chooseSegmentPlan(options, fs, source.length);
  const n = plan.size;
  const nBins = n / 2 + 1;
  const df = fs / n;
  const fMax = Math.min(options.fMaxHz ?? 0.95 * (fs / 2), fs / 2);
  const templates = options.templates;
  const window = Math.max(1, Math.round(options.clusterWindowSeconds * fs));
  const sigmas = new Float64Array(templates.length);
  const truncSamples = Math.round(truncationSeconds(options) * fs);
  const filter = createSegmentFilter({ size: n, sampleRate: fs, fMinHz: options.fMinHz, fMaxHz: fMax, psd: options.psd, truncationSamples: truncSamples, backend });
  const segmentData = new Float64Array(n);
  const iscoOffsets = templates.map((t) => templateIscoTimeOffset(t.primaryMass, t.secondaryMass, options.fMinHz));

  const all: Candidate[] = [];
  const skipped: SkippedStretch[] = [];
  let analysed = 0;
  let skippedSamples = 0;
  let done = 0;
  for (const seg of plan.segments) {
    const raw = await source.read(seg.start, Math.min(seg.dataLength, source.length - seg.start));
    segmentData.fill(0);
    segmentData.set(raw);
    let bad = -1;
    for (let i = 0; i < raw.length; i++) {
      if (!Number.isFinite(raw[i])) {
        bad = i;
        break;
      }
    }
    const searchSamples = seg.searchEnd - seg.searchStart;
    if (bad >= 0) {
      if (!options.skipNonFinite) {
        throw new InputError(`${source.file}: non-finite sample at index ${seg.start + bad}`);
      }
      skipped.push({
        startTime: source.startTime + seg.searchStart / fs,
        endTime: source.startTime + seg.searchEnd / fs,
        reason: `non-finite sample at t = ${(source.startTime + (seg.start + bad) / fs).toFixed(4)} s`,
      });
      skippedSamples += searchSamples;
      options.onProgress?.(++done, plan.segments.length);
      continue;
    }
    const spec = filter.load(segmentData, raw.length);
    const triggers: Trigger[] = [];
    const a = seg.searchStart - seg.start;
    const b = seg.searchEnd - seg.start;
    for (let ti = 0; ti < templates.length; ti++) {
      const { sigma } = filter.filter(templates[ti]);
      sigmas[ti] = sigma;
      if (sigma > 0) findWindowPeaks(filter.snr, a, b, options.snrThreshold, window, ti, triggers);
    }
    analysed += searchSamples;
    const segStartTime = source.startTime + seg.start / fs;
    const timed: RawTrigger[] = triggers.map((tr) => {
      const { offset } = parabolicPeak(tr.before, tr.snr, tr.after);
      return { ...tr, time: segStartTime + (tr.index + offset) / fs + iscoOffsets[tr.templateIndex], sigma: sigmas[tr.templateIndex] };
    });
    for (const tr of clusterByTime(timed, options.clusterWindowSeconds)) {
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
        reweightedSnr: reweightedSnr(peak.value, chi2, dof),
        primaryMass: t.primaryMass,
        secondaryMass: t.secondaryMass,
        chirpMass: chirpMass(t.primaryMass * M_SUN, t.secondaryMass * M_SUN) / M_SUN,
        effectiveDistanceMpc: tr.sigma / peak.value,
        templateIndex: tr.templateIndex,
        file: source.file,
      });
    }
    options.onProgress?.(++done, plan.segments.length);
  }
  filter.dispose();
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
      skippedSeconds: skippedSamples / fs,
      skipped,
      fftBackend: filter.backend,
      wallSeconds: (performance.now() - wallStart) / 1000,
    },
  };
}

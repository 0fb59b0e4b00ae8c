import type { FftBackendName } from "../fft/types.js";
import { chiSquared } from "../filter/chisq.js";
import { parabolicPeak, type Trigger } from "../filter/peaks.js";
import { reweightedSnr } from "../filter/reweight.js";
import type { SegmentSpectrum } from "../filter/segmentSpectrum.js";
import type { Gater, GateSettings } from "../noise/gating.js";
import { M_SUN } from "../physics/constants.js";
import { chirpMass } from "../physics/masses.js";
import type { PeakWindow } from "./bankFilter.js";
import { clusterByTime } from "./cluster.js";
import { addGate } from "./gateList.js";
import type { SearchPlan } from "./scan.js";
import type { Segment } from "./segmentPlan.js";
import type { SegmentFilter } from "./segmentFilter.js";
import { segmentPsd } from "./segmentPsd.js";
import { effectiveSpin } from "./templateSpins.js";
import type { Candidate, GateRecord, SearchInput, SearchOptions } from "./types.js";

/**
 * What the steps of a search share across its inputs (while they share sample rate and segment
 * length): the filter slots, sample buffers, gater and per-template timing.
 */
export interface StepMachinery {
  readonly size: number;
  readonly sampleRate: number;
  /** One filter slot, or two (a double buffer) when workers filter. */
  readonly filters: readonly SegmentFilter[];
  /** A segment-length sample buffer per slot. */
  readonly buffers: readonly Float64Array[];
  readonly gater: Gater | undefined;
  readonly gating: GateSettings | null;
  readonly fMaxHz: number;
  readonly truncationSamples: number;
  readonly backend: FftBackendName;
  /** Samples of the span kept to its loudest peak. */
  readonly windowSamples: number;
  /** Per template, its ISCO time after the end of its filter (s): peak sample → coalescence time. */
  readonly iscoOffsets: readonly number[];
  /** A model PSD is the same for every segment: evaluated once, here. */
  modelPsd?: Float64Array;
}

/** One input of a search: what it is, how it is searched, its plan and what its steps have given so far. */
export interface InputRun {
  /** Its place among the run's inputs. */
  readonly index: number;
  readonly source: SearchInput;
  /** The search options, with this input's hook and progress callback. */
  readonly options: SearchOptions;
  readonly plan: SearchPlan;
  /** The plan's segments to search, in order (step i searches segment todo[i]). */
  readonly todo: readonly number[];
  readonly candidates: Candidate[];
  /** Gates, each recorded once though segments overlap. */
  readonly gates: GateRecord[];
  analysedSamples: number;
  /** Steps finished. */
  done: number;
  /** Threads that filter it. */
  threads: number;
  /** When it was opened (performance.now(), ms). */
  readonly wallStart: number;
}

/** One step of a search, loaded into a filter slot and ready for the templates. */
export interface LoadedStep {
  /** Index of the segment in the plan. */
  readonly segIndex: number;
  readonly seg: Segment;
  /** The filter (and, with workers, the pool slot) holding its weights. */
  readonly slot: number;
  /** Its weighted spectrum, for the survivors' chi-squared test. */
  readonly spec: SegmentSpectrum;
  /** Gates applied to its data. */
  readonly gates: GateRecord[];
  readonly peaks: PeakWindow;
  /** The templates [from, to) of the bank to filter in it. */
  readonly part: { from: number; to: number };
}

interface RawTrigger extends Trigger {
  time: number;
  sigma: number;
}

/**
 * Step `step` of an input made ready to filter in slot `slot`: its segment read into the slot's
 * buffer (zero-padded), its PSD estimated (search/segmentPsd.ts), loud transients gated
 * (noise/gating.ts), and the data transformed and weighted into the slot's filter. With workers this
 * runs on the main thread while they filter the previous step from the other slot.
 */
export async function loadStep(m: StepMachinery, run: InputRun, step: number, slot: number): Promise<LoadedStep> {
  const { source, options, plan } = run;
  const fs = m.sampleRate;
  const n = m.size;
  const segIndex = run.todo[step];
  const seg = plan.segments[segIndex];
  const data = m.buffers[slot];
  const raw = await source.read(seg.start, seg.dataLength);
  data.fill(0);
  data.set(raw);
  const psd =
    options.psd.kind === "model"
      ? (m.modelPsd ??= segmentPsd(options.psd, data, raw.length, fs, n, options.fMinHz, m.truncationSamples, m.backend))
      : segmentPsd(options.psd, data, raw.length, fs, n, options.fMinHz, m.truncationSamples, m.backend);
  const gates: GateRecord[] = [];
  if (m.gater && m.gating) {
    for (const g of m.gater.apply(data, raw.length, psd, options.fMinHz, m.fMaxHz, m.gating)) {
      gates.push({ time: source.startTime + (seg.start + g.peakSample) / fs, zeroedSeconds: (g.zeroEnd - g.zeroStart) / fs, peakSigma: g.peakSigma });
    }
  }
  const spec = m.filters[slot].load(data, raw.length, psd);
  const peaks: PeakWindow = { start: seg.searchStart - seg.start, end: seg.searchEnd - seg.start, threshold: options.snrThreshold, window: m.windowSamples };
  const part = options.segmentHook ? options.segmentHook.templates(segIndex) : { from: 0, to: options.templates.length };
  return { segIndex, seg, slot, spec, gates, peaks, part };
}

/**
 * A filtered step's window peaks to candidates: timed (sub-sample peak, template's ISCO offset),
 * clustered within the step, the survivors' chi-squared test (survivorCandidates), then the hook's
 * record of the step and the progress callback.
 */
export function finishStep(m: StepMachinery, run: InputRun, step: LoadedStep, triggers: readonly Trigger[], sigmas: Float64Array): void {
  const { source, options } = run;
  const fs = m.sampleRate;
  const seg = step.seg;
  const searchSamples = seg.searchEnd - seg.searchStart;
  run.analysedSamples += searchSamples;
  // Segments overlap: a transient in the overlap is gated in both, and recorded once.
  for (const g of step.gates) addGate(run.gates, g);
  const segStartTime = source.startTime + seg.start / fs;
  const timed: RawTrigger[] = triggers.map((tr) => {
    const { offset } = parabolicPeak(tr.before, tr.snr, tr.after);
    return { ...tr, time: segStartTime + (tr.index + offset) / fs + m.iscoOffsets[tr.templateIndex], sigma: sigmas[tr.templateIndex] };
  });
  const first = run.candidates.length;
  const kept = clusterByTime(timed, options.loudestWithinSeconds);
  for (const c of survivorCandidates(kept, source, options, m.filters[step.slot], step.spec)) run.candidates.push(c);
  options.segmentHook?.done(step.segIndex, { searchSamples, gates: step.gates, triggers: timed, survivors: kept, candidates: run.candidates.slice(first) });
  run.done += 1; // not inside the optional call below, which would skip it without a callback
  options.onProgress?.(run.done, run.todo.length);
}

/**
 * The candidates of one segment's survivors of clustering: the chi-squared discriminator (on the
 * segment's loaded spectrum, at the full-rate peak sample) and reweighted SNR, the template's
 * masses and spins, and the effective distance from σ.
 */
function survivorCandidates(
  kept: readonly RawTrigger[],
  source: SearchInput,
  options: SearchOptions,
  filter: SegmentFilter,
  spec: SegmentSpectrum,
): Candidate[] {
  const out: Candidate[] = [];
  for (const tr of kept) {
    const t = options.templates[tr.templateIndex];
    const kEnd = filter.generate(t);
    const { chi2, dof } = options.chi2Bands >= 2 ? chiSquared(spec, filter.template, kEnd, tr.index, options.chi2Bands) : { chi2: 0, dof: 0 };
    const peak = parabolicPeak(tr.before, tr.snr, tr.after);
    out.push({
      coalescenceTime: tr.time,
      snr: peak.value,
      phase: Math.atan2(tr.im, tr.re),
      chi2,
      chi2Dof: dof,
      reweightedSnr: reweightedSnr(peak.value, chi2, dof, options.chi2Allowance ?? 0),
      primaryMassSolar: t.primaryMassSolar,
      secondaryMassSolar: t.secondaryMassSolar,
      chirpMassSolar: chirpMass(t.primaryMassSolar * M_SUN, t.secondaryMassSolar * M_SUN) / M_SUN,
      primarySpin: t.primarySpin ?? 0,
      secondarySpin: t.secondarySpin ?? 0,
      effectiveSpin: effectiveSpin(t),
      effectiveDistanceMpc: tr.sigma / peak.value,
      templateIndex: tr.templateIndex,
      file: source.fileAt ? source.fileAt(tr.time) : source.file,
    });
  }
  return out;
}

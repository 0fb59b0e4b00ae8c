import seedrandom from "seedrandom";
import { InputError, parameterError } from "../errors.js";
import { checkComponentMassRange } from "../physics/massDomain.js";
import { checkTimeBaseParameters } from "../io/timeBase.js";
import { sampledPsdModel } from "../noise/interpolatePsd.js";
import type { PsdModel } from "../noise/psdModel.js";
import { welchPsd } from "../noise/welch.js";
import { arrayInput } from "../search/arrayInput.js";
import { truncationSeconds, validateSearchOptions } from "../search/scan.js";
import { searchEach, searchStrain, type SearchResult } from "../search/searchEach.js";
import { MAX_SEGMENT_SAMPLES, nextPowerOfTwo } from "../search/segmentPlan.js";
import { templateDurationSeconds } from "../search/templateTiming.js";
import type { SearchInput, SearchOptions } from "../search/types.js";
import { type Detector, SITE_A } from "../waveform/antenna.js";
import { taylorT4Duration, taylorT4Evolution } from "../waveform/taylorT4Evolution.js";
import { drawInjections } from "./drawInjections.js";
import type { DistanceDistribution } from "./efficiency.js";
import { type Injection, type InjectionRecord, injectInto, injectionRecord } from "./injection.js";
import { arrivalTimeAt, matchInjections } from "./matchInjections.js";
import { synthesizeStrain } from "./synthesizeStrain.js";

/** The injected population. Give exactly one of distanceMpc and snrRange. */
export interface CampaignPopulation {
  /** Number of injections in the whole campaign. */
  count: number;
  /** Both component masses uniform in [min, max], M_sun. */
  massRangeSolar: [number, number];
  /** Aligned spins: each body's χ uniform and independent in [min, max] ⊂ (−1, 1); absent: no spins. */
  spinRange?: [number, number];
  /** Distance range [min, max], Mpc. */
  distanceMpc?: [number, number];
  /** How distances are drawn in distanceMpc: uniform in volume (p ∝ D², default) or in distance. */
  distanceDistribution?: DistanceDistribution;
  /** Target optimal SNR range [min, max], drawn uniformly (the distance is scaled to hit it). */
  snrRange?: [number, number];
  /** Seed of every random draw of the campaign (injections and simulated noise). */
  seed: string;
}

/** Where the noise comes from: simulated from a PSD model, or the user's strain. */
export type CampaignData =
  | { readonly kind: "simulated"; readonly psd: PsdModel; readonly sampleRate: number }
  | { readonly kind: "strain"; readonly sources: readonly SearchInput[] };

/** Everything a campaign needs. */
export interface CampaignOptions {
  population: CampaignPopulation;
  data: CampaignData;
  /** The search, exactly as `scan` runs it; its fMinHz is also where injected chirps start. */
  search: SearchOptions;
  /** Detector the injections are projected onto (default the invented site-a). */
  detector?: Detector;
  /** A candidate within ± this many seconds of an injection's arrival time finds it (default 0.1). */
  matchWindowSeconds?: number;
  /** Injections per batch (default: as many as fit in one analysis segment, aiming for 8). */
  injectionsPerBatch?: number;
  /** Seconds between one chirp's coalescence and the start of the next (default 2). */
  gapSeconds?: number;
}

/** Where one batch's stretch of strain comes from. */
export interface BatchStretch {
  /** Index into the strain sources (0 for simulated data). */
  source: number;
  /** First sample of the stretch in that source. */
  offset: number;
  /** Time of the stretch's first sample, s. */
  startTime: number;
}

/** How a campaign is cut into batches: each batch is one stretch of strain, searched as one analysis segment. */
export interface CampaignLayout {
  batches: number;
  injectionsPerBatch: number;
  sampleRate: number;
  /** Samples per stretch (a power of two: one analysis segment). */
  batchSamples: number;
  batchSeconds: number;
  /** No coalescence within this many seconds of a stretch's ends (the search's padding). */
  marginSeconds: number;
  gapSeconds: number;
  matchWindowSeconds: number;
  stretches: BatchStretch[];
}

/**
 * What happened to one injection: its record (injection.ts; `coalescenceTime` at the Earth's
 * centre, spins only for a population drawn with a spin range), where it arrived, and what was
 * recovered. Errors relative (chirp mass) or in s.
 */
export interface InjectionOutcome extends InjectionRecord {
  index: number;
  batch: number;
  /** At the detector: what a candidate's coalescence time is compared with. */
  arrivalTime: number;
  found: boolean;
  recoveredSnr: number | null;
  reweightedSnr: number | null;
  recoveredChirpMassSolar: number | null;
  /** (recovered − injected) / injected chirp mass. */
  chirpMassError: number | null;
  /** Candidate coalescence time − arrival time, s. */
  timeError: number | null;
}

/** A candidate that matched no injection. */
export interface FalseCandidate {
  batch: number;
  coalescenceTime: number;
  snr: number;
  reweightedSnr: number;
  chirpMassSolar: number;
}

/** Everything one batch produced (what the resume state file stores, one line per batch). */
export interface BatchResult {
  batch: number;
  startTime: number;
  analysedSeconds: number;
  injections: InjectionOutcome[];
  falseCandidates: FalseCandidate[];
}

/** A finished (or resumed) campaign: its layout and every batch in order. */
export interface CampaignResult {
  layout: CampaignLayout;
  batches: BatchResult[];
}

/** Largest plane-wave delay Earth centre → detector, doubled, plus slack (s): drawInjections spaces chirps by 2 × 21.4 ms. */
const DELAY_SLACK = 0.05;
/** Injections a batch aims to hold when the segment length is chosen here. */
const TARGET_PER_BATCH = 8;

function checkRange(name: string, r: unknown): [number, number] {
  if (!Array.isArray(r) || r.length !== 2 || !r.every((x) => typeof x === "number" && Number.isFinite(x))) {
    throw new InputError(`${name} must be two finite numbers [min, max]`);
  }
  const [lo, hi] = r as [number, number];
  if (!(lo > 0) || !(hi >= lo)) throw new InputError(`${name} must satisfy 0 < min ≤ max (got ${lo}, ${hi})`);
  return [lo, hi];
}

/** Checks the population at the door (drawInjections checks again what it receives). */
export function validatePopulation(p: CampaignPopulation): void {
  if (!Number.isInteger(p.count) || p.count < 1) throw new InputError(`count must be a positive whole number of injections (got ${p.count})`);
  checkRange("mass range", p.massRangeSolar);
  checkComponentMassRange(p.massRangeSolar);
  if ((p.distanceMpc === undefined) === (p.snrRange === undefined)) throw new InputError("give exactly one of a distance range and an SNR range");
  if (p.distanceMpc !== undefined) checkRange("distance range", p.distanceMpc);
  if (p.snrRange !== undefined) checkRange("SNR range", p.snrRange);
  if (p.spinRange !== undefined) {
    const r = p.spinRange;
    if (!Array.isArray(r) || r.length !== 2 || !(r[0] > -1) || !(r[1] < 1) || !(r[1] >= r[0])) {
      throw new InputError(`spin range must satisfy −1 < min ≤ max < 1 (got ${String(r)})`);
    }
  }
  const dd = p.distanceDistribution ?? "volume";
  if (dd !== "volume" && dd !== "uniform") throw new InputError(`distance distribution must be "volume" or "uniform" (got "${dd}")`);
  if (typeof p.seed !== "string" || p.seed === "") throw new InputError("seed must be a non-empty string");
}

/**
 * Cuts a campaign into batches. Each batch is one stretch of N samples (a power of two), searched
 * as exactly one analysis segment, holding several chirps that do not overlap: coalescences are
 * at least (longest injected chirp + gap) apart and at least the search's padding (longest
 * template + inverse-PSD filter + 1 s) from either end of the stretch, so every injection lies
 * where the segment's SNR is valid. N is the given segment length, or the smallest power of two
 * that holds the target number of injections (8, or the whole count when smaller) and is at least
 * four times the padding. With strain files the stretches are consecutive, non-overlapping pieces
 * of the files (the remainder of each file is not used).
 */
export function planCampaign(options: CampaignOptions): CampaignLayout {
  const p = options.population;
  validatePopulation(p);
  const data = options.data;
  let fs: number;
  if (data.kind === "simulated") {
    fs = data.sampleRate;
    if (!(fs > 0) || !Number.isFinite(fs)) throw parameterError("sampleRate", `must be a positive number (got ${fs})`);
    checkTimeBaseParameters(fs, 0, 0);
  } else {
    if (data.sources.length === 0) throw new InputError("no strain files given");
    fs = data.sources[0].sampleRate;
    for (const s of data.sources) {
      if (s.sampleRate !== fs) throw new InputError(`${s.file}: sample rate ${s.sampleRate} Hz differs from ${fs} Hz of ${data.sources[0].file}; use files of one rate`);
    }
  }
  const search = options.search;
  validateSearchOptions(search, fs);
  const window = options.matchWindowSeconds ?? 0.1;
  if (!(window > 0) || !Number.isFinite(window)) throw new InputError(`match window must be a positive number of seconds (got ${window})`);
  const gap = options.gapSeconds ?? 2;
  if (!(gap >= 0) || !Number.isFinite(gap)) throw new InputError(`gap must be a non-negative number of seconds (got ${gap})`);

  const [mLo] = p.massRangeSolar;
  const fIsco = taylorT4Evolution(mLo, mLo).fIscoHz;
  if (search.fMinHz >= fIsco) throw parameterError("fMinHz", `${search.fMinHz} Hz is not below the ISCO frequency ${fIsco.toFixed(1)} Hz of the lightest binary`);
  // Aligned spins lengthen the inspiral (orbital hang-up): the longest chirp has the largest spins.
  const spinTop = p.spinRange ? p.spinRange[1] : 0;
  const longestInjection = taylorT4Duration(mLo, mLo, search.fMinHz, undefined, spinTop, spinTop);
  let longestTemplate = 0;
  for (const t of search.templates) longestTemplate = Math.max(longestTemplate, templateDurationSeconds(t.primaryMassSolar, t.secondaryMassSolar, search.fMinHz));
  const trunc = truncationSeconds(search);
  const margin = Math.max(longestTemplate, longestInjection) + trunc + 1;
  const spacing = longestInjection + gap + DELAY_SLACK;

  const perBatchWanted = options.injectionsPerBatch;
  if (perBatchWanted !== undefined && (!Number.isInteger(perBatchWanted) || perBatchWanted < 1)) {
    throw parameterError("injectionsPerBatch", `must be a positive whole number (got ${perBatchWanted})`);
  }
  let samples: number;
  if (search.segmentSeconds !== undefined) {
    samples = nextPowerOfTwo(Math.round(search.segmentSeconds * fs));
  } else {
    const target = Math.min(p.count, perBatchWanted ?? TARGET_PER_BATCH);
    const seconds = Math.max(4 * (Math.max(longestTemplate, longestInjection) + 2 * trunc), 2 * margin + (target - 1) * spacing + 1);
    samples = nextPowerOfTwo(Math.ceil(seconds * fs));
  }
  // Refuse, before any work, a stretch too long to hold: name what made it so.
  if (!(samples <= MAX_SEGMENT_SAMPLES)) {
    const stretch = `stretches of ${(samples / fs).toPrecision(3)} s (${samples.toPrecision(3)} samples at ${fs} Hz), more than the limit of ${MAX_SEGMENT_SAMPLES} (2^23) samples`;
    if (search.segmentSeconds !== undefined) throw parameterError("segmentSeconds", `${search.segmentSeconds} s makes ${stretch}; use a shorter segment`);
    if (perBatchWanted !== undefined) throw parameterError("injectionsPerBatch", `${perBatchWanted} injections per batch need ${stretch}; use fewer per batch`);
    throw new InputError(`${stretch}; raise the low-frequency cutoff or lower the sample rate`);
  }
  if (data.kind === "strain") {
    const longestFile = Math.max(...data.sources.map((s) => s.length));
    while (samples > longestFile && samples / 2 / fs > 2 * margin) samples /= 2;
  }
  const batchSeconds = samples / fs;
  if (batchSeconds <= 2 * margin) {
    throw new InputError(
      `a stretch of ${batchSeconds} s cannot hold a chirp of ${longestInjection.toFixed(1)} s with the search's padding; ` +
        (data.kind === "strain" ? "use longer strain files or a higher low-frequency cutoff" : "use a longer segment or a higher low-frequency cutoff"),
    );
  }
  const fits = 1 + Math.floor((batchSeconds - 2 * margin) / spacing);
  const perBatch = Math.min(perBatchWanted ?? fits, fits, p.count);
  const batches = Math.ceil(p.count / perBatch);

  const stretches: BatchStretch[] = [];
  if (data.kind === "simulated") {
    for (let b = 0; b < batches; b++) stretches.push({ source: 0, offset: 0, startTime: b * batchSeconds });
  } else {
    for (const [si, s] of data.sources.entries()) {
      for (let off = 0; off + samples <= s.length && stretches.length < batches; off += samples) {
        stretches.push({ source: si, offset: off, startTime: s.startTime + off / fs });
      }
    }
    if (stretches.length < batches) {
      throw new InputError(
        `the strain holds ${stretches.length} stretch(es) of ${batchSeconds} s, room for ${stretches.length * perBatch} injection(s), fewer than the ${p.count} asked for`,
      );
    }
  }
  return {
    batches,
    injectionsPerBatch: perBatch,
    sampleRate: fs,
    batchSamples: samples,
    batchSeconds,
    marginSeconds: margin,
    gapSeconds: gap,
    matchWindowSeconds: window,
    stretches,
  };
}

/** Number of injections in batch b. */
export function batchInjectionCount(layout: CampaignLayout, count: number, b: number): number {
  return Math.max(0, Math.min(layout.injectionsPerBatch, count - b * layout.injectionsPerBatch));
}

/**
 * Draws batch b's injections (seeded by `<seed>:injections:<b>`) for its stretch with
 * {@link drawInjections}, using `psd` for the optimal SNRs. With a distance range drawn uniform
 * in distance, each distance is redrawn uniformly (seed `<seed>:distance:<b>`) and the optimal
 * SNR rescaled as 1/D (the amplitude of a fixed source falls as 1/D).
 */
export function drawBatchInjections(options: CampaignOptions, layout: CampaignLayout, b: number, psd: PsdModel): Injection[] {
  const p = options.population;
  const stretch = layout.stretches[b];
  const injections = drawInjections({
    count: batchInjectionCount(layout, p.count, b),
    massRangeSolar: p.massRangeSolar,
    ...(p.spinRange ? { spinRange: p.spinRange } : {}),
    distanceMpc: p.distanceMpc,
    snrRange: p.snrRange,
    seed: `${p.seed}:injections:${b}`,
    startTime: stretch.startTime,
    duration: layout.batchSeconds,
    fMinHz: options.search.fMinHz,
    psd,
    sampleRate: layout.sampleRate,
    detector: options.detector ?? SITE_A,
    gapSeconds: layout.gapSeconds,
    marginSeconds: layout.marginSeconds,
  });
  if (p.distanceMpc !== undefined && (p.distanceDistribution ?? "volume") === "uniform") {
    const rng = seedrandom(`${p.seed}:distance:${b}`);
    const [lo, hi] = p.distanceMpc;
    for (const inj of injections) {
      const d = lo + (hi - lo) * rng();
      if (inj.optimalSnr !== undefined) inj.optimalSnr *= inj.distanceMpc / d;
      inj.distanceMpc = d;
    }
  }
  return injections;
}

/** The strain of batch b with its injections added, and the PSD used for their optimal SNRs. */
async function batchStrain(options: CampaignOptions, layout: CampaignLayout, b: number): Promise<{ input: SearchInput; injections: Injection[] }> {
  const stretch = layout.stretches[b];
  const fs = layout.sampleRate;
  const detector = options.detector ?? SITE_A;
  const data = options.data;
  if (data.kind === "simulated") {
    const injections = drawBatchInjections(options, layout, b, data.psd);
    const series = new Float64Array(layout.batchSamples);
    let at = 0;
    for (const chunk of synthesizeStrain({
      psd: data.psd,
      sampleRate: fs,
      startTime: stretch.startTime,
      duration: layout.batchSeconds,
      seed: `${options.population.seed}:noise:${b}`,
      fMinHz: options.search.fMinHz,
      injections,
      detector,
    })) {
      series.set(chunk, at);
      at += chunk.length;
    }
    return { input: arrayInput(series, fs, stretch.startTime, `<simulated batch ${b}>`), injections };
  }
  const source = data.sources[stretch.source];
  const series = Float64Array.from(await source.read(stretch.offset, layout.batchSamples));
  let psd: PsdModel;
  const ps = options.search.psd;
  if (ps.kind === "model") {
    psd = ps.model;
  } else {
    const len = Math.min(nextPowerOfTwo(Math.round(ps.segmentSeconds * fs)), layout.batchSamples);
    psd = sampledPsdModel(welchPsd(series, fs, { segmentLength: len, average: ps.average }), `${source.file} estimate`);
  }
  const injections = drawBatchInjections(options, layout, b, psd);
  for (const inj of injections) injectInto(series, fs, stretch.startTime, inj, detector, options.search.fMinHz);
  return { input: arrayInput(series, fs, stretch.startTime, source.file), injections };
}

/**
 * Runs batch b: builds its strain (simulated noise or a stretch of the user's strain, plus the
 * batch's TaylorT4 injections), searches it with {@link searchStrain} exactly as `scan` does,
 * and matches the candidates to the injections ({@link matchInjections}).
 */
export async function runCampaignBatch(options: CampaignOptions, layout: CampaignLayout, b: number): Promise<BatchResult> {
  if (!Number.isInteger(b) || b < 0 || b >= layout.batches) throw new InputError(`batch must be a whole number in [0, ${layout.batches}) (got ${b})`);
  const { input, injections } = await batchStrain(options, layout, b);
  return batchResult(options, layout, b, injections, await searchStrain(input, batchSearchOptions(options, layout)));
}

/** The search options of every batch: the campaign's, one segment per batch, without a progress callback. */
function batchSearchOptions(options: CampaignOptions, layout: CampaignLayout): SearchOptions {
  const { onProgress: _ignored, ...search } = options.search;
  return { ...search, segmentSeconds: layout.batchSeconds };
}

/** Batch b's outcome: its injections matched to the search's candidates, and the candidates matching none. */
function batchResult(options: CampaignOptions, layout: CampaignLayout, b: number, injections: Injection[], search: SearchResult): BatchResult {
  const detector = options.detector ?? SITE_A;
  const { candidates, summary } = search;
  const { matched, unmatched } = matchInjections(injections, candidates, detector, layout.matchWindowSeconds);
  const first = b * layout.injectionsPerBatch;
  const outcomes: InjectionOutcome[] = injections.map((inj, k) => {
    const record = injectionRecord(inj);
    const mc = record.chirpMassSolar;
    const arrival = arrivalTimeAt(inj, detector);
    const c = matched[k] >= 0 ? candidates[matched[k]] : undefined;
    return {
      index: first + k,
      batch: b,
      ...record,
      arrivalTime: arrival,
      found: c !== undefined,
      recoveredSnr: c ? c.snr : null,
      reweightedSnr: c ? c.reweightedSnr : null,
      recoveredChirpMassSolar: c ? c.chirpMassSolar : null,
      chirpMassError: c ? c.chirpMassSolar / mc - 1 : null,
      timeError: c ? c.coalescenceTime - arrival : null,
    };
  });
  const falseCandidates: FalseCandidate[] = unmatched.map((ci) => {
    const c = candidates[ci];
    return { batch: b, coalescenceTime: c.coalescenceTime, snr: c.snr, reweightedSnr: c.reweightedSnr, chirpMassSolar: c.chirpMassSolar };
  });
  return { batch: b, startTime: layout.stretches[b].startTime, analysedSeconds: summary.analysedSeconds, injections: outcomes, falseCandidates };
}

/** Hooks for {@link runCampaign}. */
export interface CampaignHooks {
  /** Batches already finished (e.g. read back from a state file): they are not run again. */
  completed?: readonly BatchResult[];
  /** Called after each newly finished batch, in batch order (the next may already be under way), e.g. to append it to a state file. */
  onBatch?: (result: BatchResult) => void | Promise<void>;
  /** Called with (batches finished, batches in all), including those given as completed. */
  onProgress?: (done: number, total: number) => void;
}

/**
 * Runs a whole injection-recovery campaign batch by batch ({@link planCampaign}; each batch as
 * {@link runCampaignBatch} runs it, the batches pipelined through one set of workers by
 * searchEach), skipping batches given as completed; every batch is determined by the
 * options and its index alone, so an interrupted campaign resumed from its finished batches gives
 * the same results as one run straight through. Recovered injections are not detections of real
 * sources.
 */
export async function runCampaign(options: CampaignOptions, hooks: CampaignHooks = {}): Promise<CampaignResult> {
  const layout = planCampaign(options);
  const done = new Map<number, BatchResult>();
  for (const r of hooks.completed ?? []) {
    if (!Number.isInteger(r.batch) || r.batch < 0 || r.batch >= layout.batches) {
      throw new InputError(`finished batch ${r.batch} does not belong to this campaign of ${layout.batches} batches`);
    }
    if (!done.has(r.batch)) done.set(r.batch, r);
  }
  hooks.onProgress?.(done.size, layout.batches);
  // The batches left, searched as one run of inputs (searchEach): batch k + 1 is made and its data
  // loaded while the workers filter batch k.
  const todo = Array.from({ length: layout.batches }, (_, b) => b).filter((b) => !done.has(b));
  const injectionsOf = new Map<number, Injection[]>();
  await searchEach(
    todo.length,
    async (k) => {
      const { input, injections } = await batchStrain(options, layout, todo[k]);
      injectionsOf.set(k, injections);
      return { input };
    },
    batchSearchOptions(options, layout),
    async (k, search) => {
      const b = todo[k];
      const r = batchResult(options, layout, b, injectionsOf.get(k)!, search);
      injectionsOf.delete(k);
      await hooks.onBatch?.(r);
      done.set(b, r);
      hooks.onProgress?.(done.size, layout.batches);
    },
  );
  return { layout, batches: [...done.values()].sort((a, c) => a.batch - c.batch) };
}

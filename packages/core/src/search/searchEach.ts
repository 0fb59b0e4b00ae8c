import { resolveFftBackend } from "../fft/backends.js";
import type { FftBackendName } from "../fft/types.js";
import type { Trigger } from "../filter/peaks.js";
import { createGater, DEFAULT_GATE_SETTINGS } from "../noise/gating.js";
import { createBankFilter, type BankFilter, type BankFilterConfig } from "./bankFilter.js";
import { clusterByTime } from "./cluster.js";
import { DEFAULT_BAND_POWER_LOSS } from "./outputRate.js";
import { planSearch, searchSummary, searchThreads, truncationSeconds, validateSearchOptions } from "./scan.js";
import type { SegmentHook } from "./segmentHook.js";
import { createSegmentFilter, type SegmentFilter } from "./segmentFilter.js";
import { finishStep, loadStep, type InputRun, type LoadedStep, type StepMachinery } from "./segmentSteps.js";
import { templateIscoTimeOffset } from "./templateTiming.js";
import { templateSpins } from "./templateSpins.js";
import type { Candidate, SearchInput, SearchOptions, SearchSummary } from "./types.js";
import { createSearchPool, type SearchPool } from "./workerPool.js";

/** What a search of one input gives: its candidates (not detections) and what it covered. */
export interface SearchResult {
  candidates: Candidate[];
  summary: SearchSummary;
}

/** One input of {@link searchEach}, made when the search reaches it. */
export interface QueuedInput {
  readonly input: SearchInput;
  /** Its segment hook (sharding, resume); the options' own hook is not used by searchEach. */
  readonly segmentHook?: SegmentHook;
  /** Its progress callback, (steps done, steps of this input); default the options' own. */
  readonly onProgress?: (done: number, total: number) => void;
}

/**
 * Runs the matched-filter search of a bank over one strain source, segment by segment, reading
 * only one segment's samples at a time: PSD per segment, one forward FFT of the data and the
 * template-independent filter weights, then per template the fast phase product and one inverse
 * FFT with windowed peaks above threshold (spread over `threads` worker threads that share the
 * weights); clustering across the bank and time; the chi-squared discriminator and reweighted SNR
 * for the survivors (the steps: segmentSteps.ts). With workers the segments are pipelined through
 * two filter slots: segment k + 1 is loaded while they filter segment k. Memory is bounded by the
 * segment length and the thread count, not by the length of the input. The candidates do not
 * depend on the thread count.
 * A candidate is not a detection.
 */
export async function searchStrain(source: SearchInput, options: SearchOptions): Promise<SearchResult> {
  let result: SearchResult | undefined;
  await searchEach(1, () => ({ input: source, segmentHook: options.segmentHook }), options, (_, r) => {
    result = r;
  });
  return result!;
}

/**
 * Searches `count` inputs in turn, each exactly as {@link searchStrain} searches it alone, with one
 * bank and — while consecutive inputs share their sample rate and segment length — one set of
 * filters and worker threads, pipelined across the inputs as across segments: input i + 1 is made
 * (`open(i + 1)`, e.g. a simulated batch of a campaign), screened, planned and its first segment
 * loaded while the workers filter input i's last. `done(i, result)` receives each input's result,
 * in input order, as soon as it is complete; throwing (or rejecting) stops the search.
 */
export async function searchEach(
  count: number,
  open: (index: number) => QueuedInput | Promise<QueuedInput>,
  options: SearchOptions,
  done: (index: number, result: SearchResult) => void | Promise<void>,
): Promise<void> {
  const backend: FftBackendName = resolveFftBackend(options.fftBackend ?? "auto");
  // Inputs opened and not yet handed to `done`, in order.
  const queue: InputRun[] = [];
  let opened = 0;
  /** Opens inputs until one has steps to search (undefined when none is left); all are queued. */
  const openNext = async (): Promise<InputRun | undefined> => {
    while (opened < count) {
      const run = await openRun(opened++, await open(opened - 1), options);
      queue.push(run);
      if (run.todo.length > 0) return run;
    }
    return undefined;
  };
  /** Hands every complete input at the head of the queue to `done`. */
  const flush = async (): Promise<void> => {
    while (queue.length > 0 && queue[0].done === queue[0].todo.length) {
      const run = queue.shift()!;
      await done(run.index, runResult(run, backend));
    }
  };
  let run = await openNext();
  await flush();
  while (run) {
    const m = createMachinery(run, backend);
    try {
      run = m.inline ? await filterOnThisThread(m, run, openNext, flush) : await filterPipelined(m, run, openNext, flush);
    } finally {
      await m.dispose();
    }
  }
  await flush();
}

/** Opens one input: checks the options against it, and plans it (unless its hook brings the plan). */
async function openRun(index: number, q: QueuedInput, base: SearchOptions): Promise<InputRun> {
  const wallStart = performance.now();
  const { segmentHook: _baseHook, onProgress: baseProgress, ...rest } = base;
  const onProgress = q.onProgress ?? baseProgress;
  const options: SearchOptions = { ...rest, ...(q.segmentHook ? { segmentHook: q.segmentHook } : {}), ...(onProgress ? { onProgress } : {}) };
  validateSearchOptions(options, q.input.sampleRate);
  const plan = q.segmentHook?.plan ?? (await planSearch(q.input, options));
  // The segments to search, in order: all of them, or those the hook picks (sharding, resume).
  const todo = plan.segments.length === 0 ? [] : q.segmentHook ? q.segmentHook.segments(plan.segments.length) : plan.segments.map((_, i) => i);
  // Threads as a search of this input alone would use (the machinery that filters it may differ).
  const threads = plan.segments.length === 0 ? 1 : searchThreads(options, plan);
  return { index, source: q.input, options, plan, todo, candidates: [], gates: [], analysedSamples: 0, done: 0, threads, wallStart };
}

/** A finished input's result: its candidates clustered across segment boundaries, and its summary. */
function runResult(run: InputRun, backend: FftBackendName): SearchResult {
  // Across segment boundaries: the loudest within the span, once more.
  const candidates = clusterByTime(
    run.candidates.map((c) => ({ ...c, time: c.coalescenceTime })),
    run.options.loudestWithinSeconds,
  ).map(({ time: _t, ...c }) => c as Candidate);
  const summary = searchSummary(run.source, run.options, run.plan, {
    analysedSamples: run.analysedSamples,
    gates: run.gates,
    threads: run.threads,
    backend,
    wallSeconds: (performance.now() - run.wallStart) / 1000,
  });
  return { candidates, summary };
}

/** The filters, buffers, gater and threads of a stretch of inputs with one sample rate and segment length. */
interface Machinery extends StepMachinery {
  readonly threads: number;
  readonly masses: Float64Array;
  readonly spins: Float64Array | undefined;
  /** The bank filter of a one-thread search. */
  readonly inline: BankFilter | undefined;
  /** The workers of a search with several threads, starting. */
  readonly poolStart: Promise<SearchPool> | undefined;
  dispose(): Promise<void>;
}

/** Whether `run` can use `m`: the same sample rate and segment length. */
function fits(m: Machinery, run: InputRun): boolean {
  return run.source.sampleRate === m.sampleRate && run.plan.size === m.size;
}

/**
 * The machinery for `run` and the inputs after it that fit: one filter (one thread) or two (a
 * double buffer for the workers, started now so that they start while the first segment loads).
 */
function createMachinery(run: InputRun, backend: FftBackendName): Machinery {
  const options = run.options;
  const fs = run.source.sampleRate;
  const n = run.plan.size;
  const fMax = Math.min(options.fMaxHz ?? 0.95 * (fs / 2), fs / 2);
  const templates = options.templates;
  const threads = searchThreads(options, run.plan);
  const truncationSamples = Math.round(truncationSeconds(options) * fs);
  const filter = createSegmentFilter({ size: n, sampleRate: fs, fMinHz: options.fMinHz, fMaxHz: fMax, psd: options.psd, truncationSamples, backend, shared: threads > 1 });
  const config: BankFilterConfig = {
    size: n,
    sampleRate: fs,
    fMinHz: options.fMinHz,
    fMaxHz: fMax,
    backend,
    ...(options.perTemplateRate === false ? {} : { bandPowerLoss: options.bandPowerLoss ?? DEFAULT_BAND_POWER_LOSS }),
  };
  const masses = new Float64Array(2 * templates.length);
  templates.forEach((t, i) => {
    masses[2 * i] = t.primaryMassSolar;
    masses[2 * i + 1] = t.secondaryMassSolar;
  });
  const spins = templateSpins(templates);
  const filters: SegmentFilter[] = threads > 1 ? [filter, filter.twin()] : [filter];
  const inline = threads === 1 ? createBankFilter(config) : undefined;
  const poolStart = threads > 1 ? createSearchPool(threads, config, filters.map((f) => f.weights), masses, spins) : undefined;
  poolStart?.catch(() => {}); // awaited by the driver; this only keeps an early failure from going unhandled
  const gating = options.gating === undefined ? DEFAULT_GATE_SETTINGS : options.gating;
  return {
    size: n,
    sampleRate: fs,
    filters,
    buffers: filters.map(() => new Float64Array(n)),
    gater: gating ? createGater(n, fs, backend) : undefined,
    gating,
    fMaxHz: fMax,
    truncationSamples,
    backend,
    windowSamples: Math.max(1, Math.round(options.loudestWithinSeconds * fs)),
    iscoOffsets: templates.map((t) => templateIscoTimeOffset(t.primaryMassSolar, t.secondaryMassSolar, options.fMinHz)),
    threads,
    masses,
    spins,
    inline,
    poolStart,
    async dispose() {
      inline?.dispose();
      filter.dispose();
      if (poolStart) await (await poolStart.catch(() => undefined))?.close();
    },
  };
}

/**
 * One thread: each step of each input that fits is loaded, filtered and finished in turn on this
 * thread. Returns the first opened input that does not fit `m` (undefined at the end).
 */
async function filterOnThisThread(
  m: Machinery,
  first: InputRun,
  openNext: () => Promise<InputRun | undefined>,
  flush: () => Promise<void>,
): Promise<InputRun | undefined> {
  const sigmas = new Float64Array(m.masses.length / 2);
  for (let run: InputRun | undefined = first; run; run = await openNext()) {
    if (!fits(m, run)) return run;
    run.threads = 1;
    for (let step = 0; step < run.todo.length; step++) {
      const cur = await loadStep(m, run, step, 0);
      const triggers: Trigger[] = [];
      m.inline!.scan(m.filters[0].weights, m.masses, cur.part.from, cur.part.to, cur.peaks, sigmas, triggers, m.spins);
      finishStep(m, run, cur, triggers, sigmas);
    }
    await flush();
  }
  return undefined;
}

/** What a pipelined search does next: a step loaded into the free slot, or an input that needs other machinery. */
type Ahead = { run: InputRun; step: number; loaded: LoadedStep } | { misfit: InputRun } | undefined;

/**
 * Worker threads, pipelined across segments and inputs: the first step is loaded while the workers
 * start; then each step's successor (the next segment of the input, or the first of the next input,
 * opened and planned then) is loaded into the other slot while the workers filter the step, and
 * as soon as they finish they start on the successor while this thread tests the step's survivors
 * and hands finished inputs on. Returns the first opened input that does not fit `m`.
 */
async function filterPipelined(
  m: Machinery,
  first: InputRun,
  openNext: () => Promise<InputRun | undefined>,
  flush: () => Promise<void>,
): Promise<InputRun | undefined> {
  let run = first;
  let step = 0;
  run.threads = m.threads;
  let cur = await loadStep(m, run, 0, 0);
  const pool = await m.poolStart!;
  const start = (s: LoadedStep): Promise<Trigger[]> => {
    const p = pool.run(s.segIndex, s.slot, s.peaks, s.part.from, s.part.to);
    p.catch(() => {}); // awaited in the loop; this only keeps a failure during other awaits from going unhandled
    return p;
  };
  let running = start(cur);
  for (;;) {
    const slot = 1 - cur.slot;
    const aheadOf = async (r: InputRun, s: number): Promise<Ahead> => {
      if (s + 1 < r.todo.length) return { run: r, step: s + 1, loaded: await loadStep(m, r, s + 1, slot) };
      const next = await openNext();
      if (!next) return undefined;
      if (!fits(m, next)) return { misfit: next };
      next.threads = m.threads;
      return { run: next, step: 0, loaded: await loadStep(m, next, 0, slot) };
    };
    const aheadPromise = aheadOf(run, step);
    aheadPromise.catch(() => {}); // awaited just below
    const triggers = await running;
    const ahead = await aheadPromise;
    if (ahead && "loaded" in ahead) running = start(ahead.loaded);
    finishStep(m, run, cur, triggers, pool.sigmas[cur.slot]);
    await flush();
    if (!ahead || !("loaded" in ahead)) return ahead?.misfit;
    ({ run, step } = ahead);
    cur = ahead.loaded;
  }
}

// Fitting factors of random signals against a bank: how well the bank covers its region.
import seedrandom from "seedrandom";
import { InputError, parameterError } from "../errors.js";
import type { PsdModel } from "../noise/psdModel.js";
import { psdModelFromSpec } from "../noise/psdTable.js";
import { createRealFft } from "../fft/create.js";
import { createTaylorF2Generator } from "../waveform/taylorf2.js";
import { taylorT4, type TimeDomainWaveform } from "../waveform/taylorT4.js";
import { taylorT4Duration } from "../waveform/taylorT4Evolution.js";
import { createChirpTimeMetric } from "./metric.js";
import { createMassRegion, type MassRegion } from "./massRegion.js";
import { createPhaseChart } from "./phaseChart.js";
import { createPlaneIndex } from "./templateIndex.js";
import { chooseMatchGrid, createMatchComputer } from "./match.js";
import { chirpTimesFromComponents, componentsFromMassEta, iscoFrequencyHz, massEtaFromChirpTimes } from "./chirpTimeCoordinates.js";
import { metricRatioRange } from "./metricRatio.js";
import type { TemplateBank } from "./templateBank.js";

/** The signal model of the draws. */
export type VerifySignal = "taylorf2" | "pn-time";
/** How the draws are distributed over the region. */
export type VerifyDrawSpace = "masses" | "chirp-times";

export interface VerifyOptions {
  /** Number of random signals (default 1000). */
  draws?: number;
  /** "taylorf2" (the bank's own model: coverage) or "pn-time" (TaylorT4 time-domain: what the approximant costs). */
  signal?: VerifySignal;
  /** Uniform in component masses (default) or in chirp times (τ0, τ3). */
  drawSpace?: VerifyDrawSpace;
  /** Seed of the draws (default "chirpsieve-verify"). */
  seed?: string | number;
  /** Noise curve; default psdModelFromSpec(bank.noiseCurve). */
  psd?: PsdModel;
  /** Compare every draw with every template instead of its metric neighbours (slow; for checks). */
  exhaustive?: boolean;
  /** Span (s) of time offsets the coarse match grid represents (default: see chooseVerifyLagSpan). */
  lagSpanS?: number;
  /** Number of worst draws to report (default 5). */
  worstCount?: number;
  /** Called after each draw with (done, total). */
  onProgress?: (done: number, total: number) => void;
}

/** One draw's outcome. */
export interface FittingFactorDraw {
  /** Component masses of the draw, heavier first (M_sun). */
  primaryMassSolar: number;
  secondaryMassSolar: number;
  /** Aligned spins χ1, χ2 of the draw (spinning draws only; verifySpins.ts). */
  primarySpin?: number;
  secondarySpin?: number;
  fittingFactor: number;
  /** Index (in bank.templates) of the best template. */
  bestTemplate: number;
}

export interface CoverageReport {
  /** Range of the draws' aligned spins, each body drawn uniformly in it (spinning draws only; verifySpins.ts). */
  spinRange?: [number, number];
  signal: VerifySignal;
  drawSpace: VerifyDrawSpace;
  seed: string;
  draws: number;
  templates: number;
  minimalMatch: number;
  /** Fraction of draws with fitting factor ≥ the bank's minimal match. */
  fractionAboveMinimalMatch: number;
  min: number;
  /** 1st percentile of the fitting factor. */
  p01: number;
  median: number;
  mean: number;
  /** ⟨FF³⟩: the fraction of the event rate kept (Owen 1996); 1 − ⟨FF³⟩ is the expected rate loss. */
  meanCube: number;
  worst: FittingFactorDraw[];
  /** Matches computed per draw, on average (the neighbour search's cost). */
  matchesPerDraw: number;
  /** Frequency grid of the matches. */
  grid: { dfHz: number; nBins: number; fftSize: number };
  wallTimeMs: number;
}

/**
 * Span of time offsets for the coarse match grid: 1/df. Between a signal and templates near it,
 * a·b* / S is smooth in frequency (its Fourier transform is concentrated at their time offsets, tens of
 * ms), so 1/df can be far below the waveform duration: we take 1/32 of the longest duration, between
 * 1 s and 16 s (the matches agree with a grid of df = 1/duration to ~1e-4; test/bank/match.test.ts).
 */
export function chooseVerifyLagSpan(longestDurationS: number): number {
  return Math.min(16, Math.max(1, longestDurationS / 32));
}

/**
 * Most draws one verification makes: it keeps every draw's result (a few hundred bytes each), and
 * at ~2 ms a draw 10^6 draws take about half an hour; the 1st percentile is then known to ±0.01%.
 */
export const MAX_VERIFY_DRAWS = 1_000_000;

/** Uniform draws over the region: in (m1, m2) or in (τ0, τ3), by rejection; seeded. */
export function drawInRegion(region: MassRegion, count: number, space: VerifyDrawSpace, seed: string | number): { m1: number; m2: number }[] {
  const rng = seedrandom(String(seed));
  const { minMassSolar: mMin, maxMassSolar: mMax } = region.limits;
  const out: { m1: number; m2: number }[] = [];
  if (space === "masses") {
    let guard = 0;
    while (out.length < count) {
      if (++guard > 1000 * count + 1e6) throw new InputError(`verify: could not draw inside the mass region`);
      const a = mMin + (mMax - mMin) * rng();
      const b = mMin + (mMax - mMin) * rng();
      const m1 = Math.max(a, b);
      const m2 = Math.min(a, b);
      if (region.containsMasses(m1, m2)) out.push({ m1, m2 });
    }
    return out;
  }
  // Chirp times: bounding box of the region from its boundary.
  let t3lo = Infinity;
  let t3hi = -Infinity;
  const note = (m1: number, m2: number): void => {
    const t = chirpTimesFromComponents(m1, m2, region.fMinHz);
    t3lo = Math.min(t3lo, t.tau3);
    t3hi = Math.max(t3hi, t.tau3);
  };
  for (const e of region.upperChain) {
    for (let k = 0; k <= 200; k++) note(e.from[0] + (k / 200) * (e.to[0] - e.from[0]), e.from[1] + (k / 200) * (e.to[1] - e.from[1]));
  }
  for (let k = 0; k <= 400; k++) {
    const m = region.equalMassTotalMin / 2 + (k / 400) * ((region.equalMassTotalMax - region.equalMassTotalMin) / 2);
    note(m, m);
  }
  let guard = 0;
  while (out.length < count) {
    if (++guard > 10000 * count + 1e6) throw new InputError(`verify: could not draw inside the chirp-time region`);
    const t0 = region.tau0Min + (region.tau0Max - region.tau0Min) * rng();
    const t3 = t3lo + (t3hi - t3lo) * rng();
    if (!region.contains(t0, t3)) continue;
    const { totalMassSolar, eta } = massEtaFromChirpTimes(t0, t3, region.fMinHz);
    const c = componentsFromMassEta(totalMassSolar, Math.min(eta, 0.25));
    out.push({ m1: c.m1, m2: c.m2 });
  }
  return out;
}

/** How far (in units of the modelled radius) the quadratic metric's pre-selection reaches. */
const REACH = 3;

export function fittingFactorQuantile(sorted: number[], q: number): number {
  if (sorted.length === 0) return NaN;
  const x = q * (sorted.length - 1);
  const i = Math.floor(x);
  const f = x - i;
  return i + 1 < sorted.length ? sorted[i] * (1 - f) + sorted[i + 1] * f : sorted[i];
}

/**
 * Fitting factors of `draws` random signals against the bank: for each, the largest match over the
 * bank, maximised over time and phase (match.ts), in the bank's noise curve from its fmin; the
 * fitting factor and its use as a coverage measure follow Apostolatos, Phys. Rev. D 52, 605 (1995) (from memory) and
 * Owen, Phys. Rev. D 53, 6749 (1996) (⟨FF³⟩ as the fraction of the event rate kept).
 *
 * Each draw is compared with its neighbours only. The templates are indexed in the nearly flat chart of
 * phaseChart.ts; those within metric distance d² ≤ REACH² μ_max of the draw (d under the quadratic
 * metric at the draw) get a predicted mismatch μ from the match model of tangentMatch.ts plus the
 * cutoff term of placementMetric.ts, and are evaluated in order of μ while μ ≤ μ_max = 1.5 (1 − best)
 * + 0.01, which shrinks as the best match grows. The model agrees with direct matches to ~1e-3 out to
 * mismatch 0.05 (the cutoff term to 15 %; test/reference/bank.test.ts, test/bank/metric.test.ts), and
 * its contours reach at most ≈ 2 metric radii (REACH = 3 leaves room), so a skipped template cannot
 * beat the best one found. `exhaustive` evaluates every template instead.
 */
export function verifyBank(bank: TemplateBank, options: VerifyOptions = {}): CoverageReport {
  const started = performance.now();
  const draws = options.draws ?? 1000;
  const signal = options.signal ?? "taylorf2";
  const drawSpace = options.drawSpace ?? "masses";
  const seed = String(options.seed ?? "chirpsieve-verify");
  if (!Number.isInteger(draws) || draws < 1) throw parameterError("draws", `must be a positive whole number (got ${draws})`);
  if (draws > MAX_VERIFY_DRAWS) {
    throw parameterError("draws", `${draws} is more than the limit of ${MAX_VERIFY_DRAWS} draws per run; run several with different seeds and pool them`);
  }
  if (signal !== "taylorf2" && signal !== "pn-time") throw new InputError(`signal must be "taylorf2" or "pn-time" (got ${JSON.stringify(signal)})`);
  if (drawSpace !== "masses" && drawSpace !== "chirp-times") {
    throw new InputError(`draw space must be "masses" or "chirp-times" (got ${JSON.stringify(drawSpace)})`);
  }
  if (bank.templates.length === 0) throw new InputError(`verify: the bank has no templates`);
  if (bank.templates.some((t) => (t.primarySpin ?? 0) !== 0 || (t.secondarySpin ?? 0) !== 0)) {
    throw new InputError(`verify: the bank's templates carry aligned spins; verify it with spinning draws (verifyBankWithSpins)`);
  }
  const psd = options.psd ?? psdModelFromSpec(bank.noiseCurve);
  const fmin = bank.fMinHz;
  const fmax = bank.fMaxHz ?? Infinity;
  const region = createMassRegion(
    {
      minMassSolar: bank.massRangeSolar[0],
      maxMassSolar: bank.massRangeSolar[1],
      totalMassCapSolar: bank.totalMassCapSolar,
      massRatioCap: bank.massRatioCap,
    },
    fmin,
  );
  const metric = createChirpTimeMetric({ psd, fMinHz: fmin, fMaxHz: bank.fMaxHz, pointsPerEFold: 60 });
  const chart = createPhaseChart({ psd, fMinHz: fmin, fMaxHz: bank.fMaxHz, region });
  const templates = bank.templates;
  const nT = templates.length;
  const tx = new Float64Array(nT);
  const ty = new Float64Array(nT);
  const tCut = new Float64Array(nT);
  let longest = 0;
  let fTop = 0;
  for (let i = 0; i < nT; i++) {
    const t = templates[i];
    const [x0, x1] = chart.toX(t.tau0, t.tau3);
    tx[i] = x0;
    ty[i] = x1;
    tCut[i] = Math.min(iscoFrequencyHz(t.primaryMassSolar + t.secondaryMassSolar), fmax);
    fTop = Math.max(fTop, tCut[i]);
    longest = Math.max(longest, t.tau0);
  }
  const drawn = drawInRegion(region, draws, drawSpace, seed);
  for (const d of drawn) {
    fTop = Math.max(fTop, Math.min(iscoFrequencyHz(d.m1 + d.m2), fmax));
    longest = Math.max(longest, chirpTimesFromComponents(d.m1, d.m2, fmin).tau0);
  }
  const r = Math.sqrt(1 - bank.matchFloor);
  const index = createPlaneIndex(tx, ty, 2 * r);
  const lagSpan = options.lagSpanS ?? chooseVerifyLagSpan(longest);
  const grid = chooseMatchGrid({ fMaxHz: fTop, lagSpanS: lagSpan });
  const mc = createMatchComputer({ ...grid, psd, fMinHz: fmin });
  const gen = createTaylorF2Generator(grid.nBins, grid.dfHz);
  const sig = new Float64Array(2 * grid.nBins);
  const tmp = new Float64Array(2 * grid.nBins);
  const pn = signal === "pn-time" ? createPnTimeSignalMaker(grid, fmin, fTop) : undefined;

  const results: FittingFactorDraw[] = [];
  let matchCount = 0;
  const candidates: number[] = [];
  for (let k = 0; k < drawn.length; k++) {
    const { m1, m2 } = drawn[k];
    let sigCut = Infinity;
    if (pn) pn.make(m1, m2, sig);
    else {
      gen.generate(sig, fmin, m1, m2, 1, fmax);
      sigCut = Math.min(iscoFrequencyHz(m1 + m2), fmax);
    }
    const sigNorm = mc.normSquared(sig, sigCut);
    let best = 0;
    let bestIdx = -1;
    const evaluate = (i: number): void => {
      const t = templates[i];
      gen.generate(tmp, fmin, t.primaryMassSolar, t.secondaryMassSolar, 1, fmax);
      const m = mc.match(sig, tmp, sigCut, tCut[i], sigNorm).match;
      matchCount++;
      if (m > best) {
        best = m;
        bestIdx = i;
      }
    };
    if (options.exhaustive) {
      for (let i = 0; i < nT; i++) evaluate(i);
    } else {
      const ct = chirpTimesFromComponents(m1, m2, fmin);
      const tangent = metric.tangent(ct.tau0, ct.tau3);
      const cutoffLoss = 0.5 * tangent.sample.cutoffSensitivity;
      const lnMass = Math.log(m1 + m2);
      const gx = chart.pullBack(tangent.sample.g, ct.tau0, ct.tau3);
      const [px, py] = chart.toX(ct.tau0, ct.tau3);
      // Chart distance bound: d_metric ≥ sqrt(λmin) d_chart, λmin of g_x against the identity.
      const [lamMin] = metricRatioRange(gx, { g00: 1, g01: 0, g11: 1 });
      const seen = new Set<number>();
      const modelled = new Set<number>();
      const ranked: { i: number; mu: number }[] = [];
      const allowance = (): number => 1.5 * (1 - best) + 0.01;
      // Start where a template of a covering bank should be; widen while the best found is worse.
      let radius2 = REACH * REACH * (1.5 * (1 - bank.matchFloor) + 0.01);
      for (let round = 0; round < 64; round++) {
        index.within(px, py, Math.sqrt(radius2 / lamMin), candidates);
        for (const i of candidates) {
          if (modelled.has(i)) continue;
          const d0 = tx[i] - px;
          const d1 = ty[i] - py;
          if (gx.g00 * d0 * d0 + 2 * gx.g01 * d0 * d1 + gx.g11 * d1 * d1 > radius2) continue;
          modelled.add(i);
          const t = templates[i];
          const mu =
            tangent.mismatch(t.tau0 - ct.tau0, t.tau3 - ct.tau3) + cutoffLoss * Math.abs(Math.log(t.primaryMassSolar + t.secondaryMassSolar) - lnMass);
          ranked.push({ i, mu });
        }
        ranked.sort((a, b) => a.mu - b.mu || a.i - b.i);
        for (const c of ranked) {
          if (c.mu > allowance()) break;
          if (seen.has(c.i)) continue;
          seen.add(c.i);
          evaluate(c.i);
        }
        const need = REACH * REACH * allowance();
        if (need <= radius2 || modelled.size >= nT) break;
        radius2 = Math.max(need, 2 * radius2);
      }
      if (bestIdx < 0) {
        // No template near at all: fall back to the whole bank.
        for (let i = 0; i < nT; i++) evaluate(i);
      }
    }
    results.push({ primaryMassSolar: m1, secondaryMassSolar: m2, fittingFactor: best, bestTemplate: bestIdx });
    options.onProgress?.(k + 1, drawn.length);
  }
  return {
    signal,
    drawSpace,
    seed,
    ...coverageSummary(results, bank.matchFloor, options.worstCount ?? 5, { templates: nT, matchCount, grid, startedMs: started }),
  };
}

/**
 * The statistics a coverage report gives of its fitting factors: the draws, the fraction at or
 * above the minimal match, min, 1% quantile, median, mean, ⟨FF³⟩ (the rate-loss estimate of Owen,
 * Phys. Rev. D 53, 6749 (1996)) and the worst draws; with the run's template count, matches per
 * draw, match grid and wall time.
 */
export function coverageSummary(
  results: readonly FittingFactorDraw[],
  minimalMatch: number,
  worstCount: number,
  run: { templates: number; matchCount: number; grid: CoverageReport["grid"]; startedMs: number },
): Omit<CoverageReport, "signal" | "drawSpace" | "seed"> {
  const ffs = results.map((x) => x.fittingFactor).sort((a, b) => a - b);
  return {
    draws: results.length,
    minimalMatch,
    fractionAboveMinimalMatch: results.filter((x) => x.fittingFactor >= minimalMatch).length / results.length,
    min: ffs[0],
    p01: fittingFactorQuantile(ffs, 0.01),
    median: fittingFactorQuantile(ffs, 0.5),
    mean: ffs.reduce((s, v) => s + v, 0) / ffs.length,
    meanCube: ffs.reduce((s, v) => s + v * v * v, 0) / ffs.length,
    worst: [...results].sort((a, b) => a.fittingFactor - b.fittingFactor).slice(0, worstCount),
    templates: run.templates,
    matchesPerDraw: run.matchCount / results.length,
    grid: run.grid,
    wallTimeMs: performance.now() - run.startedMs,
  };
}

/**
 * Spectra of TaylorT4 signals on the coarse match grid: h+ of an optimally oriented source (ι = 0),
 * from 0.85 fmin (its 4-cycle start taper lies below the band) to the ISCO, sampled at a power of two
 * ≥ 2.2 × the grid's top frequency, in a series of a power-of-two duration ≥ the signal + 1 s. The
 * grid's frequencies are every m-th bin of that series' DFT (m = grid spacing × series duration),
 * which is the DFT of the series folded onto L = N / m samples, x_L[j] = Σ_l x[j + l L] (sampling
 * a spectrum aliases the time series; common practice, no source): one L-point FFT, planned once.
 */
export function createPnTimeSignalMaker(grid: { dfHz: number; nBins: number }, fmin: number, fTop: number): {
  make(m1: number, m2: number, out: Float64Array, chi1?: number, chi2?: number): void;
} {
  const fs = Math.pow(2, Math.ceil(Math.log2(2.2 * fTop)));
  const foldedLength = Math.round(fs / grid.dfHz);
  const fft = createRealFft(foldedLength);
  const folded = new Float64Array(foldedLength);
  const spec = new Float64Array(foldedLength + 2);
  return {
    make(m1, m2, out, chi1 = 0, chi2 = 0) {
      const fStart = 0.85 * fmin;
      const duration = taylorT4Duration(m1, m2, fStart, undefined, chi1, chi2);
      const seconds = Math.max(1 / grid.dfHz, Math.pow(2, Math.ceil(Math.log2(duration + 1))));
      const n = Math.round(seconds * fs);
      const w: TimeDomainWaveform = taylorT4({
        massSolar1: m1,
        massSolar2: m2,
        distanceMpc: 1,
        inclination: 0,
        coalescencePhase: 0,
        coalescenceTime: seconds - 0.5,
        sampleRate: fs,
        fStartHz: fStart,
        chi1,
        chi2,
      });
      folded.fill(0);
      for (let i = 0; i < w.hPlus.length; i++) {
        const j = w.startIndex + i;
        if (j >= 0 && j < n) folded[j % foldedLength] += w.hPlus[i];
      }
      fft.forward(folded, spec);
      out.fill(0);
      const dt = 1 / fs;
      for (let k = 0; k < grid.nBins && k <= foldedLength / 2; k++) {
        // Scale by dt so the values approximate the continuous transform (irrelevant to the match).
        out[2 * k] = spec[2 * k] * dt;
        out[2 * k + 1] = spec[2 * k + 1] * dt;
      }
    },
  };
}

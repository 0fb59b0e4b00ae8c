// Fitting factors of random aligned-spin signals against any bank, spinning or not.
import seedrandom from "seedrandom";
import { InputError } from "../errors.js";
import type { PsdModel } from "../noise/psdModel.js";
import { psdModelFromSpec } from "../noise/psdTable.js";
import { createTaylorF2Generator } from "../waveform/taylorf2.js";
import { createMassRegion } from "./massRegion.js";
import { chooseMatchGrid, createMatchComputer } from "./match.js";
import { chirpTimesFromComponents, iscoFrequencyHz } from "./chirpTimeCoordinates.js";
import { chooseVerifyLagSpan, coverageSummary, createPnTimeSignalMaker, drawInRegion, type CoverageReport, type FittingFactorDraw, type VerifyOptions } from "./verify.js";
import { createSpinMetric, metricDistance2, spinCoordinatesFromComponents } from "./spinMetric.js";
import type { TemplateBank } from "./templateBank.js";

export interface SpinVerifyOptions extends Omit<VerifyOptions, "drawSpace" | "lagSpanS"> {
  /** Each draw's two aligned spins are drawn uniformly and independently in [min, max], −1 < min ≤ max < 1. */
  spinRange: [number, number];
  /** Templates evaluated per draw at least, nearest by predicted mismatch first (default 32). */
  minNeighbours?: number;
}

/**
 * Fitting factors of `draws` random signals with aligned spins against the bank (spinning templates
 * or not): component masses uniform over the bank's mass region, each body's spin uniform and
 * independent in spinRange (the prior), signal TaylorF2 with those spins (or TaylorT4 with them for
 * signal "pn-time"). Fitting factor and ⟨FF³⟩ as in verify.ts (Apostolatos, Phys. Rev. D 52, 605
 * (1995), from memory; Owen, Phys. Rev. D 53, 6749 (1996)).
 *
 * Templates are ranked by the mismatch the metric of spinMetric.ts predicts in (τ0, τ3, τs) (a
 * non-spinning template has τs = 0) and matched directly in that order: at least `minNeighbours`,
 * then on while the prediction stays below 1.5 (1 − best) + 0.01. Far from a template the quadratic
 * prediction is only a ranking; `exhaustive` matches every template instead.
 */
export function verifyBankWithSpins(bank: TemplateBank, options: SpinVerifyOptions): CoverageReport {
  const started = performance.now();
  const draws = options.draws ?? 1000;
  const signal = options.signal ?? "taylorf2";
  const seed = String(options.seed ?? "chirpsieve-verify");
  const [sLo, sHi] = options.spinRange ?? [];
  if (!(Number.isFinite(sLo) && Number.isFinite(sHi) && sLo > -1 && sHi < 1 && sLo <= sHi)) {
    throw new InputError(`spinRange must be [min, max] with −1 < min ≤ max < 1 (got ${JSON.stringify(options.spinRange)})`);
  }
  if (!Number.isInteger(draws) || draws < 1) throw new InputError(`draws must be a positive integer (got ${draws})`);
  if (signal !== "taylorf2" && signal !== "pn-time") throw new InputError(`signal must be "taylorf2" or "pn-time" (got ${JSON.stringify(signal)})`);
  if (bank.templates.length === 0) throw new InputError(`verify: the bank has no templates`);
  const minNeighbours = options.minNeighbours ?? 32;
  const psd: PsdModel = options.psd ?? psdModelFromSpec(bank.noiseCurve);
  const fmin = bank.fMinHz;
  const fmax = bank.fMaxHz ?? Infinity;
  const region = createMassRegion(
    { minMassSolar: bank.massRangeSolar[0], maxMassSolar: bank.massRangeSolar[1], totalMassCapSolar: bank.totalMassCapSolar, massRatioCap: bank.massRatioCap },
    fmin,
  );
  const metric = createSpinMetric({ psd, fMinHz: fmin, fMaxHz: bank.fMaxHz, minimalMatch: bank.matchFloor });
  const templates = bank.templates;
  const nT = templates.length;
  const tu = new Float64Array(3 * nT);
  const tCut = new Float64Array(nT);
  let longest = 0;
  let fTop = 0;
  for (let i = 0; i < nT; i++) {
    const t = templates[i];
    const u = spinCoordinatesFromComponents(t.primaryMassSolar, t.secondaryMassSolar, t.primarySpin ?? 0, t.secondarySpin ?? 0, fmin);
    tu.set(u, 3 * i);
    tCut[i] = Math.min(iscoFrequencyHz(t.primaryMassSolar + t.secondaryMassSolar), fmax);
    fTop = Math.max(fTop, tCut[i]);
    longest = Math.max(longest, t.tau0);
  }
  const masses = drawInRegion(region, draws, "masses", seed);
  const spinRng = seedrandom(`${seed}/spins`);
  const drawn = masses.map((d) => ({ ...d, chi1: sLo + (sHi - sLo) * spinRng(), chi2: sLo + (sHi - sLo) * spinRng() }));
  for (const d of drawn) {
    fTop = Math.max(fTop, Math.min(iscoFrequencyHz(d.m1 + d.m2), fmax));
    // Aligned spins lengthen the chirp by well under a tenth here; the lag span only needs its scale.
    longest = Math.max(longest, 1.1 * chirpTimesFromComponents(d.m1, d.m2, fmin).tau0);
  }
  const grid = chooseMatchGrid({ fMaxHz: fTop, lagSpanS: chooseVerifyLagSpan(longest) });
  const mc = createMatchComputer({ ...grid, psd, fMinHz: fmin });
  const gen = createTaylorF2Generator(grid.nBins, grid.dfHz);
  const sig = new Float64Array(2 * grid.nBins);
  const tmp = new Float64Array(2 * grid.nBins);
  const pn = signal === "pn-time" ? createPnTimeSignalMaker(grid, fmin, fTop) : undefined;
  const g = new Float64Array(6);
  const order = new Int32Array(nT);
  const mu = new Float64Array(nT);
  const results: FittingFactorDraw[] = [];
  let matchCount = 0;
  for (let k = 0; k < drawn.length; k++) {
    const { m1, m2, chi1, chi2 } = drawn[k];
    let sigCut = Infinity;
    if (pn) pn.make(m1, m2, sig, chi1, chi2);
    else {
      gen.generate(sig, fmin, m1, m2, 1, fmax, chi1, chi2);
      sigCut = Math.min(iscoFrequencyHz(m1 + m2), fmax);
    }
    const sigNorm = mc.normSquared(sig, sigCut);
    const u = spinCoordinatesFromComponents(m1, m2, chi1, chi2, fmin);
    metric.at(u[0], u[1], u[2], g);
    for (let i = 0; i < nT; i++) {
      order[i] = i;
      mu[i] = metricDistance2(g, tu[3 * i] - u[0], tu[3 * i + 1] - u[1], tu[3 * i + 2] - u[2]);
    }
    order.sort((a, b) => mu[a] - mu[b] || a - b);
    let best = 0;
    let bestIdx = -1;
    for (let r = 0; r < nT; r++) {
      const i = order[r];
      if (!options.exhaustive && r >= minNeighbours && mu[i] > 1.5 * (1 - best) + 0.01) break;
      const t = templates[i];
      gen.generate(tmp, fmin, t.primaryMassSolar, t.secondaryMassSolar, 1, fmax, t.primarySpin ?? 0, t.secondarySpin ?? 0);
      const m = mc.match(sig, tmp, sigCut, tCut[i], sigNorm).match;
      matchCount++;
      if (m > best) {
        best = m;
        bestIdx = i;
      }
    }
    results.push({ primaryMassSolar: m1, secondaryMassSolar: m2, primarySpin: chi1, secondarySpin: chi2, fittingFactor: best, bestTemplate: bestIdx });
    options.onProgress?.(k + 1, drawn.length);
  }
  return {
    spinRange: [sLo, sHi],
    signal,
    drawSpace: "masses",
    seed,
    ...coverageSummary(results, bank.matchFloor, options.worstCount ?? 5, { templates: nT, matchCount, grid, startedMs: started }),
  };
}

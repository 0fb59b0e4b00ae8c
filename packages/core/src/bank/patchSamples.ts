// Sample a patch's placement metric: a grid over patch ∩ region, its proper area, and how much the metric varies.
import type { MassRegion } from "./massRegion.js";
import type { Metric2 } from "./metric.js";
import { metricRatioRange } from "./metricRatio.js";
import type { MetricSampler } from "./metricSampler.js";
import type { PatchBox } from "./patch.js";

/**
 * Samples per patch along τ0 and across η. Ours, no source: the grid the placement was built and
 * measured with (test/bank coverage and economy tests); the largest sampled metric must see the
 * variation over a patch, and the split keeps patches short enough (MAX_PATCH_LENGTH_SPACINGS in
 * patchSplit.ts) for 9 columns to do so. Changing either changes every bank.
 */
export const PATCH_SAMPLES_TAU0 = 9;
export const PATCH_SAMPLES_ETA = 5;

/** One sample of the grid: (τ0, η), its metric in chart coordinates, and its grid indices. */
export interface PatchSample {
  tau0: number;
  eta: number;
  g: Metric2;
  i: number;
  j: number;
}

/** The grid over patch ∩ region and the trapezoid estimate of its proper area. */
export interface PatchSampling {
  grid: PatchSample[];
  area: number;
}

/**
 * Samples the patch's placement metric on PATCH_SAMPLES_TAU0 columns of τ0 (its sides included) ×
 * PATCH_SAMPLES_ETA points of η from max(etaLo, η_low(τ0)) to etaHi, skipping columns where the patch
 * misses the region, and integrates the proper-area density by the trapezoid rule on the way. When
 * every column misses (the patch meets the region only between them), one sample at the middle τ0
 * stands for the patch (area 0).
 */
export function samplePatch(region: MassRegion, sampleAt: MetricSampler, box: PatchBox): PatchSampling {
  const { tau0Lo: a, tau0Hi: b, etaLo: e1, etaHi: e2 } = box;
  const nT = PATCH_SAMPLES_TAU0;
  const nE = PATCH_SAMPLES_ETA;
  const grid: PatchSample[] = [];
  let area = 0;
  for (let i = 0; i < nT; i++) {
    const t = a + ((b - a) * i) / (nT - 1);
    const lo = Math.max(e1, region.etaLow(t));
    if (!(lo <= e2)) continue;
    let inner = 0;
    for (let j = 0; j < nE; j++) {
      const eta = lo + ((e2 - lo) * j) / (nE - 1);
      const smp = sampleAt(t, eta);
      grid.push({ tau0: t, eta, g: smp.g, i, j });
      inner += (j === 0 || j === nE - 1 ? 0.5 : 1) * smp.density;
    }
    area += (i === 0 || i === nT - 1 ? 0.5 : 1) * inner * ((e2 - lo) / (nE - 1)) * ((b - a) / (nT - 1));
  }
  if (grid.length === 0) {
    const t = 0.5 * (a + b);
    const el = region.etaLow(t);
    const eta = Number.isFinite(el) ? Math.min(e2, Math.max(e1, el)) : e2;
    grid.push({ tau0: t, eta, g: sampleAt(t, eta).g, i: 0, j: 0 });
  }
  return { grid, area };
}

/** How the sampled metrics vary against the reference (the sample nearest the grid's middle). */
export interface PatchVariation {
  /** The reference sample. */
  mid: PatchSample;
  /** Largest and smallest generalised eigenvalue of any sample against the reference (1 included). */
  lamMax: number;
  lamMin: number;
  /** log(lamMax / lamMin) over the whole grid. */
  logVar: number;
  /** Largest log range along τ0 (over the samples of one η-index), and across η (one τ0-index). */
  logVarT: number;
  logVarE: number;
}

/** The reference sample and the variation of the grid's metrics against it (metricRatioRange). */
export function patchVariation(grid: PatchSample[]): PatchVariation {
  const centrality = (s: PatchSample): number => Math.abs(s.i - (PATCH_SAMPLES_TAU0 - 1) / 2) + Math.abs(s.j - (PATCH_SAMPLES_ETA - 1) / 2);
  const mid = grid.reduce((best, s) => (centrality(s) < centrality(best) ? s : best));
  let lamMax = 1;
  let lamMin = 1;
  const rangeT = new Map<number, [number, number]>(); // per η-index: range along τ0
  const rangeE = new Map<number, [number, number]>(); // per τ0-index: range along η
  for (const smp of grid) {
    const [lo, hi] = metricRatioRange(smp.g, mid.g);
    lamMax = Math.max(lamMax, hi);
    lamMin = Math.min(lamMin, lo);
    const rt = rangeT.get(smp.j) ?? [Infinity, -Infinity];
    rangeT.set(smp.j, [Math.min(rt[0], lo), Math.max(rt[1], hi)]);
    const re = rangeE.get(smp.i) ?? [Infinity, -Infinity];
    rangeE.set(smp.i, [Math.min(re[0], lo), Math.max(re[1], hi)]);
  }
  return {
    mid,
    lamMax,
    lamMin,
    logVar: Math.log(lamMax / lamMin),
    logVarT: Math.log(Math.max(1, ...[...rangeT.values()].map(([lo, hi]) => hi / lo))),
    logVarE: Math.log(Math.max(1, ...[...rangeE.values()].map(([lo, hi]) => hi / lo))),
  };
}

/**
 * The sample rows of a finished patch (LatticePatch.sampleTau0 / samples): the grid's metrics by τ0
 * column, a column null where the patch missed the region; the between-columns fallback sample is left out.
 */
export function sampleRows(box: PatchBox, grid: PatchSample[]): { sampleTau0: number[]; samples: (Metric2[] | null)[] } {
  const { tau0Lo: a, tau0Hi: b } = box;
  const nT = PATCH_SAMPLES_TAU0;
  const sampleTau0 = Array.from({ length: nT }, (_, i) => a + ((b - a) * i) / (nT - 1));
  const samples: (Metric2[] | null)[] = sampleTau0.map(() => null);
  for (const smp of grid) {
    if (smp.tau0 !== sampleTau0[smp.i]) continue;
    (samples[smp.i] ??= new Array<Metric2>(PATCH_SAMPLES_ETA))[smp.j] = smp.g;
  }
  return { sampleTau0, samples };
}

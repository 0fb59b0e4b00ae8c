// Split the region into patches: cut (τ0, η) cells in two while a tighter metric saves more templates than the new seam costs.
import type { MassRegion } from "./massRegion.js";
import { metricDistanceSquared, type Metric2 } from "./metric.js";
import type { MetricSampler } from "./metricSampler.js";
import type { PhaseChart } from "./phaseChart.js";
import type { LatticePatch, PatchBox } from "./patch.js";
import { patchVariation, sampleRows, samplePatch } from "./patchSamples.js";

/**
 * Templates a seam costs per side, per covering radius of its length: a lattice keeps the cells that
 * straddle its boundary, ≈ 0.368 P / r templates for a boundary of proper length P (the boundary layer
 * of metricVolume.ts, our estimate). Rounded down to 0.36 when the cost model was written; kept, since
 * it decides where patches are cut.
 */
export const SEAM_TEMPLATES_PER_RADIUS = 0.36;
/** A patch is cut across a direction only if it is longer than this many lattice spacings there (ours, no source). */
export const MIN_SPLIT_LENGTH_SPACINGS = 4;
/**
 * A patch longer than this many lattice spacings along τ0 is always halved, so that the 9 sample
 * columns of patchSamples.ts stay fine enough to see the metric's variation (ours, no source).
 */
export const MAX_PATCH_LENGTH_SPACINGS = 2000;
/** Cuts stop at this depth whatever the cost model says (2^30 patches along a side is beyond any region). */
export const MAX_SPLIT_DEPTH = 30;
/** τ0 probes (+1) that decide whether a patch meets the region at all (ours, no source). */
export const MEETS_REGION_PROBES = 32;

export interface PatchSplitOptions {
  region: MassRegion;
  chart: PhaseChart;
  sampleAt: MetricSampler;
  /** Covering radius sqrt(1 − MM). */
  radius: number;
  /** Variation λmax/λmin − 1 of a patch's metrics below which it is never cut. */
  tolerance: number;
}

/** The patches in the order they were made (depth first, low half first), with each one's lattice anchor (τ0, τ3). */
export interface PatchSplit {
  patches: LatticePatch[];
  anchors: [number, number][];
}

/** What a cut would gain, given a patch's size and metric variation. */
export interface SplitCostInput {
  /** Estimated template count of the patch (proper area over the hexagonal cell). */
  count: number;
  /** Its length along τ0 and across η, in lattice spacings of the reference metric. */
  lenT: number;
  lenE: number;
  /** log(λmax/λmin) over the patch, along τ0 and across η (patchVariation). */
  logVar: number;
  logVarT: number;
  logVarE: number;
}

/**
 * The templates saved by halving along τ0 (gainT) and along η (gainE), net of the seam. A lattice laid
 * with the largest of the sampled metrics holds about (sqrt(λmax/λmin) − 1) × count templates more than
 * the metric needs; halving along a direction is taken to remove half of that direction's log
 * variation, and adds a seam as long as the patch is across it, paid on both sides. −∞ where the patch
 * is too short to cut (MIN_SPLIT_LENGTH_SPACINGS). Our cost model, no source.
 */
export function splitGains(input: SplitCostInput): { gainT: number; gainE: number } {
  const { count, lenT, lenE, logVar, logVarT, logVarE } = input;
  const excess = (lv: number): number => Math.exp(lv / 2) - 1;
  const seamCost = (lengthSpacings: number): number => 2 * SEAM_TEMPLATES_PER_RADIUS * Math.sqrt(3) * lengthSpacings;
  const gainT = lenT > MIN_SPLIT_LENGTH_SPACINGS ? count * (excess(logVar) - excess(logVar - logVarT / 2)) - seamCost(lenE) : -Infinity;
  const gainE = lenE > MIN_SPLIT_LENGTH_SPACINGS ? count * (excess(logVar) - excess(logVar - logVarE / 2)) - seamCost(lenT) : -Infinity;
  return { gainT, gainE };
}

/**
 * Cuts the region's box {τ0 ∈ [τ0Min, τ0Max], η ∈ [0, 1/4]} recursively, along τ0 or η, while the
 * cost model (splitGains) says a cut pays and the patch's metric varies by more than the tolerance (or
 * while it is longer than MAX_PATCH_LENGTH_SPACINGS). Each finished patch carries its sampled metrics
 * and its conservative metric: the reference sample's scaled by the largest generalised eigenvalue,
 * so it is at least every sample's. Its anchor is the reference sample, where its lattice is pinned.
 * Patches that miss the region are dropped. Pure apart from the sampler's cache.
 */
export function splitIntoPatches(options: PatchSplitOptions): PatchSplit {
  const { region, chart, sampleAt, radius: r, tolerance } = options;
  const spacing = Math.sqrt(3) * r;
  const cellArea = 1.5 * Math.sqrt(3) * r * r;
  const distance = (g: Metric2, p: [number, number], q: [number, number]): number => Math.sqrt(metricDistanceSquared(g, p[0] - q[0], p[1] - q[1]));
  const patches: LatticePatch[] = [];
  const anchors: [number, number][] = [];
  const build = (box: PatchBox, depth: number): void => {
    const { tau0Lo: a, tau0Hi: b, etaLo: e1, etaHi: e2 } = box;
    if (!meetsRegion(region, box)) return;
    const { grid, area } = samplePatch(region, sampleAt, box);
    const v = patchVariation(grid);
    const { mid } = v;
    const ref = mid.g;
    // Sizes in lattice spacings (reference metric): along τ0 at the reference η, and across η.
    const lenT = distance(ref, chart.toX(a, region.tau3At(a, mid.eta)), chart.toX(b, region.tau3At(b, mid.eta))) / spacing;
    const eA = Math.max(e1, Math.min(e2, region.etaLow(mid.tau0)));
    const lenE = distance(ref, chart.toX(mid.tau0, region.tau3At(mid.tau0, eA)), chart.toX(mid.tau0, region.tau3At(mid.tau0, e2))) / spacing;
    const { gainT, gainE } = splitGains({ count: area / cellArea, lenT, lenE, logVar: v.logVar, logVarT: v.logVarT, logVarE: v.logVarE });
    const tooLong = lenT > MAX_PATCH_LENGTH_SPACINGS;
    const worth = v.logVar > Math.log(1 + tolerance) && Math.max(gainT, gainE) > 0;
    if (depth < MAX_SPLIT_DEPTH && (tooLong || worth)) {
      if (tooLong || gainT >= gainE) {
        const m = 0.5 * (a + b);
        build({ ...box, tau0Hi: m }, depth + 1);
        build({ ...box, tau0Lo: m }, depth + 1);
      } else {
        const m = 0.5 * (e1 + e2);
        build({ ...box, etaHi: m }, depth + 1);
        build({ ...box, etaLo: m }, depth + 1);
      }
      return;
    }
    const { sampleTau0, samples } = sampleRows(box, grid);
    patches.push({
      tau0Lo: a,
      tau0Hi: b,
      etaLo: e1,
      etaHi: e2,
      metric: { g00: ref.g00 * v.lamMax, g01: ref.g01 * v.lamMax, g11: ref.g11 * v.lamMax },
      sampleTau0,
      samples,
    });
    anchors.push([mid.tau0, region.tau3At(mid.tau0, mid.eta)]);
  };
  build({ tau0Lo: region.tau0Min, tau0Hi: region.tau0Max, etaLo: 0, etaHi: 0.25 }, 0);
  return { patches, anchors };
}

/** Whether η_low(τ0) ≤ etaHi at one of MEETS_REGION_PROBES + 1 evenly spaced τ0 of the box (its sides included). */
export function meetsRegion(region: MassRegion, box: PatchBox): boolean {
  for (let k = 0; k <= MEETS_REGION_PROBES; k++) {
    const t = box.tau0Lo + ((box.tau0Hi - box.tau0Lo) * k) / MEETS_REGION_PROBES;
    if (region.etaLow(t) <= box.etaHi) return true;
  }
  return false;
}

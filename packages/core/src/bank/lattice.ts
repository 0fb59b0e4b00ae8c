// Bank placement in two dimensions: the stages from region to template positions, in order.
import { InputError } from "../errors.js";
import type { MassRegion } from "./massRegion.js";
import type { ChirpTimeMetric } from "./metric.js";
import type { PhaseChart } from "./phaseChart.js";
import type { LatticePatch, LatticePoint } from "./patch.js";
import { createMetricSampler } from "./metricSampler.js";
import { splitIntoPatches } from "./patchSplit.js";
import { layPatchLattice } from "./patchLattice.js";
import { chooseRunCover, patchRuns, singlePatchRuns } from "./coverChoice.js";
import { placeStrips } from "./stripPlacement.js";
import { mergeCovers } from "./mergeCovers.js";

export type { LatticePatch, LatticePoint } from "./patch.js";
export { metricRatioRange } from "./metricRatio.js";

/**
 * Variation of a patch's metric (λmax/λmin − 1) below which it is never split. Ours, no source: the
 * value the placement was built and measured with (coverage and economy tests in test/bank).
 */
export const DEFAULT_PATCH_TOLERANCE = 0.05;

export interface LatticeOptions {
  region: MassRegion;
  metric: ChirpTimeMetric;
  /** Nearly flat chart the lattice is laid in (phaseChart.ts). */
  chart: PhaseChart;
  /** Minimal match MM ∈ (0, 1): the covering radius is sqrt(1 − MM) in metric distance. */
  minimalMatch: number;
  /** Variation of the metric (λmax/λmin − 1) below which a patch is never split (default DEFAULT_PATCH_TOLERANCE). */
  tolerance?: number;
  /** Cover a patch with rows along its band instead (stripPlacement.ts) when that needs fewer templates (default true). */
  bandRows?: boolean;
  /**
   * Stop (PlacementStopped) once the patches' lattices hold more than LATTICE_BUDGET × this many
   * points, or the placement more than this many: bounds the work and memory whatever the estimate said.
   */
  maxPoints?: number;
}

/**
 * Lattices may hold this many times maxPoints before placement stops: rows along thin bands later
 * replace lattices that hold up to ~3× the templates the rows need (1.2–2 M_sun from 40 Hz; measured here).
 */
const LATTICE_BUDGET = 4;

/** Placement passed LatticeOptions.maxPoints and stopped; `placed` points were laid by then. */
export class PlacementStopped extends Error {
  constructor(readonly placed: number) {
    super(`placement stopped after ${placed} points`);
  }
}

export interface LatticePlacement {
  points: LatticePoint[];
  patches: LatticePatch[];
}

/**
 * Places templates on hexagonal (A2) lattices so that every point of the region lies within metric
 * distance sqrt(1 − MM) of a template: the A2 lattice with nearest-neighbour spacing sqrt(3 (1 − MM))
 * has covering radius (hexagon side) sqrt(1 − MM), so the predicted match is ≥ MM everywhere
 * (Owen, Phys. Rev. D 53, 6749 (1996); hexagonal placement in τ0–τ3 as in Cokelaer, Phys. Rev. D 76,
 * 102004 (2007)).
 *
 * How the metric is followed: the metric of metric.ts is computed in (τ0, τ3), but in those
 * coordinates its very elongated ellipses turn and stretch across the region (for 1–3 M_sun from 30 Hz
 * the generalised eigenvalues against the central metric span 0.64–1.72, and vary by ~25 % across the
 * band's width of a few cells), so lattices laid directly in τ0–τ3 would need patches about a cell wide,
 * and each patch seam costs a row of templates. The lattice is therefore laid in the nearly flat chart
 * of phaseChart.ts (principal components of the PN phase coefficients; there the same metric stays
 * within 0.72–1.08), into which the metric is pulled back; what variation remains (mostly from the ISCO
 * cutoff) is handled by patches {τ0 ∈ [a, b], η ∈ [e1, e2]}, split recursively along τ0 or η while the
 * templates saved by a tighter metric exceed those a new seam costs (splitGains in patchSplit.ts).
 * Each patch gets its own lattice, laid with the largest of its sampled metrics (9 × 5 samples,
 * patchSamples.ts; the
 * reference metric scaled by the largest generalised eigenvalue), which is therefore conservative
 * within the patch. The metric sampled is the placement metric of placementMetric.ts: the largest
 * ellipse inside the minimal-match contour of the linearised-phase match plus the ISCO-cutoff term,
 * which is wider than the quadratic metric's ellipse along the nearly degenerate direction.
 *
 * Boundaries (patchLattice.ts): a patch keeps every lattice point whose hexagonal (Voronoi) cell meets the patch ∩ region:
 * all points whose centre is inside, plus the cell of every point of a walk along the boundary of
 * patch ∩ region in steps of at most r/8 (boundaryWalk.ts; the cells a boundary passes through). Kept points that fall
 * outside the region — on the unphysical side of the equal-mass line (η > 1/4) or beyond a mass
 * limit — are moved to the nearest point of the region's boundary (nearest in the patch metric;
 * boundaryProjection.ts),
 * which keeps the part of their cell inside the region covered because the region is locally convex
 * (as Cokelaer (2007) keeps boundary templates on the physical boundary); so every template lies within
 * the requested limits. A moved point within 0.05 r of another template of its patch is dropped.
 * Rows instead: where staggered rows along the band (stripPlacement.ts) need fewer templates than a
 * patch's lattice with its boundary layer, the patch takes rows (`bandRows`, default on); neighbouring
 * patches (along τ0, same η-range) are covered by one run of rows, which pays for the corners at a
 * τ0-side only at the run's two ends. The choice is made per run, by each patch's share of the run's
 * rows; a run whose rows cannot be laid keeps the lattices where rows fail patch by patch
 * (coverChoice.ts). The covers are merged, each position once (mergeCovers.ts).
 * Deterministic: no randomness; the lattice of a patch is anchored at a sample point of the patch.
 */
export function placeA2Lattice(options: LatticeOptions): LatticePlacement {
  const { region, metric, minimalMatch, chart } = options;
  const tolerance = options.tolerance ?? DEFAULT_PATCH_TOLERANCE;
  const bandRows = options.bandRows ?? true;
  if (!(minimalMatch > 0 && minimalMatch < 1)) throw new InputError(`minimal match must be in (0, 1) (got ${minimalMatch})`);
  if (!(tolerance > 0)) throw new InputError(`lattice: tolerance must be positive (got ${tolerance})`);
  const radius = Math.sqrt(1 - minimalMatch);
  // 1. Split the region into patches, sampling the placement metric over each (metricSampler.ts, patchSamples.ts).
  const sampleAt = createMetricSampler({ region, metric, chart, minimalMatch });
  const { patches, anchors } = splitIntoPatches({ region, chart, sampleAt, radius, tolerance });
  // 2. Lay a lattice in each patch, its boundary covered (patchLattice.ts, boundaryWalk.ts, boundaryProjection.ts).
  const maxPoints = options.maxPoints ?? Infinity;
  let laid = 0;
  const lattices = patches.map((patch, patchIndex) => {
    const lattice = layPatchLattice({ region, chart, patch, anchor: anchors[patchIndex], radius, patchIndex });
    laid += lattice.length;
    if (laid > LATTICE_BUDGET * maxPoints) throw new PlacementStopped(laid);
    return lattice;
  });
  // 3. Rows along the band for each run of patches where they are cheaper (stripPlacement.ts, coverChoice.ts).
  const layRows = (run: number[], clearEnds: boolean): LatticePoint[] | null =>
    placeStrips({ region, chart, patches: run.map((i) => patches[i]), patchIndex: run[0], radius, clearEnds });
  const covers: LatticePoint[][] = [];
  if (!bandRows) for (const [i] of singlePatchRuns(patches)) covers.push(lattices[i]);
  else for (const run of patchRuns(patches)) for (const list of chooseRunCover(run, patches, lattices, layRows)) covers.push(list);
  // 4. Merge, each position once (mergeCovers.ts).
  const points = mergeCovers(covers);
  if (points.length > maxPoints) throw new PlacementStopped(points.length);
  return { points, patches };
}

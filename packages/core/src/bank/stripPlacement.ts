// Lay rows along a thin band: staggered rows covering a run of patches, cheaper than a lattice where the band is narrow.
import type { MassRegion } from "./massRegion.js";
import type { PhaseChart } from "./phaseChart.js";
import type { LatticePatch, LatticePoint } from "./patch.js";
import { bandProfile } from "./bandProfile.js";
import { ACROSS, createBandGeometry, crossSectionGrid, type BandGeometry } from "./bandGeometry.js";
import { rowPieces } from "./rowSpacing.js";
import { COVER_SAFETY, marchPiece } from "./rowMarch.js";

export { rowSpacing } from "./rowSpacing.js";

export interface StripOptions {
  region: MassRegion;
  chart: PhaseChart;
  /**
   * The patches to cover: one, or a run of neighbours along τ0 (each one's tau0Hi the next one's
   * tau0Lo) with the same η-range, covered as one band.
   */
  patches: LatticePatch[];
  /** Index of the first of them (the `patch` label of the points). */
  patchIndex: number;
  /**
   * Run the band on past the τ0-sides of the patches until its end normals clear them (default true).
   * Without it the corners at those sides are not covered: for comparing counts only.
   */
  clearEnds?: boolean;
  /** Covering radius sqrt(1 − MM) in the patch's metric. */
  radius: number;
  /** Largest number of rows tried (default DEFAULT_MAX_ROWS); wider bands are left to the lattice. */
  maxRows?: number;
}

/** Rows tried at most: a band wider than 16 rows is many cells wide, where a lattice's boundary layer costs little (ours, no source). */
export const DEFAULT_MAX_ROWS = 16;
/** Intervals of the band at whose ends its width is measured for the row counts (ours, no source). */
export const WIDTH_INTERVALS = 64;
/** Rows closer than this many covering radii along the band are not worth laying: the lattice does better (ours, no source). */
export const MIN_ROW_SPACING_RADII = 0.5;
/** Cross-section grid nodes per piece and per width interval for the march (ours, no source). */
export const CROSS_NODES = 4;
/** Passes, and overshoot factor, of the end clearance (ours, no source). */
export const CLEAR_PASSES = 3;
export const CLEAR_OVERSHOOT = 1.05;

/**
 * Covers the part of a run of patches inside the region, {τ0 ∈ [a, b], max(η1, η_low(τ0)) ≤ η ≤ η2},
 * with staggered rows of templates running along the band (our construction; no published source).
 *
 * Geometry (bandProfile.ts, bandMetric.ts, bandGeometry.ts). Lengths are measured in the placement
 * metric sampled over the patches (patchSamples.ts), interpolated bilinearly between samples. A station σ is the band's middle curve at τ0 = σ, and its
 * cross-section is the normal there (in the local metric), not the line τ0 = σ: the two differ a lot
 * where the band runs obliquely to τ0. The band is cut along σ into pieces of constant row count k.
 * On each cross-section, the rows sit at metric distances edge + i·d from the lower edge (summed over
 * ACROSS segments in their own local metric), with edge and d from {@link rowSpacing} for the section's
 * width; k minimises (rowSpacing.ts) the density k / spacing for the piece's widest section (widths at WIDTH_INTERVALS + 1
 * stations).
 *
 * March (rowMarch.ts). A piece starts and ends with a full column of k templates on its end normals; in between,
 * each station carries the rows of one parity (all rows when k = 1), so neighbouring rows alternate.
 * A station is accepted only if (i) every triangle it closes between neighbouring rows — the row's
 * previous template, its new one and the neighbour row's latest — has covering radius
 * (triangleCover.ts) at most COVER_SAFETY r = 0.99 r in the local metric at the triangle's centre, and (ii) for an outer
 * row, every edge point collected since that row's previous template (one per sub-step of SUB_STEP r = r/12
 * along the band) lies within 0.99 r of that template or the new one. The zig-zag of triangles between two
 * rows covers the strip between them, and (ii) the strip between an outer row and the band's edge. The
 * step tried first is GROWTH = 1.05 × the ideal staggered step for the local width; if it fails, bisection
 * between the station and it finds the farthest step that passes. A piece where nothing passes gives
 * null (the lattice covers those patches).
 *
 * Ends. Neighbouring pieces share their end normal. Where the band reaches a τ0-side of the run (not a
 * tip of the region, where its width is zero), the last piece runs on until its end normal clears
 * that side (`clearEnds`, endClearance), so the corners there are covered too.
 *
 * Cost. Staggered rows need about k / spacing templates per unit length of band: for a band of width
 * w = 3r, k = 2, edge = r/2 and spacing = √3 r as in the hexagonal lattice, with no boundary layer.
 * The checks make the coverage of the placement metric's discs hold at every station; how well that
 * metric predicts direct matches is measured with direct matches (test/bank/economy.test.ts,
 * test/reference/bank.test.ts).
 */
export function placeStrips(options: StripOptions): LatticePoint[] | null {
  const { region, chart, patches, patchIndex, radius: r } = options;
  const clearEnds = options.clearEnds ?? true;
  const maxRows = options.maxRows ?? DEFAULT_MAX_ROWS;
  // The band must be one piece: a sub-range [aa, bb] of τ0 where the patches meet the region.
  const profile = bandProfile(region, patches);
  if (profile === "broken") return null;
  if (profile === "empty") return [];
  const { a, b, aa, bb } = profile;
  const geometry = createBandGeometry(region, chart, patches, profile);
  // The band's perpendicular width at nodes along it; pieces of constant row count k between them.
  const ts: number[] = [];
  const ws: number[] = [];
  for (let k = 0; k <= WIDTH_INTERVALS; k++) {
    const t = aa + ((bb - aa) * k) / WIDTH_INTERVALS;
    ts.push(t);
    ws.push(geometry.across(t)[ACROSS]);
  }
  const pieces = rowPieces(ts, ws, COVER_SAFETY * r, MIN_ROW_SPACING_RADII * r, maxRows);
  if (pieces === null) return null;
  // Where the band ends at a side of the patch (not at a tip of the region), its end normals lean
  // across that side: the first and last pieces run on until their end normals clear it.
  if (clearEnds && aa === a && a > region.tau0Min) pieces[0].lo = endClearance(region, geometry, a, -1);
  if (clearEnds && bb === b && b < region.tau0Max) pieces[pieces.length - 1].hi = endClearance(region, geometry, b, 1);
  const gridLo = pieces[0].lo;
  const gridHi = pieces[pieces.length - 1].hi;
  const crossAt = crossSectionGrid(geometry, gridLo, gridHi, CROSS_NODES * (pieces.length + WIDTH_INTERVALS));
  const out: LatticePoint[] = [];
  for (const piece of pieces) {
    const rows = marchPiece({ region, geometry, crossAt, lo: piece.lo, hi: piece.hi, rows: piece.rows, radius: r, patchIndex });
    if (rows === null) return null;
    for (const p of rows) out.push(p);
  }
  return out;
}

/**
 * The station beyond `end` (direction −1: below, +1: above) whose normal's ends (fractions 0 and 1)
 * both lie on the far side of `end`: CLEAR_PASSES passes, each moving the station by CLEAR_OVERSHOOT ×
 * how far the normal still falls short, within the region's τ0 range.
 */
export function endClearance(region: MassRegion, geometry: BandGeometry, end: number, direction: 1 | -1): number {
  let sigma = end;
  for (let it = 0; it < CLEAR_PASSES; it++) {
    const over = Math.max(0, ...[0, 1].map((f) => direction * (end - geometry.onNormal(sigma, f))));
    if (over === 0) break;
    sigma = Math.min(region.tau0Max, Math.max(region.tau0Min, sigma + direction * over * CLEAR_OVERSHOOT));
  }
  return sigma;
}

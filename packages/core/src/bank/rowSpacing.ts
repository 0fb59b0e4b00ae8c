// How many staggered rows a band of a given width takes, how they sit across it, and where the row count changes.
import { goldenSectionMax } from "./goldenSection.js";

/** Golden-section steps for the edge distance (0.618^40 ≈ 4e−9 of the range). */
export const ROW_EDGE_GOLDEN_STEPS = 40;

/**
 * Staggered rows across a band of width w (locally Euclidean, discs of radius r): k rows, the outer two
 * at `edge` from the band's edges and the others evenly between, with templates alternating between
 * neighbouring rows at `spacing` along each row. A row's discs cover up to sqrt(r² − spacing²/4) beside
 * it, so edge ≤ that; two neighbouring rows d apart with staggered templates cover the triangles
 * between them when the isosceles triangle of base `spacing` and height d has covering radius ≤ r,
 * i.e. spacing ≤ 2 sqrt(r² − (d − r)²) (with d = 1.5 r, edge = r/2 and spacing = √3 r the hexagonal
 * lattice; common practice, no source). `edge` maximises the smaller of the two spacings (golden
 * section; the smaller of a falling and a single-peaked function is single-peaked).
 */
export function rowSpacing(w: number, k: number, r: number): { edge: number; spacing: number } {
  const fromEdge = (c: number): number => 2 * Math.sqrt(Math.max(0, r * r - c * c));
  if (k === 1) return { edge: w / 2, spacing: fromEdge(w / 2) };
  const spacingAt = (c: number): number => {
    const d = (w - 2 * c) / (k - 1);
    return Math.min(fromEdge(c), 2 * Math.sqrt(Math.max(0, r * r - (d - r) * (d - r))));
  };
  const best = goldenSectionMax(spacingAt, 0, Math.min(w / 2, r), ROW_EDGE_GOLDEN_STEPS);
  return { edge: best.x, spacing: best.value };
}

/**
 * The row count k ∈ [1, maxRows] with the fewest templates per unit length, k / spacing, for a band
 * of width w and discs of radius r (spacings of rowSpacing; a spacing of at most `minSpacing` does not
 * count); 0 when no k qualifies.
 */
export function rowCountFor(w: number, r: number, minSpacing: number, maxRows: number): number {
  let best = 0;
  let bestDensity = Infinity;
  for (let k = 1; k <= maxRows; k++) {
    const spacing = rowSpacing(w, k, r).spacing;
    if (!(spacing > minSpacing)) continue;
    const density = k / spacing;
    if (density < bestDensity) {
      bestDensity = density;
      best = k;
    }
  }
  return best;
}

/** A stretch [lo, hi] of stations (τ0) with one row count. */
export interface RowPiece {
  lo: number;
  hi: number;
  rows: number;
}

/**
 * Pieces of constant row count along a band whose widths `ws` are known at stations `ts` (ascending):
 * each interval takes the count for the wider of its two ends (rowCountFor, discs of radius r), and neighbouring
 * intervals with the same count join. Null where some interval has no count (the band is too wide for
 * maxRows rows).
 */
export function rowPieces(ts: readonly number[], ws: readonly number[], r: number, minSpacing: number, maxRows: number): RowPiece[] | null {
  const pieces: RowPiece[] = [];
  for (let j = 0; j + 1 < ts.length; j++) {
    const k = rowCountFor(Math.max(ws[j], ws[j + 1]), r, minSpacing, maxRows);
    if (k === 0) return null;
    const lastPiece = pieces[pieces.length - 1];
    if (lastPiece && lastPiece.rows === k) lastPiece.hi = ts[j + 1];
    else pieces.push({ lo: ts[j], hi: ts[j + 1], rows: k });
  }
  return pieces;
}

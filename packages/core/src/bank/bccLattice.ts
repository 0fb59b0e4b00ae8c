// The body-centred cubic lattice (A3*): the thinnest lattice covering of three-dimensional space.

/**
 * Covering thickness of A3* (body-centred cubic), Θ = 5√5π/24 ≈ 1.4635: the average number of
 * covering balls over a point. Conway & Sloane, Sphere Packings, Lattices and Groups (1988), Ch. 2,
 * Table 2.3 (the best lattice covering in three dimensions; Bambah 1954).
 */
export const BCC_COVERING_THICKNESS = (5 * Math.sqrt(5) * Math.PI) / 24;

/** Covering thickness of the simple cubic lattice Z³, Θ = √3π/2 ≈ 2.7207 (same source). */
export const CUBIC_COVERING_THICKNESS = (Math.sqrt(3) * Math.PI) / 2;

/** Cube edge of the BCC lattice whose covering radius is ρ: ρ = a√5/4 (the deep hole at (a/2, a/4, 0)). */
export function bccEdgeForCoveringRadius(radius: number): number {
  return (4 * radius) / Math.sqrt(5);
}

/** Volume per point of the BCC lattice of covering radius ρ: a³/2 = (4/3)πρ³ / Θ. */
export function bccCellVolume(radius: number): number {
  const a = bccEdgeForCoveringRadius(radius);
  return (a * a * a) / 2;
}

/**
 * Calls `visit(x, y, z)` for every point of the BCC lattice of covering radius `radius` inside the
 * box [lo, hi] (the cubic points a(i, j, k) and the centres a(i + ½, j + ½, k + ½), offset by `origin`).
 * Every point of the box lies within `radius` of a visited point or of a lattice point at most one
 * cell outside it; pass a box widened by the radius to cover the box itself.
 */
export function forEachBccPoint(
  radius: number,
  lo: [number, number, number],
  hi: [number, number, number],
  visit: (x: number, y: number, z: number) => void,
  origin: [number, number, number] = [0, 0, 0],
): void {
  const a = bccEdgeForCoveringRadius(radius);
  for (const shift of [0, 0.5]) {
    const i0 = Math.ceil((lo[0] - origin[0]) / a - shift);
    const i1 = Math.floor((hi[0] - origin[0]) / a - shift);
    const j0 = Math.ceil((lo[1] - origin[1]) / a - shift);
    const j1 = Math.floor((hi[1] - origin[1]) / a - shift);
    const k0 = Math.ceil((lo[2] - origin[2]) / a - shift);
    const k1 = Math.floor((hi[2] - origin[2]) / a - shift);
    for (let i = i0; i <= i1; i++) {
      for (let j = j0; j <= j1; j++) {
        for (let k = k0; k <= k1; k++) visit(origin[0] + (i + shift) * a, origin[1] + (j + shift) * a, origin[2] + (k + shift) * a);
      }
    }
  }
}

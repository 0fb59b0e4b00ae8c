// A spatial index of template positions in a plane (bucket grid), for neighbour queries.

/** Points in a plane, bucketed on a square grid of side `cell`. */
export interface PlaneIndex {
  readonly size: number;
  /** Indices of all points within Euclidean distance `radius` of (x0, x1), in no particular order. */
  within(x0: number, x1: number, radius: number, out?: number[]): number[];
}

/**
 * Builds a bucket-grid index over points (xs[i], ys[i]). Queries visit only the buckets that meet the
 * query disc, so a query of radius ρ costs O(points within ρ + cell) (common practice, no source).
 */
export function createPlaneIndex(xs: ArrayLike<number>, ys: ArrayLike<number>, cell: number): PlaneIndex {
  const n = xs.length;
  const buckets = new Map<string, number[]>();
  for (let i = 0; i < n; i++) {
    const key = `${Math.floor(xs[i] / cell)},${Math.floor(ys[i] / cell)}`;
    const b = buckets.get(key);
    if (b) b.push(i);
    else buckets.set(key, [i]);
  }
  // Occupied bucket range, to bound very large queries.
  let bx0 = Infinity;
  let bx1 = -Infinity;
  let by0 = Infinity;
  let by1 = -Infinity;
  for (const key of buckets.keys()) {
    const [a, b] = key.split(",").map(Number);
    bx0 = Math.min(bx0, a);
    bx1 = Math.max(bx1, a);
    by0 = Math.min(by0, b);
    by1 = Math.max(by1, b);
  }
  return {
    size: n,
    within(x0, x1, radius, out = []) {
      out.length = 0;
      const r2 = radius * radius;
      const i0 = Math.max(bx0, Math.floor((x0 - radius) / cell));
      const i1 = Math.min(bx1, Math.floor((x0 + radius) / cell));
      const j0 = Math.max(by0, Math.floor((x1 - radius) / cell));
      const j1 = Math.min(by1, Math.floor((x1 + radius) / cell));
      if ((i1 - i0 + 1) * (j1 - j0 + 1) > 4 * buckets.size) {
        // Cheaper to scan every bucket than every grid cell of the query box.
        for (const list of buckets.values()) {
          for (const i of list) if ((xs[i] - x0) ** 2 + (ys[i] - x1) ** 2 <= r2) out.push(i);
        }
        return out;
      }
      for (let i = i0; i <= i1; i++) {
        for (let j = j0; j <= j1; j++) {
          const list = buckets.get(`${i},${j}`);
          if (!list) continue;
          for (const k of list) if ((xs[k] - x0) ** 2 + (ys[k] - x1) ** 2 <= r2) out.push(k);
        }
      }
      return out;
    },
  };
}

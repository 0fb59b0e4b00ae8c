// How large discs centred on a triangle's corners must be to cover the triangle.

/**
 * The covering radius of the triangle abc (Euclidean plane): the largest distance from a point of the
 * triangle to the nearest of its corners, so that discs of radius ρ about a, b and c cover the
 * triangle exactly when ρ is at least this.
 *
 * For a triangle without an obtuse angle it is the circumradius |ab||bc||ca| / (4 area), attained at
 * the circumcentre. For an obtuse triangle the circumcentre lies outside; the farthest point then lies
 * on a side, where the perpendicular bisector of one of the other sides meets it or at its midpoint
 * (common practice, no source; checked against brute-force sampling in test/bank/triangleCover.test.ts).
 */
export function triangleCoveringRadius(a: readonly [number, number], b: readonly [number, number], c: readonly [number, number]): number {
  const ab2 = dist2(a, b);
  const bc2 = dist2(b, c);
  const ca2 = dist2(c, a);
  const cross = Math.abs((b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0]));
  const longest = Math.max(ab2, bc2, ca2);
  if (cross > 0 && ab2 + bc2 + ca2 - longest >= longest) return Math.sqrt(ab2 * bc2 * ca2) / (2 * cross);
  // Obtuse or degenerate: the farthest point lies on a side, at its midpoint or where the
  // perpendicular bisector of a side to the opposite corner crosses it; try each side.
  return Math.max(sideCandidate(a, b, c), sideCandidate(b, c, a), sideCandidate(c, a, b));
}

function dist2(p: readonly [number, number], q: readonly [number, number]): number {
  return (q[0] - p[0]) ** 2 + (q[1] - p[1]) ** 2;
}

/** The largest distance to the nearest corner over the candidate points of side pq (o the third corner). */
function sideCandidate(p: readonly [number, number], q: readonly [number, number], o: readonly [number, number]): number {
  const len = Math.sqrt(dist2(p, q));
  if (len === 0) return 0;
  const u0 = (q[0] - p[0]) / len;
  const u1 = (q[1] - p[1]) / len;
  const along = (o[0] - p[0]) * u0 + (o[1] - p[1]) * u1; // o's projection, measured from p
  const candidates = [0.5 * len];
  if (along > 0) candidates.push(dist2(p, o) / (2 * along)); // equidistant from p and o
  if (len - along > 0) candidates.push(len - dist2(q, o) / (2 * (len - along))); // from q and o
  let best = 0;
  for (const s of candidates) {
    if (!(s >= 0 && s <= len)) continue;
    const x: [number, number] = [p[0] + s * u0, p[1] + s * u1];
    best = Math.max(best, Math.sqrt(Math.min(dist2(x, p), dist2(x, q), dist2(x, o))));
  }
  return best;
}

// Move a lattice point that fell outside the region onto the nearest point of the region's boundary.
import { chirpTimesFromComponents } from "./chirpTimeCoordinates.js";
import { goldenSectionMax } from "./goldenSection.js";
import type { MassRegion } from "./massRegion.js";
import type { ToWhitened } from "./boundaryWalk.js";

/**
 * Half-width of the search window along each boundary piece, in covering radii: a point outside the
 * region lies within its cell's reach (≤ r) of the boundary, so its nearest boundary point is well
 * inside ±3r of where the piece passes its τ0 (ours, no source).
 */
export const PROJECTION_WINDOW_RADII = 3;
/** Intervals of the coarse search in the window (ours, no source). */
export const PROJECTION_SAMPLES = 16;
/** Golden-section steps of the refinement: 0.618^32 ≈ 2e−7 of two sample intervals. */
export const PROJECTION_GOLDEN_STEPS = 32;
/** Bisection steps that find where a piece passes τ0 (2^−44 of its parameter range). */
export const CROSSING_BISECTIONS = 44;
/** Parameter step (fraction of the range) of the finite difference that gives a piece's speed. */
export const SPEED_STEP = 1e-6;

/**
 * The point of the region's boundary nearest (in the patch's whitened chart `toU`) to the lattice point
 * with whitened coordinates `target`, whose chirp time is about `tau0`. Each boundary piece (the
 * equal-mass curve and the edges of the upper chain) is searched within ±PROJECTION_WINDOW_RADII
 * covering radii of where it passes τ0: PROJECTION_SAMPLES + 1 samples, then a golden-section
 * refinement between the best sample's neighbours. Projecting onto a (locally) convex set
 * never moves a point away from any point of the set, so the part of the lattice cell inside the
 * region stays covered.
 */
export function projectOntoBoundary(
  region: MassRegion,
  toU: ToWhitened,
  tau0: number,
  r: number,
  target: [number, number],
): [number, number] {
  const fLow = region.fMinHz;
  const pieces: { curve: (s: number) => [number, number]; sLo: number; sHi: number; decreasing: boolean }[] = [
    { curve: (t) => [t, region.tau3At(t, 0.25)], sLo: region.tau0Min, sHi: region.tau0Max, decreasing: false },
  ];
  for (const edge of region.upperChain) {
    pieces.push({
      curve: (s) => {
        const c = chirpTimesFromComponents(edge.from[0] + s * (edge.to[0] - edge.from[0]), edge.from[1] + s * (edge.to[1] - edge.from[1]), fLow);
        return [c.tau0, c.tau3];
      },
      sLo: 0,
      sHi: 1,
      decreasing: true,
    });
  }
  let best: [number, number] = [tau0, region.tau3At(Math.min(region.tau0Max, Math.max(region.tau0Min, tau0)), 0.25)];
  let bestD = Infinity;
  for (const piece of pieces) {
    const { curve } = piece;
    const dist2 = (s: number): number => {
      const [c0, c3] = curve(s);
      const [v0, v1] = toU(c0, c3);
      return (v0 - target[0]) ** 2 + (v1 - target[1]) ** 2;
    };
    // The parameter where the piece passes τ0 (clamped), and the window of ±3r around it.
    const t0Lo = curve(piece.decreasing ? piece.sHi : piece.sLo)[0];
    const t0Hi = curve(piece.decreasing ? piece.sLo : piece.sHi)[0];
    const tc = Math.min(t0Hi, Math.max(t0Lo, tau0));
    let lo = piece.sLo;
    let hi = piece.sHi;
    for (let it = 0; it < CROSSING_BISECTIONS; it++) {
      const m = 0.5 * (lo + hi);
      const below = curve(m)[0] < tc;
      if (below === piece.decreasing) hi = m;
      else lo = m;
    }
    const sMid = 0.5 * (lo + hi);
    const h = SPEED_STEP * (piece.sHi - piece.sLo);
    const sa = Math.max(piece.sLo, sMid - h);
    const sb = Math.min(piece.sHi, sMid + h);
    const pa = toU(...curve(sa));
    const pb = toU(...curve(sb));
    const perUnit = Math.hypot(pb[0] - pa[0], pb[1] - pa[1]) / (sb - sa);
    // Skip a piece whose nearest part is already farther than the best found (or than 3r from τ0's end).
    const dEnd = dist2(sMid);
    const tauPer = Math.abs(pb[0] - pa[0]) > 0 ? Math.abs(curve(sb)[0] - curve(sa)[0]) / (sb - sa) : 0;
    if (tc !== tau0 && tauPer > 0 && (Math.abs(tau0 - tc) / tauPer) * perUnit > PROJECTION_WINDOW_RADII * r && dEnd > bestD) continue;
    const half = perUnit > 0 ? (PROJECTION_WINDOW_RADII * r) / perUnit : piece.sHi - piece.sLo;
    const wLo = Math.max(piece.sLo, sMid - half);
    const wHi = Math.min(piece.sHi, sMid + half);
    const n = PROJECTION_SAMPLES;
    let kBest = 0;
    let dBest = Infinity;
    for (let k = 0; k <= n; k++) {
      const d = dist2(wLo + ((wHi - wLo) * k) / n);
      if (d < dBest) {
        dBest = d;
        kBest = k;
      }
    }
    const a = wLo + ((wHi - wLo) * Math.max(0, kBest - 1)) / n;
    const b = wLo + ((wHi - wLo) * Math.min(n, kBest + 1)) / n;
    const nearest = goldenSectionMax((x) => -dist2(x), a, b, PROJECTION_GOLDEN_STEPS);
    const sBest = nearest.x;
    const dRefined = -nearest.value;
    const dFinal = Math.min(dRefined, dBest);
    if (dFinal < bestD) {
      bestD = dFinal;
      best = curve(dFinal === dBest && dBest < dRefined ? wLo + ((wHi - wLo) * kBest) / n : sBest);
    }
  }
  return best;
}

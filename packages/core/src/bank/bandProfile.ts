// The band a run of patches covers: where it starts and ends along τ0, and its lower edge η_low(τ0) tabulated.
import type { MassRegion } from "./massRegion.js";
import type { PatchBox } from "./patch.js";

/** Grid intervals of η_low per patch of the run, and at most in all (ours, no source: fine against the band's kinks, which are nodes anyway). */
export const PROFILE_INTERVALS_PER_PATCH = 256;
export const PROFILE_MAX_INTERVALS = 4096;
/** How far beyond the run's τ0 sides the table reaches, as a fraction of its length, where normals and end clearance reach (ours, no source). */
export const PROFILE_OVERHANG = 0.25;
/** Grid nodes in each overhang. */
export const PROFILE_OVERHANG_NODES = 64;
/** Bisection steps that find where the band starts or ends between two nodes (2^−50 of a node interval). */
export const PROFILE_EDGE_BISECTIONS = 50;

/** The band {τ0 ∈ [aa, bb], low(τ0) ≤ η ≤ etaHi} of a run, with its lower edge interpolated from the table. */
export interface BandProfile {
  kind: "band";
  /** The run's τ0 sides, and where the band starts and ends inside them. */
  a: number;
  b: number;
  aa: number;
  bb: number;
  etaLo: number;
  etaHi: number;
  /** Lower edge of the band at τ0: max(etaLo, η_low) from the table (exact beyond it), at most etaHi. */
  low(tau0: number): number;
}

/**
 * The band of the run of boxes (neighbours along τ0, same η-range): η_low on a grid (the region's
 * chain kinks as extra nodes) over [a, b] and PROFILE_OVERHANG of its length beyond either side,
 * interpolated linearly. "empty" where the run misses the region; "broken" where it meets it in more
 * than one stretch of τ0 (rows need one band). The band's ends inside [a, b] are found by bisection on
 * the exact η_low.
 */
export function bandProfile(region: MassRegion, boxes: readonly PatchBox[]): BandProfile | "empty" | "broken" {
  const { tau0Lo: a, etaLo: e1, etaHi: e2 } = boxes[0];
  const b = boxes[boxes.length - 1].tau0Hi;
  const aL = Math.max(region.tau0Min, a - PROFILE_OVERHANG * (b - a));
  const bR = Math.min(region.tau0Max, b + PROFILE_OVERHANG * (b - a));
  const nodes: number[] = [];
  const nGrid = Math.min(PROFILE_MAX_INTERVALS, PROFILE_INTERVALS_PER_PATCH * boxes.length);
  for (let k = 0; k <= nGrid; k++) nodes.push(k === nGrid ? b : a + ((b - a) * k) / nGrid);
  for (let k = 0; k < PROFILE_OVERHANG_NODES; k++) nodes.push(aL + ((a - aL) * k) / PROFILE_OVERHANG_NODES, b + ((bR - b) * (k + 1)) / PROFILE_OVERHANG_NODES);
  for (const t of region.chainTau0) if (t > aL && t < bR && t !== a && t !== b) nodes.push(t);
  nodes.sort((p, q) => p - q);
  const lows = nodes.map((t) => Math.max(e1, region.etaLow(t)));
  const iA = nodes.indexOf(a);
  const iB = nodes.lastIndexOf(b);
  let first = -1;
  let last = -1;
  for (let k = iA; k <= iB; k++) {
    if (lows[k] > e2) continue;
    if (first < 0) first = k;
    else if (last < k - 1) return "broken";
    last = k;
  }
  if (first < 0) return "empty";
  const low = (t: number): number => {
    if (t < aL || t > bR) return Math.min(e2, Math.max(e1, region.etaLow(t)));
    let lo = 0;
    let hi = nodes.length - 1;
    while (hi - lo > 1) {
      const m = (lo + hi) >> 1;
      if (nodes[m] <= t) lo = m;
      else hi = m;
    }
    const f = nodes[hi] > nodes[lo] ? (t - nodes[lo]) / (nodes[hi] - nodes[lo]) : 0;
    return Math.min(e2, lows[lo] + f * (lows[hi] - lows[lo]));
  };
  const edgeBetween = (tIn: number, tOut: number): number => {
    let p = tIn;
    let q = tOut;
    for (let it = 0; it < PROFILE_EDGE_BISECTIONS; it++) {
      const m = 0.5 * (p + q);
      if (Math.max(e1, region.etaLow(m)) <= e2) p = m;
      else q = m;
    }
    return p;
  };
  const aa = first > iA ? edgeBetween(nodes[first], nodes[first - 1]) : a;
  const bb = last < iB ? edgeBetween(nodes[last], nodes[last + 1]) : b;
  if (!(bb > aa)) return "empty";
  return { kind: "band", a, b, aa, bb, etaLo: e1, etaHi: e2, low };
}

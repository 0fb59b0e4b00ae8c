// Cover the boundary: points along the boundary of patch ∩ region, close enough that every lattice cell it crosses is met.
import { chirpTimesFromComponents } from "./chirpTimeCoordinates.js";
import type { MassRegion } from "./massRegion.js";
import type { PatchBox } from "./patch.js";

/** Whitened chart coordinates of (τ0, τ3): a patch's lattice is the A2 lattice of unit metric there. */
export type ToWhitened = (tau0: number, tau3: number) => [number, number];

/** Parameter divisions of a curve the walk tries first (ours, no source; the step then adapts). */
export const WALK_FIRST_DIVISIONS = 64;
/** Halvings of a step that still leaves more than the step bound before the walk takes it anyway. */
export const WALK_MAX_HALVINGS = 60;
/** Growth of the parameter step after a step shorter than half the bound (ours, no source). */
export const WALK_GROWTH = 1.5;
/** Bisection steps that find where a mass edge crosses a τ0 (2^−60 of the edge: double precision). */
export const EDGE_BISECTIONS = 60;

/**
 * Points along a curve θ(s), s ∈ [s0, s1], from θ(s0) on, each within `step` of the previous one in
 * whitened coordinates (the first parameter step is 1/WALK_FIRST_DIVISIONS of the range, halved while
 * too long, grown by WALK_GROWTH when short). Empty when s1 ≤ s0.
 */
export function walkCurve(curve: (s: number) => [number, number], s0: number, s1: number, toU: ToWhitened, step: number): [number, number][] {
  const out: [number, number][] = [];
  if (!(s1 > s0)) return out;
  let s = s0;
  const p = curve(s);
  out.push(p);
  let ds = (s1 - s0) / WALK_FIRST_DIVISIONS;
  let pu = toU(p[0], p[1]);
  while (s < s1) {
    let sn = Math.min(s1, s + ds);
    let q = curve(sn);
    let qu = toU(q[0], q[1]);
    let d = Math.hypot(qu[0] - pu[0], qu[1] - pu[1]);
    let guard = 0;
    while (d > step && guard++ < WALK_MAX_HALVINGS) {
      ds *= 0.5;
      sn = Math.min(s1, s + ds);
      q = curve(sn);
      qu = toU(q[0], q[1]);
      d = Math.hypot(qu[0] - pu[0], qu[1] - pu[1]);
    }
    out.push(q);
    s = sn;
    pu = qu;
    if (d < step / 2) ds *= WALK_GROWTH;
  }
  return out;
}

/**
 * Points (τ0, τ3) along the boundary of the box ∩ region, in this order: the sides τ0 = tau0Lo and
 * τ0 = tau0Hi (by η, from max(etaLo, η_low) up), the sides η = etaLo (when above 0) and η = etaHi (by
 * τ0; points outside the region included — the caller keeps what lies in the patch), and the region's
 * upper chain of mass edges where it crosses [tau0Lo, tau0Hi]. Consecutive points of each piece are
 * at most `step` apart in whitened coordinates, so the lattice cells the boundary passes through are
 * all met when step is well below the cell size (the lattice takes r/8).
 */
export function patchBoundaryPoints(region: MassRegion, box: PatchBox, toU: ToWhitened, step: number): [number, number][] {
  const { tau0Lo: a, tau0Hi: b, etaLo: e1, etaHi: e2 } = box;
  const out: [number, number][] = [];
  const add = (points: [number, number][]): void => {
    for (const p of points) out.push(p);
  };
  for (const t0 of [a, b]) {
    const lo = Math.max(e1, region.etaLow(t0));
    if (lo <= e2) add(walkCurve((eta) => [t0, region.tau3At(t0, eta)], lo, e2, toU, step));
  }
  for (const eta of [e1, e2]) {
    if (eta > 0) add(walkCurve((t0) => [t0, region.tau3At(t0, eta)], a, b, toU, step));
  }
  for (const edge of region.upperChain) {
    const at = (s: number): [number, number] => {
      const m1 = edge.from[0] + s * (edge.to[0] - edge.from[0]);
      const m2 = edge.from[1] + s * (edge.to[1] - edge.from[1]);
      const t = chirpTimesFromComponents(m1, m2, region.fMinHz);
      return [t.tau0, t.tau3];
    };
    // τ0 decreases along the edge: find the parameter range with τ0 ∈ [a, b].
    const sAt = (target: number): number => {
      let lo = 0;
      let hi = 1;
      for (let it = 0; it < EDGE_BISECTIONS; it++) {
        const m = 0.5 * (lo + hi);
        if (at(m)[0] > target) lo = m;
        else hi = m;
      }
      return 0.5 * (lo + hi);
    };
    const t0Start = at(0)[0];
    const t0End = at(1)[0];
    if (t0End > b || t0Start < a) continue;
    const sLo = t0Start > b ? sAt(b) : 0;
    const sHi = t0End < a ? sAt(a) : 1;
    add(walkCurve(at, sLo, sHi, toU, step));
  }
  return out;
}

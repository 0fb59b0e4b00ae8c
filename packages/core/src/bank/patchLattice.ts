// Lay a lattice in a patch: the A2 lattice of the patch's metric, every cell that meets patch ∩ region kept.
import { patchBoundaryPoints } from "./boundaryWalk.js";
import { projectOntoBoundary } from "./boundaryProjection.js";
import type { MassRegion } from "./massRegion.js";
import { metricFactor } from "./metric.js";
import type { LatticePatch, LatticePoint } from "./patch.js";
import type { PhaseChart } from "./phaseChart.js";

/** Step of the boundary walk, in covering radii: well below a cell's inradius (√3/2 r) so no cell is skipped (ours, no source). */
export const WALK_STEP_RADII = 1 / 8;
/** A point moved onto the boundary within this many covering radii of a kept one adds nothing and is dropped (ours, no source). */
export const CLASH_RADII = 0.05;
/** Relative slack on the patch's τ0 sides and on its η sides in the membership test (rounding of the chart round trip). */
export const PATCH_TAU0_SLACK = 1e-12;
export const PATCH_ETA_SLACK = 1e-9;

export interface PatchLatticeOptions {
  region: MassRegion;
  chart: PhaseChart;
  patch: LatticePatch;
  /** (τ0, τ3) of a lattice point: the patch's reference sample. */
  anchor: [number, number];
  /** Covering radius sqrt(1 − MM). */
  radius: number;
  /** The `patch` label of the points. */
  patchIndex: number;
}

/**
 * The A2 lattice of the patch's (conservative) metric in chart coordinates, anchored at `anchor`, with
 * nearest-neighbour spacing √3 r, so covering radius r (Owen, Phys. Rev. D 53, 6749 (1996); hexagonal
 * placement as in Cokelaer, Phys. Rev. D 76, 102004 (2007)). Kept: every lattice point whose
 * hexagonal cell meets patch ∩ region, i.e. those whose centre lies inside (found row by row, each
 * point's chirp times by Newton's method from its neighbour's) and those nearest to a point of the
 * boundary walk (boundaryWalk.ts, steps of WALK_STEP_RADII). Kept points outside the region are moved
 * to the nearest point of its boundary (boundaryProjection.ts), dropped if that lands within
 * CLASH_RADII of a point already kept. Order: inside points by lattice row then column, then the moved ones.
 */
export function layPatchLattice(options: PatchLatticeOptions): LatticePoint[] {
  const { region, chart, patch, anchor, radius: r, patchIndex: pIndex } = options;
  const spacing = Math.sqrt(3) * r;
  const rowStep = (spacing * Math.sqrt(3)) / 2;
  const walkStep = WALK_STEP_RADII * r;
  const { w00, w01, w11 } = metricFactor(patch.metric);
  // u = W x (whitened chart coordinates of this patch's metric).
  const toU = (t0: number, t3: number): [number, number] => {
    const [x0, x1] = chart.toX(t0, t3);
    return [w00 * x0 + w01 * x1, w11 * x1];
  };
  const fromU = (u0: number, u1: number, guess: [number, number]): [number, number] | null => {
    const x1 = u1 / w11;
    const x0 = (u0 - w01 * x1) / w00;
    return chart.toTau(x0, x1, guess[0], guess[1]);
  };
  const [o0, o1] = toU(anchor[0], anchor[1]);
  const lat = (i: number, j: number): [number, number] => [o0 + i * spacing + j * 0.5 * spacing, o1 + j * rowStep];
  const nearest = (u0: number, u1: number): [number, number] => {
    const jf = (u1 - o1) / rowStep;
    const ifr = (u0 - o0 - jf * 0.5 * spacing) / spacing;
    const i0 = Math.floor(ifr);
    const j0 = Math.floor(jf);
    let best: [number, number] = [i0, j0];
    let bd = Infinity;
    for (let di = 0; di <= 1; di++) {
      for (let dj = 0; dj <= 1; dj++) {
        const [p0, p1] = lat(i0 + di, j0 + dj);
        const d = (p0 - u0) * (p0 - u0) + (p1 - u1) * (p1 - u1);
        if (d < bd) {
          bd = d;
          best = [i0 + di, j0 + dj];
        }
      }
    }
    return best;
  };
  const inPatch = (t0: number, t3: number): boolean => {
    if (t0 < patch.tau0Lo * (1 - PATCH_TAU0_SLACK) || t0 > patch.tau0Hi * (1 + PATCH_TAU0_SLACK)) return false;
    const eta = region.etaAt(t0, t3);
    if (eta < patch.etaLo * (1 - PATCH_ETA_SLACK) || eta > patch.etaHi * (1 + PATCH_ETA_SLACK)) return false;
    return region.contains(t0, t3);
  };
  // Lattice points kept, by key "i,j", with the chirp times of a nearby known point (Newton's guess).
  const kept = new Map<string, [number, number]>();
  const exact = new Set<string>(); // keys whose stored chirp times are the lattice point itself
  // Per row: extent in u0 of the boundary points near it, and chirp times at the low end.
  const rows = new Map<number, { lo: number; hi: number; guess: [number, number] }>();
  for (const [t0, t3] of patchBoundaryPoints(region, patch, toU, walkStep)) {
    if (!inPatch(t0, t3)) continue;
    const [u0, u1] = toU(t0, t3);
    const [i, j] = nearest(u0, u1);
    const key = `${i},${j}`;
    if (!kept.has(key)) kept.set(key, [t0, t3]);
    const jLo = Math.ceil((u1 - o1 - walkStep) / rowStep);
    const jHi = Math.floor((u1 - o1 + walkStep) / rowStep);
    for (let jj = jLo; jj <= jHi; jj++) {
      const e = rows.get(jj);
      if (e) {
        if (u0 < e.lo) {
          e.lo = u0;
          e.guess = [t0, t3];
        }
        if (u0 > e.hi) e.hi = u0;
      } else rows.set(jj, { lo: u0, hi: u0, guess: [t0, t3] });
    }
  }
  // Interior: lattice points whose centre lies inside patch ∩ region, row by row (each row's
  // chirp times found by Newton's method from the previous point of the row).
  const sortedRows = [...rows.entries()].sort((p, q) => p[0] - q[0]);
  for (const [j, row] of sortedRows) {
    const base = o0 + j * 0.5 * spacing;
    const iLo = Math.floor((row.lo - walkStep - base) / spacing);
    const iHi = Math.ceil((row.hi + walkStep - base) / spacing);
    let guess = row.guess;
    for (let i = iLo; i <= iHi; i++) {
      const key = `${i},${j}`;
      const known = kept.get(key);
      if (known) {
        guess = known;
        continue;
      }
      const [u0, u1] = lat(i, j);
      const t = fromU(u0, u1, guess);
      if (!t) continue;
      guess = t;
      if (inPatch(t[0], t[1])) {
        kept.set(key, t);
        exact.add(key);
      }
    }
  }
  // Convert; move points outside the region onto its boundary.
  const here: LatticePoint[] = [];
  const clash = CLASH_RADII * r;
  const near = new Map<string, [number, number][]>(); // hash of whitened positions, cell `clash`
  const cellKey = (a: number, b: number): string => `${Math.floor(a / clash)},${Math.floor(b / clash)}`;
  const remember = (q: [number, number]): void => {
    const k = cellKey(q[0], q[1]);
    const list = near.get(k);
    if (list) list.push(q);
    else near.set(k, [q]);
  };
  const clashes = (q: [number, number]): boolean => {
    const ci = Math.floor(q[0] / clash);
    const cj = Math.floor(q[1] / clash);
    for (let di = -1; di <= 1; di++) {
      for (let dj = -1; dj <= 1; dj++) {
        for (const h of near.get(`${ci + di},${cj + dj}`) ?? []) if (Math.hypot(h[0] - q[0], h[1] - q[1]) < clash) return true;
      }
    }
    return false;
  };
  const keys = [...kept.keys()].map((k) => k.split(",").map(Number) as [number, number]).sort((p, q) => p[1] - q[1] || p[0] - q[0]);
  const outside: [number, number, number, number][] = [];
  for (const [i, j] of keys) {
    const key = `${i},${j}`;
    const [u0, u1] = lat(i, j);
    const t = exact.has(key) ? kept.get(key)! : fromU(u0, u1, kept.get(key)!);
    if (!t) continue;
    const [t0, t3] = t;
    if (t0 > 0 && t3 > 0 && region.contains(t0, t3)) {
      here.push({ tau0: t0, tau3: t3, patch: pIndex, projected: false });
      remember([u0, u1]);
    } else outside.push([t0, t3, u0, u1]);
  }
  for (const [t0, , u0, u1] of outside) {
    const p = projectOntoBoundary(region, toU, t0, r, [u0, u1]);
    const q = toU(p[0], p[1]);
    if (!clashes(q)) {
      here.push({ tau0: p[0], tau3: p[1], patch: pIndex, projected: true });
      remember(q);
    }
  }
  return here;
}

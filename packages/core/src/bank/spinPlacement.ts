// Placement of aligned-spin templates over masses and a spin range, in the coordinates (τ0, τ3, τs)
// of spinMetric.ts: an A3* (body-centred cubic) lattice per slab of τ0 whose boundary gaps a
// stochastic pass fills, or the stochastic placement alone.
import seedrandom from "seedrandom";
import type { MassRegion } from "./massRegion.js";
import { bccCellVolume, forEachBccPoint } from "./bccLattice.js";
import { choleskyFactor3, metricDeterminant3, metricDistance2, spinCoordinatesFromComponents, type Metric3, type SpinMetric } from "./spinMetric.js";
import { componentsFromMassEta, massEtaFromChirpTimes } from "./chirpTimeCoordinates.js";

/** Largest ratio of the volume element sqrt(det g) within one lattice slab. */
const SLAB_VOLUME_RATIO = 2;

/** The region of a spinning bank: the mass region and equal aligned spins χ1 = χ2 ∈ [min, max]. */
export interface SpinRegion {
  masses: MassRegion;
  spinRange: [number, number];
}

/** How templates are placed: "lattice" (A3* per slab, then a stochastic fill) or "stochastic". */
export type SpinPlacementKind = "lattice" | "stochastic";

export interface SpinPlacementOptions {
  region: SpinRegion;
  metric: SpinMetric;
  minimalMatch: number;
  kind: SpinPlacementKind;
  /** Seed of the stochastic proposals (default "chirpsieve-spin-bank"). */
  seed?: string | number;
  /**
   * The stochastic pass stops after this many proposals in a row were already covered (default
   * 4000): the region left uncovered is then about 1/stopAfter of it, in the proposals' measure.
   */
  stopAfter?: number;
}

/** A placed point: coordinates and the physical template. */
export interface SpinPoint {
  u: [number, number, number];
  totalMassSolar: number;
  eta: number;
  spin: number;
}

export interface SpinPlacement {
  points: SpinPoint[];
  /** Points laid by the lattice (0 for "stochastic"). */
  latticeCount: number;
  /** Points added by the stochastic pass. */
  stochasticCount: number;
  /** Proposals drawn by the stochastic pass. */
  proposals: number;
  /** Slabs of τ0 the lattice was laid in. */
  slabs: number;
}

/** Total mass, η and equal spin of (τ0, τ3, τs) when it lies in the region, else undefined. */
export function spinRegionPoint(region: SpinRegion, u: readonly number[]): { totalMassSolar: number; eta: number; spin: number } | undefined {
  const m = region.masses;
  const [t0, t3, ts] = u;
  if (!(t0 >= m.tau0Min && t0 <= m.tau0Max && t3 > 0)) return undefined;
  if (!m.contains(t0, t3)) return undefined;
  const { totalMassSolar, eta } = massEtaFromChirpTimes(t0, t3, m.fMinHz);
  const spin = (12 * ((4 * Math.PI * ts) / t3)) / (113 - 76 * Math.min(eta, 0.25));
  const [lo, hi] = region.spinRange;
  const slack = 1e-9 * Math.max(1, hi - lo);
  if (!(spin >= lo - slack && spin <= hi + slack)) return undefined;
  return { totalMassSolar, eta: Math.min(eta, 0.25), spin: Math.min(hi, Math.max(lo, spin)) };
}

/** Coordinates of equal spins χ at (τ0, η). */
function coordinatesAt(region: SpinRegion, tau0: number, eta: number, spin: number): [number, number, number] {
  const tau3 = region.masses.tau3At(tau0, eta);
  return [tau0, tau3, (tau3 * spin * (113 - 76 * eta)) / (48 * Math.PI)];
}

/** Inverse of a symmetric 3 × 3 metric, same layout. */
function inverse3(g: Metric3): Metric3 {
  const det = metricDeterminant3(g);
  return Float64Array.of(
    (g[3] * g[5] - g[4] * g[4]) / det,
    (g[2] * g[4] - g[1] * g[5]) / det,
    (g[1] * g[4] - g[2] * g[3]) / det,
    (g[0] * g[5] - g[2] * g[2]) / det,
    (g[1] * g[2] - g[0] * g[4]) / det,
    (g[0] * g[3] - g[1] * g[1]) / det,
  );
}

/** Eigenvalues of a symmetric 3 × 3 matrix (trigonometric closed form; common practice, no source). */
export function symmetricEigenvalues3(g: Metric3): [number, number, number] {
  const [a, b, c, d, e, f] = g; // [[a b c][b d e][c e f]]
  const p1 = b * b + c * c + e * e;
  const q = (a + d + f) / 3;
  if (p1 === 0) return [a, d, f].sort((x, y) => x - y) as [number, number, number];
  const p2 = (a - q) ** 2 + (d - q) ** 2 + (f - q) ** 2 + 2 * p1;
  const p = Math.sqrt(p2 / 6);
  const B = Float64Array.of((a - q) / p, b / p, c / p, (d - q) / p, e / p, (f - q) / p);
  const r = metricDeterminant3(B) / 2;
  const phi = r <= -1 ? Math.PI / 3 : r >= 1 ? 0 : Math.acos(r) / 3;
  const l1 = q + 2 * p * Math.cos(phi);
  const l3 = q + 2 * p * Math.cos(phi + (2 * Math.PI) / 3);
  return [l3, 3 * q - l1 - l3, l1];
}

/** Eigenvalues of Lᵀ... the metric g seen in the orthonormal frame of g_ref = L Lᵀ: those of L⁻¹ g L⁻ᵀ. */
function relativeEigenvalues(lRef: Float64Array, g: Metric3): [number, number, number] {
  // Solve for M = L⁻¹ g L⁻ᵀ by forward substitution on columns.
  const G = [
    [g[0], g[1], g[2]],
    [g[1], g[3], g[4]],
    [g[2], g[4], g[5]],
  ];
  const Linv = invertLower(lRef);
  const T = mul(Linv, G);
  const M = mul(T, transpose(Linv));
  return symmetricEigenvalues3(Float64Array.of(M[0][0], M[0][1], M[0][2], M[1][1], M[1][2], M[2][2]));
}

function invertLower(l: Float64Array): number[][] {
  const [l00, , , l10, l11, , l20, l21, l22] = l;
  const i00 = 1 / l00;
  const i11 = 1 / l11;
  const i22 = 1 / l22;
  const i10 = -l10 * i00 * i11;
  const i21 = -l21 * i11 * i22;
  const i20 = -(l20 * i00 + l21 * i10) * i22;
  return [
    [i00, 0, 0],
    [i10, i11, 0],
    [i20, i21, i22],
  ];
}

function mul(a: number[][], b: number[][]): number[][] {
  return a.map((row) => [0, 1, 2].map((j) => row[0] * b[0][j] + row[1] * b[1][j] + row[2] * b[2][j]));
}

function transpose(a: number[][]): number[][] {
  return [0, 1, 2].map((i) => [a[0][i], a[1][i], a[2][i]]);
}

/** A bucket grid over points in three dimensions (common practice, no source). */
function createSpaceIndex(cell: [number, number, number]): {
  add(i: number, u: readonly number[]): void;
  forEachInBox(lo: readonly number[], hi: readonly number[], visit: (i: number) => boolean): boolean;
} {
  const buckets = new Map<string, number[]>();
  const key = (a: number, b: number, c: number): string => `${a},${b},${c}`;
  return {
    add(i, u) {
      const k = key(Math.floor(u[0] / cell[0]), Math.floor(u[1] / cell[1]), Math.floor(u[2] / cell[2]));
      const b = buckets.get(k);
      if (b) b.push(i);
      else buckets.set(k, [i]);
    },
    forEachInBox(lo, hi, visit) {
      const a0 = Math.floor(lo[0] / cell[0]);
      const a1 = Math.floor(hi[0] / cell[0]);
      const b0 = Math.floor(lo[1] / cell[1]);
      const b1 = Math.floor(hi[1] / cell[1]);
      const c0 = Math.floor(lo[2] / cell[2]);
      const c1 = Math.floor(hi[2] / cell[2]);
      for (let a = a0; a <= a1; a++) {
        for (let b = b0; b <= b1; b++) {
          for (let c = c0; c <= c1; c++) {
            const list = buckets.get(key(a, b, c));
            if (list) for (const i of list) if (visit(i)) return true;
          }
        }
      }
      return false;
    },
  };
}

/** Samples of the region at a slab [lnLo, lnHi] of ln τ0: a grid over τ0, η from the region's lowest to 1/4, and both spin ends. */
function slabSamples(region: SpinRegion, lnLo: number, lnHi: number, nT: number, nEta: number, nSpin: number): [number, number, number][] {
  const out: [number, number, number][] = [];
  const m = region.masses;
  const [sLo, sHi] = region.spinRange;
  for (let i = 0; i < nT; i++) {
    const t0 = Math.exp(lnLo + ((lnHi - lnLo) * i) / Math.max(1, nT - 1));
    const e0 = Math.min(0.25, m.etaLow(t0));
    for (let j = 0; j < nEta; j++) {
      const eta = e0 + ((0.25 - e0) * j) / Math.max(1, nEta - 1);
      for (let k = 0; k < nSpin; k++) out.push(coordinatesAt(region, t0, eta, sLo + ((sHi - sLo) * k) / Math.max(1, nSpin - 1)));
    }
  }
  return out;
}

/**
 * Places templates so that every point of the region lies within metric distance sqrt(1 − MM) of
 * one (1 − match ≈ g(Δu, Δu); spinMetric.ts).
 *
 * "lattice": the τ0 range is cut into slabs in which the volume element sqrt(det g) varies by at most
 * a factor {@link SLAB_VOLUME_RATIO}; each slab gets a BCC lattice of covering radius sqrt(1 − MM) in
 * the orthonormal frame of the metric at its centre, and keeps the points inside the slab and the region. Lattice points that fall outside the region are dropped, so
 * the boundary and the seams between slabs are left to the stochastic pass below.
 *
 * The stochastic pass (Harry, Allen & Sathyaprakash, Phys. Rev. D 80, 104014 (2009); Babak, Class.
 * Quantum Grav. 25, 195011 (2008), from memory) draws seeded points over the region (half uniform in
 * (τ0, τ3), half on the equal-mass and mass-limit faces, log-uniform in τ0), uniform in spin, and keeps a draw as a template when no template lies within the
 * minimal-match ellipsoid of the metric at the draw; it stops after `stopAfter` covered draws in a row.
 */
export function placeSpinTemplates(options: SpinPlacementOptions): SpinPlacement {
  const { region, metric, minimalMatch } = options;
  const r2 = 1 - minimalMatch;
  const r = Math.sqrt(r2);
  const m = region.masses;
  const points: SpinPoint[] = [];
  const lnLo = Math.log(m.tau0Min);
  const lnHi = Math.log(m.tau0Max);

  // Bucket sizes: the median half-widths of the minimal-match ellipsoid over a coarse sample.
  const widths: number[][] = [[], [], []];
  for (const u of slabSamples(region, lnLo, lnHi, 6, 3, 2)) {
    const gi = inverse3(metric.at(u[0], u[1], u[2]));
    widths[0].push(r * Math.sqrt(gi[0]));
    widths[1].push(r * Math.sqrt(gi[3]));
    widths[2].push(r * Math.sqrt(gi[5]));
  }
  const median = (xs: number[]): number => xs.sort((a, b) => a - b)[Math.floor(xs.length / 2)];
  const index = createSpaceIndex([median(widths[0]), median(widths[1]), median(widths[2])]);
  const add = (u: [number, number, number], p: { totalMassSolar: number; eta: number; spin: number }): void => {
    index.add(points.length, u);
    points.push({ u, ...p });
  };

  let latticeCount = 0;
  let slabs = 0;
  if (options.kind === "lattice") {
    const stack: [number, number, number][] = [[lnLo, lnHi, 0]];
    while (stack.length > 0) {
      const [a, b, depth] = stack.pop()!;
      const mid = 0.5 * (a + b);
      const t0 = Math.exp(mid);
      const e0 = Math.min(0.25, m.etaLow(t0));
      const [sLo, sHi] = region.spinRange;
      const centre = coordinatesAt(region, t0, 0.5 * (e0 + 0.25), 0.5 * (sLo + sHi));
      const gRef = metric.at(centre[0], centre[1], centre[2]);
      const L = choleskyFactor3(gRef);
      // The cell volume follows sqrt(det g); along the nearly degenerate direction the ellipsoids
      // reach far beyond the region's thickness, so their turning matters little and a slab is
      // cut only where the volume element changes. The fill below catches what the lattice misses.
      const detRef = metricDeterminant3(gRef);
      let ratioMax = 1;
      let ratioMin = 1;
      for (const u of slabSamples(region, a, b, 3, 4, 2)) {
        const q = Math.sqrt(metricDeterminant3(metric.at(u[0], u[1], u[2])) / detRef);
        ratioMax = Math.max(ratioMax, q);
        ratioMin = Math.min(ratioMin, q);
      }
      if (ratioMax / ratioMin > SLAB_VOLUME_RATIO && b - a > 0.01 && depth < 14) {
        stack.push([a, mid, depth + 1], [mid, b, depth + 1]);
        continue;
      }
      slabs++;
      const rho = r;
      // x = Lᵀ u is orthonormal for g_ref; bound the slab there.
      const toX = (u: readonly number[]): [number, number, number] => [
        L[0] * u[0] + L[3] * u[1] + L[6] * u[2],
        L[4] * u[1] + L[7] * u[2],
        L[8] * u[2],
      ];
      const lo: [number, number, number] = [Infinity, Infinity, Infinity];
      const hi: [number, number, number] = [-Infinity, -Infinity, -Infinity];
      for (const u of slabSamples(region, a, b, 9, 9, 2)) {
        const x = toX(u);
        for (let i = 0; i < 3; i++) {
          lo[i] = Math.min(lo[i], x[i] - rho);
          hi[i] = Math.max(hi[i], x[i] + rho);
        }
      }
      const tLo = Math.exp(a);
      const tHi = Math.exp(b);
      const last = b >= lnHi;
      forEachBccPoint(rho, lo, hi, (x0, x1, x2) => {
        // u = L⁻ᵀ x (back substitution).
        const u2 = x2 / L[8];
        const u1 = (x1 - L[7] * u2) / L[4];
        const u0 = (x0 - L[3] * u1 - L[6] * u2) / L[0];
        if (!(u0 >= tLo && (u0 < tHi || (last && u0 <= tHi)))) return;
        const u: [number, number, number] = [u0, u1, u2];
        const p = spinRegionPoint(region, u);
        if (!p) return;
        add(u, p);
        latticeCount++;
      });
    }
  }

  // The stochastic pass: the whole placement, or the fill of the lattice's boundary gaps.
  const rng = seedrandom(String(options.seed ?? "chirpsieve-spin-bank"));
  const stopAfter = options.stopAfter ?? 4000;
  let t3lo = Infinity;
  let t3hi = -Infinity;
  for (const u of slabSamples(region, lnLo, lnHi, 400, 2, 1)) {
    t3lo = Math.min(t3lo, u[1]);
    t3hi = Math.max(t3hi, u[1]);
  }
  for (const e of m.upperChain) {
    for (let k = 0; k <= 100; k++) {
      const m1 = e.from[0] + (k / 100) * (e.to[0] - e.from[0]);
      const m2 = e.from[1] + (k / 100) * (e.to[1] - e.from[1]);
      const t3 = spinCoordinatesFromComponents(m1, m2, 0, 0, m.fMinHz)[1];
      t3lo = Math.min(t3lo, t3);
      t3hi = Math.max(t3hi, t3);
    }
  }
  const [sLo, sHi] = region.spinRange;
  let run = 0;
  let proposals = 0;
  let stochasticCount = 0;
  const g = new Float64Array(6);
  const boxLo = [0, 0, 0];
  const boxHi = [0, 0, 0];
  let draws = 0;
  while (run < stopAfter) {
    if (++draws > 1000 * stopAfter + 1e7) throw new Error("spin placement: could not draw inside the region");
    // Half the draws fill the interior (uniform in τ0, τ3); the other half lie on the faces of equal
    // masses and of the mass limits, log-uniform in τ0, so that the corners, small in (τ0, τ3), are
    // drawn often enough for the stopping rule to see them.
    const kind = rng();
    let t0: number;
    let t3: number;
    if (kind < 0.5) {
      t0 = m.tau0Min + (m.tau0Max - m.tau0Min) * rng();
      t3 = t3lo + (t3hi - t3lo) * rng();
    } else {
      t0 = Math.exp(lnLo + (lnHi - lnLo) * rng());
      const eLow = Math.min(0.25, m.etaLow(t0));
      t3 = m.tau3At(t0, kind < 0.75 ? 0.25 : eLow + 1e-9 * (0.25 - eLow));
    }
    const spin = sLo + (sHi - sLo) * rng();
    if (!m.contains(t0, t3)) continue;
    proposals++;
    const eta = Math.min(0.25, massEtaFromChirpTimes(t0, t3, m.fMinHz).eta);
    const u: [number, number, number] = [t0, t3, (t3 * spin * (113 - 76 * eta)) / (48 * Math.PI)];
    metric.at(u[0], u[1], u[2], g);
    const gi = inverse3(g);
    const h = [r * Math.sqrt(gi[0]), r * Math.sqrt(gi[3]), r * Math.sqrt(gi[5])];
    for (let i = 0; i < 3; i++) {
      boxLo[i] = u[i] - h[i];
      boxHi[i] = u[i] + h[i];
    }
    const covered = index.forEachInBox(boxLo, boxHi, (i) => {
      const q = points[i].u;
      return metricDistance2(g, q[0] - u[0], q[1] - u[1], q[2] - u[2]) <= r2;
    });
    if (covered) {
      run++;
      continue;
    }
    run = 0;
    const { totalMassSolar } = massEtaFromChirpTimes(t0, t3, m.fMinHz);
    add(u, { totalMassSolar, eta, spin });
    stochasticCount++;
  }
  return { points, latticeCount, stochasticCount, proposals, slabs };
}

/** Component masses (m1 ≥ m2) of a placed point. */
export function spinPointComponents(p: SpinPoint): { m1: number; m2: number } {
  return componentsFromMassEta(p.totalMassSolar, p.eta);
}

/**
 * Proper volume ∫ sqrt(det g) dτ0 dτ3 dτs of the region, by quadrature over (ln τ0, η, χ) with the
 * Jacobian τ0 · (3/5) τ3/η · τ3 (113 − 76η)/(48π) (τ3 ∝ η^{−3/5} at fixed τ0; τs = τ3 χ (113 − 76η)/(48π)).
 */
export function spinRegionProperVolume(region: SpinRegion, metric: SpinMetric, nT = 24, nEta = 10, nSpin = 3): number {
  const m = region.masses;
  const lnLo = Math.log(m.tau0Min);
  const lnHi = Math.log(m.tau0Max);
  const [sLo, sHi] = region.spinRange;
  let total = 0;
  const g = new Float64Array(6);
  for (let i = 0; i < nT; i++) {
    const t0 = Math.exp(lnLo + ((i + 0.5) / nT) * (lnHi - lnLo));
    const e0 = Math.min(0.25, m.etaLow(t0));
    if (!(e0 < 0.25)) continue;
    for (let j = 0; j < nEta; j++) {
      const eta = e0 + ((j + 0.5) / nEta) * (0.25 - e0);
      for (let k = 0; k < nSpin; k++) {
        const spin = sLo + ((k + 0.5) / nSpin) * (sHi - sLo);
        const u = coordinatesAt(region, t0, eta, spin);
        metric.at(u[0], u[1], u[2], g);
        const jac = t0 * ((0.6 * u[1]) / eta) * ((u[1] * (113 - 76 * eta)) / (48 * Math.PI));
        total += Math.sqrt(Math.max(0, metricDeterminant3(g))) * jac * ((lnHi - lnLo) / nT) * ((0.25 - e0) / nEta) * ((sHi - sLo) / nSpin);
      }
    }
  }
  return total;
}

/** The metric-volume estimate of a covering: proper volume over the BCC cell of covering radius sqrt(1 − MM). */
export function spinVolumeEstimate(properVolume: number, minimalMatch: number): number {
  return properVolume / bccCellVolume(Math.sqrt(1 - minimalMatch));
}

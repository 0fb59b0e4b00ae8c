// Hexagonal (A2) lattice placement of templates over a mass region in chirp-time coordinates.
import { InputError } from "../errors.js";
import type { MassRegion } from "./massRegion.js";
import { metricDistanceSquared, metricFactor, type ChirpTimeMetric, type Metric2 } from "./metric.js";
import { placementMetric } from "./placementMetric.js";
import { placeStrips } from "./stripPlacement.js";
import { goldenSectionMax } from "./goldenSection.js";
import { chirpTimesFromComponents } from "./chirpTimeCoordinates.js";
import type { PhaseChart } from "./phaseChart.js";

/** One placed lattice point. */
export interface LatticePoint {
  tau0: number;
  tau3: number;
  /** Index of the patch whose lattice it belongs to. */
  patch: number;
  /** True when the lattice point fell outside the region and was moved onto its boundary. */
  projected: boolean;
}

/** A cell of the (τ0, η) plane with the one metric its lattice was laid with. */
export interface LatticePatch {
  tau0Lo: number;
  tau0Hi: number;
  etaLo: number;
  etaHi: number;
  /** The conservative placement metric of the patch (placementMetric.ts), in chart coordinates. */
  metric: Metric2;
  /**
   * The placement metrics (chart coordinates) sampled over the patch: samples[i][j] at τ0 =
   * sampleTau0[i] and η at the fraction j/(columns − 1) of [max(etaLo, η_low(τ0)), etaHi]; a row is
   * null where the patch does not meet the region at that τ0.
   */
  sampleTau0: number[];
  samples: (Metric2[] | null)[];
}

export interface LatticeOptions {
  region: MassRegion;
  metric: ChirpTimeMetric;
  /** Nearly flat chart the lattice is laid in (phaseChart.ts). */
  chart: PhaseChart;
  /** Minimal match MM ∈ (0, 1): the covering radius is sqrt(1 − MM) in metric distance. */
  minimalMatch: number;
  /** Variation of the metric (λmax/λmin − 1) below which a patch is never split (default 0.05). */
  tolerance?: number;
  /** Cover a patch with rows along its band instead (stripPlacement.ts) when that needs fewer templates (default true). */
  bandRows?: boolean;
  /**
   * Stop (PlacementStopped) once the patches' lattices hold more than LATTICE_BUDGET × this many
   * points, or the placement more than this many: bounds the work and memory whatever the estimate said.
   */
  maxPoints?: number;
}

/**
 * Lattices may hold this many times maxPoints before placement stops: rows along thin bands later
 * replace lattices that hold up to ~3× the templates the rows need (1.2–2 M_sun from 40 Hz).
 */
const LATTICE_BUDGET = 4;

/** Placement passed LatticeOptions.maxPoints and stopped; `placed` points were laid by then. */
export class PlacementStopped extends Error {
  constructor(readonly placed: number) {
    super(`placement stopped after ${placed} points`);
  }
}

export interface LatticePlacement {
  points: LatticePoint[];
  patches: LatticePatch[];
}

/** Generalised eigenvalues (min, max) of the pencil (a, b): the range of (xᵀ a x)/(xᵀ b x). */
export function metricRatioRange(a: Metric2, b: Metric2): [number, number] {
  // Whiten by b = Wᵀ W (W upper triangular), then the eigenvalues of W⁻ᵀ a W⁻¹.
  const { w00, w01, w11 } = metricFactor(b);
  // W⁻¹ = [[1/w00, −w01/(w00 w11)], [0, 1/w11]]
  const i00 = 1 / w00;
  const i01 = -w01 / (w00 * w11);
  const i11 = 1 / w11;
  const m00 = a.g00 * i00 * i00;
  const m01 = i00 * (a.g00 * i01 + a.g01 * i11);
  const m11 = a.g00 * i01 * i01 + 2 * a.g01 * i01 * i11 + a.g11 * i11 * i11;
  const tr = 0.5 * (m00 + m11);
  const disc = Math.sqrt(Math.max(0, 0.25 * (m00 - m11) * (m00 - m11) + m01 * m01));
  return [tr - disc, tr + disc];
}

/**
 * Places templates on hexagonal (A2) lattices so that every point of the region lies within metric
 * distance sqrt(1 − MM) of a template: the A2 lattice with nearest-neighbour spacing sqrt(3 (1 − MM))
 * has covering radius (hexagon side) sqrt(1 − MM), so the predicted match is ≥ MM everywhere
 * (Owen, Phys. Rev. D 53, 6749 (1996); hexagonal placement in τ0–τ3 as in Cokelaer, Phys. Rev. D 76,
 * 102004 (2007)).
 *
 * How the metric is followed: the metric of metric.ts is computed in (τ0, τ3), but in those
 * coordinates its very elongated ellipses turn and stretch across the region (for 1–3 M_sun from 30 Hz
 * the generalised eigenvalues against the central metric span 0.64–1.72, and vary by ~25 % across the
 * band's width of a few cells), so lattices laid directly in τ0–τ3 would need patches about a cell wide,
 * and each patch seam costs a row of templates. The lattice is therefore laid in the nearly flat chart
 * of phaseChart.ts (principal components of the PN phase coefficients; there the same metric stays
 * within 0.72–1.08), into which the metric is pulled back; what variation remains (mostly from the ISCO
 * cutoff) is handled by patches {τ0 ∈ [a, b], η ∈ [e1, e2]}, split recursively along τ0 or η while the
 * templates saved by a tighter metric exceed those a new seam costs (a cost model in the code below).
 * Each patch gets its own lattice, laid with the largest of its sampled metrics (9 × 5 samples; the
 * reference metric scaled by the largest generalised eigenvalue), which is therefore conservative
 * within the patch. The metric sampled is the placement metric of placementMetric.ts: the largest
 * ellipse inside the minimal-match contour of the linearised-phase match plus the ISCO-cutoff term,
 * which is wider than the quadratic metric's ellipse along the nearly degenerate direction.
 *
 * Boundaries: a patch keeps every lattice point whose hexagonal (Voronoi) cell meets the patch ∩ region:
 * all points whose centre is inside, plus the cell of every point of a walk along the boundary of
 * patch ∩ region in steps of at most r/8 (the cells a boundary passes through). Kept points that fall
 * outside the region — on the unphysical side of the equal-mass line (η > 1/4) or beyond a mass
 * limit — are moved to the nearest point of the region's boundary (nearest in the patch metric),
 * which keeps the part of their cell inside the region covered because the region is locally convex
 * (as Cokelaer (2007) keeps boundary templates on the physical boundary); so every template lies within
 * the requested limits. A moved point within 0.05 r of another template of its patch is dropped.
 * Rows instead: where staggered rows along the band (stripPlacement.ts) need fewer templates than a
 * patch's lattice with its boundary layer, the patch takes rows (`bandRows`, default on); neighbouring
 * patches (along τ0, same η-range) are covered by one run of rows, which pays for the corners at a
 * τ0-side only at the run's two ends. The choice is made per run, by each patch's share of the run's
 * rows; a run whose rows cannot be laid keeps the lattices where rows fail patch by patch.
 * Deterministic: no randomness; the lattice of a patch is anchored at a sample point of the patch.
 */
export function placeA2Lattice(options: LatticeOptions): LatticePlacement {
  const { region, metric, minimalMatch, chart } = options;
  const tolerance = options.tolerance ?? 0.05;
  const bandRows = options.bandRows ?? true;
  if (!(minimalMatch > 0 && minimalMatch < 1)) throw new InputError(`minimal match must be in (0, 1) (got ${minimalMatch})`);
  if (!(tolerance > 0)) throw new InputError(`lattice: tolerance must be positive (got ${tolerance})`);
  const r = Math.sqrt(1 - minimalMatch);
  const spacing = Math.sqrt(3) * r;
  const fLow = region.fLowHz;

  // Effective metric in chart coordinates, and the proper-area density in (τ0, η) at that point.
  // Remembered by exact (τ0, η): a split patch's halves share about half their sample points with it.
  const sampled = new Map<number, Map<number, { g: Metric2; density: number }>>();
  const sampleAt = (tau0: number, eta: number): { g: Metric2; density: number } => {
    let column = sampled.get(tau0);
    const known = column?.get(eta);
    if (known) return known;
    const tau3 = region.tau3At(tau0, eta);
    const gTau = placementMetric(metric.tangent(tau0, tau3), tau0, tau3, minimalMatch);
    const dens = Math.sqrt(Math.max(0, gTau.g00 * gTau.g11 - gTau.g01 * gTau.g01)) * ((0.6 * tau3) / eta);
    const smp = { g: chart.pullBack(gTau, tau0, tau3), density: dens };
    if (!column) sampled.set(tau0, (column = new Map()));
    column.set(eta, smp);
    return smp;
  };
  const distRef = (g: Metric2, p: [number, number], q: [number, number]): number => Math.sqrt(metricDistanceSquared(g, p[0] - q[0], p[1] - q[1]));
  const cellArea = 1.5 * Math.sqrt(3) * r * r;

  // ---- Patches -------------------------------------------------------------------------------
  // A patch's lattice uses the largest of its sampled metrics, so it holds about
  // (sqrt(λmax/λmin) − 1) × (its template count) more templates than the metric needs; splitting it
  // saves part of that but adds a seam, along which both halves keep the cells that straddle it
  // (≈ 0.36 × seam length / r extra templates on each side). A patch is split, along τ0 or η,
  // when the saving exceeds the seam's cost (and its variation exceeds `tolerance`).
  const patches: LatticePatch[] = [];
  const patchAnchors: [number, number][] = [];
  const nT = 9;
  const nE = 5;
  const build = (a: number, b: number, e1: number, e2: number, depth: number): void => {
    let nonEmpty = false;
    for (let k = 0; k <= 32; k++) {
      const t = a + ((b - a) * k) / 32;
      if (region.etaLow(t) <= e2) {
        nonEmpty = true;
        break;
      }
    }
    if (!nonEmpty) return;
    // Sample grid over patch ∩ region; trapezoid estimate of its proper area on the way.
    const grid: { tau0: number; eta: number; g: Metric2; i: number; j: number }[] = [];
    let area = 0;
    for (let i = 0; i < nT; i++) {
      const t = a + ((b - a) * i) / (nT - 1);
      const lo = Math.max(e1, region.etaLow(t));
      if (!(lo <= e2)) continue;
      let inner = 0;
      for (let j = 0; j < nE; j++) {
        const eta = lo + ((e2 - lo) * j) / (nE - 1);
        const smp = sampleAt(t, eta);
        grid.push({ tau0: t, eta, g: smp.g, i, j });
        inner += (j === 0 || j === nE - 1 ? 0.5 : 1) * smp.density;
      }
      area += (i === 0 || i === nT - 1 ? 0.5 : 1) * inner * ((e2 - lo) / (nE - 1)) * ((b - a) / (nT - 1));
    }
    if (grid.length === 0) {
      // The patch meets the region only between the τ0 samples.
      const t = 0.5 * (a + b);
      const el = region.etaLow(t);
      const eta = Number.isFinite(el) ? Math.min(e2, Math.max(e1, el)) : e2;
      grid.push({ tau0: t, eta, g: sampleAt(t, eta).g, i: 0, j: 0 });
    }
    // Reference: the sample nearest the middle of the grid.
    const centrality = (s: { i: number; j: number }): number => Math.abs(s.i - (nT - 1) / 2) + Math.abs(s.j - (nE - 1) / 2);
    const mid = grid.reduce((best, s) => (centrality(s) < centrality(best) ? s : best));
    const ref = mid.g;
    let lamMax = 1;
    let lamMin = 1;
    const rangeT = new Map<number, [number, number]>(); // per η-index: range along τ0
    const rangeE = new Map<number, [number, number]>(); // per τ0-index: range along η
    for (const smp of grid) {
      const [lo, hi] = metricRatioRange(smp.g, ref);
      lamMax = Math.max(lamMax, hi);
      lamMin = Math.min(lamMin, lo);
      const rt = rangeT.get(smp.j) ?? [Infinity, -Infinity];
      rangeT.set(smp.j, [Math.min(rt[0], lo), Math.max(rt[1], hi)]);
      const re = rangeE.get(smp.i) ?? [Infinity, -Infinity];
      rangeE.set(smp.i, [Math.min(re[0], lo), Math.max(re[1], hi)]);
    }
    const logVar = Math.log(lamMax / lamMin);
    const logVarT = Math.log(Math.max(1, ...[...rangeT.values()].map(([lo, hi]) => hi / lo)));
    const logVarE = Math.log(Math.max(1, ...[...rangeE.values()].map(([lo, hi]) => hi / lo)));
    // Sizes in lattice spacings (reference metric): along τ0 at the reference η, and across η.
    const lenT = distRef(ref, chart.toX(a, region.tau3At(a, mid.eta)), chart.toX(b, region.tau3At(b, mid.eta))) / spacing;
    const eA = Math.max(e1, Math.min(e2, region.etaLow(mid.tau0)));
    const lenE = distRef(ref, chart.toX(mid.tau0, region.tau3At(mid.tau0, eA)), chart.toX(mid.tau0, region.tau3At(mid.tau0, e2))) / spacing;
    const count = area / cellArea;
    const excess = (lv: number): number => Math.exp(lv / 2) - 1;
    const seamCost = (lengthSpacings: number): number => 2 * 0.36 * Math.sqrt(3) * lengthSpacings;
    const gainT = lenT > 4 ? count * (excess(logVar) - excess(logVar - logVarT / 2)) - seamCost(lenE) : -Infinity;
    const gainE = lenE > 4 ? count * (excess(logVar) - excess(logVar - logVarE / 2)) - seamCost(lenT) : -Infinity;
    const tooLong = lenT > 2000; // keep the 9-sample grid fine enough to see the variation
    const worth = logVar > Math.log(1 + tolerance) && Math.max(gainT, gainE) > 0;
    if (depth < 30 && (tooLong || worth)) {
      if (tooLong || gainT >= gainE) {
        const m = 0.5 * (a + b);
        build(a, m, e1, e2, depth + 1);
        build(m, b, e1, e2, depth + 1);
      } else {
        const m = 0.5 * (e1 + e2);
        build(a, b, e1, m, depth + 1);
        build(a, b, m, e2, depth + 1);
      }
      return;
    }
    const sampleTau0 = Array.from({ length: nT }, (_, i) => a + ((b - a) * i) / (nT - 1));
    const samples: (Metric2[] | null)[] = sampleTau0.map(() => null);
    for (const smp of grid) {
      if (smp.tau0 !== sampleTau0[smp.i]) continue; // the between-samples fallback
      (samples[smp.i] ??= new Array<Metric2>(nE))[smp.j] = smp.g;
    }
    patches.push({
      tau0Lo: a,
      tau0Hi: b,
      etaLo: e1,
      etaHi: e2,
      metric: { g00: ref.g00 * lamMax, g01: ref.g01 * lamMax, g11: ref.g11 * lamMax },
      sampleTau0,
      samples,
    });
    patchAnchors.push([mid.tau0, region.tau3At(mid.tau0, mid.eta)]);
  };
  build(region.tau0Min, region.tau0Max, 0, 0.25, 0);

  // ---- Lattices ------------------------------------------------------------------------------
  const points: LatticePoint[] = [];
  const latticePoints: LatticePoint[][] = [];
  const maxPoints = options.maxPoints ?? Infinity;
  let laid = 0;
  const rowStep = (spacing * Math.sqrt(3)) / 2;
  const walkStep = r / 8;
  patches.forEach((patch, pIndex) => {
    const G = patch.metric;
    const { w00, w01, w11 } = metricFactor(G);
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
    const anchor = patchAnchors[pIndex];
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
    const tolT = 1e-12;
    const inPatch = (t0: number, t3: number): boolean => {
      if (t0 < patch.tau0Lo * (1 - tolT) || t0 > patch.tau0Hi * (1 + tolT)) return false;
      const eta = region.etaAt(t0, t3);
      if (eta < patch.etaLo * (1 - 1e-9) || eta > patch.etaHi * (1 + 1e-9)) return false;
      return region.contains(t0, t3);
    };
    // Lattice points kept, by key "i,j", with the chirp times of a nearby known point (Newton's guess).
    const kept = new Map<string, [number, number]>();
    const exact = new Set<string>(); // keys whose stored chirp times are the lattice point itself
    // Per row: extent in u0 of the boundary points near it, and chirp times at the low end.
    const rows = new Map<number, { lo: number; hi: number; guess: [number, number] }>();
    const visit = (t0: number, t3: number): void => {
      if (!inPatch(t0, t3)) return;
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
    };
    // Walks a curve θ(s), s ∈ [s0, s1], with whitened steps ≤ walkStep.
    const walk = (curve: (s: number) => [number, number], s0: number, s1: number): void => {
      if (!(s1 > s0)) return;
      let s = s0;
      const p = curve(s);
      visit(p[0], p[1]);
      let ds = (s1 - s0) / 64;
      let pu = toU(p[0], p[1]);
      while (s < s1) {
        let sn = Math.min(s1, s + ds);
        let q = curve(sn);
        let qu = toU(q[0], q[1]);
        let d = Math.hypot(qu[0] - pu[0], qu[1] - pu[1]);
        let guard = 0;
        while (d > walkStep && guard++ < 60) {
          ds *= 0.5;
          sn = Math.min(s1, s + ds);
          q = curve(sn);
          qu = toU(q[0], q[1]);
          d = Math.hypot(qu[0] - pu[0], qu[1] - pu[1]);
        }
        visit(q[0], q[1]);
        s = sn;
        pu = qu;
        if (d < walkStep / 2) ds *= 1.5;
      }
    };
    const { tau0Lo: a, tau0Hi: b, etaLo: e1, etaHi: e2 } = patch;
    // (1), (2): the τ0 = a and τ0 = b sides, parametrised by η.
    for (const t0 of [a, b]) {
      const lo = Math.max(e1, region.etaLow(t0));
      if (lo <= e2) walk((eta) => [t0, region.tau3At(t0, eta)], lo, e2);
    }
    // (3), (4): the η = e1 and η = e2 sides, parametrised by τ0 (points outside the region are skipped).
    for (const eta of [e1, e2]) {
      if (eta > 0) walk((t0) => [t0, region.tau3At(t0, eta)], a, b);
    }
    // (5): the region's upper chain where it crosses the patch, parametrised along each mass edge.
    for (const edge of region.upperChain) {
      const at = (s: number): [number, number] => {
        const m1 = edge.from[0] + s * (edge.to[0] - edge.from[0]);
        const m2 = edge.from[1] + s * (edge.to[1] - edge.from[1]);
        const t = chirpTimesFromComponents(m1, m2, fLow);
        return [t.tau0, t.tau3];
      };
      // τ0 decreases along the edge: find the parameter range with τ0 ∈ [a, b].
      const sAt = (target: number): number => {
        let lo = 0;
        let hi = 1;
        for (let it = 0; it < 60; it++) {
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
      walk(at, sLo, sHi);
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
    const near = new Map<string, [number, number][]>(); // hash of whitened positions, cell 0.05 r
    const cellKey = (a: number, b: number): string => `${Math.floor(a / (0.05 * r))},${Math.floor(b / (0.05 * r))}`;
    const remember = (q: [number, number]): void => {
      const k = cellKey(q[0], q[1]);
      const list = near.get(k);
      if (list) list.push(q);
      else near.set(k, [q]);
    };
    const clashes = (q: [number, number]): boolean => {
      const ci = Math.floor(q[0] / (0.05 * r));
      const cj = Math.floor(q[1] / (0.05 * r));
      for (let di = -1; di <= 1; di++) {
        for (let dj = -1; dj <= 1; dj++) {
          for (const h of near.get(`${ci + di},${cj + dj}`) ?? []) if (Math.hypot(h[0] - q[0], h[1] - q[1]) < 0.05 * r) return true;
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
    latticePoints.push(here);
    laid += here.length;
    if (laid > LATTICE_BUDGET * maxPoints) throw new PlacementStopped(laid);
  });
  // Runs of neighbouring patches (along τ0, same η-range) are covered by one band of rows, which pays
  // for the corners at a τ0-side only at the run's two ends. Decided per run: the run takes its rows
  // when they are fewer than its lattices and every inner patch's share of them (templates by τ0) is
  // smaller than its own lattice; the end patches' shares hold the ends' clearance, which any run pays.
  // Otherwise each patch decides alone (its rows laid without that clearance, against its lattice),
  // and the patches that take rows are laid again as runs; a run that then fails keeps its lattices.
  const order = patches.map((_, i) => i).sort((p, q) => patches[p].tau0Lo - patches[q].tau0Lo || patches[p].etaLo - patches[q].etaLo);
  const latticeCount = (run: number[]): number => run.reduce((sum, i) => sum + latticePoints[i].length, 0);
  // Appended one by one: a spread of a run's rows (10⁵ and more) would overflow the call stack.
  const append = (list: LatticePoint[]): void => {
    for (const p of list) points.push(p);
  };
  const latticeOf = (run: number[]): void => {
    for (const i of run) append(latticePoints[i]);
  };
  const layRun = (run: number[]): LatticePoint[] | null =>
    placeStrips({ region, chart, patches: run.map((i) => patches[i]), patchIndex: run[0], radius: r });
  const coverRun = (run: number[]): void => {
    const rows = layRun(run);
    if (rows !== null && rows.length < latticeCount(run)) {
      const share = new Array<number>(run.length).fill(0);
      for (const p of rows) {
        let k = 0;
        while (k < run.length - 1 && p.tau0 >= patches[run[k]].tau0Hi) k++;
        share[k]++;
      }
      if (run.every((i, k) => k === 0 || k === run.length - 1 || share[k] < latticePoints[i].length)) {
        append(rows);
        return;
      }
    }
    if (run.length === 1) return latticeOf(run);
    let piece: number[] = [];
    const flush = (): void => {
      if (piece.length === 0) return;
      const again = layRun(piece);
      if (again !== null && again.length < latticeCount(piece)) append(again);
      else latticeOf(piece);
      piece = [];
    };
    for (const i of run) {
      const alone = placeStrips({ region, chart, patches: [patches[i]], patchIndex: i, radius: r, clearEnds: false });
      if (alone !== null && alone.length < latticePoints[i].length) piece.push(i);
      else {
        flush();
        latticeOf([i]);
      }
    }
    flush();
  };
  const done = new Set<number>();
  for (const first of order) {
    if (done.has(first)) continue;
    done.add(first);
    if (!bandRows) {
      latticeOf([first]);
      continue;
    }
    const run = [first];
    for (;;) {
      const tail = patches[run[run.length - 1]];
      const next = order.find((i) => !done.has(i) && patches[i].tau0Lo === tail.tau0Hi && patches[i].etaLo === tail.etaLo && patches[i].etaHi === tail.etaHi);
      if (next === undefined) break;
      done.add(next);
      run.push(next);
    }
    coverRun(run);
  }
  // Neighbouring pieces of rows share their end normal and can put a template on the same point
  // (the middle row of an odd row count): keep one of each.
  const seen = new Set<string>();
  const unique = points.filter((p) => {
    const key = `${p.tau0.toPrecision(12)},${p.tau3.toPrecision(12)}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
  if (unique.length > maxPoints) throw new PlacementStopped(unique.length);
  return { points: unique, patches };
}

/**
 * The point of the region's boundary nearest (in the patch's whitened chart `toU`) to the lattice point
 * with whitened coordinates `target`, whose chirp time is about `tau0`. Each boundary piece (the
 * equal-mass curve and the edges of the upper chain) is searched within ±3 covering radii of τ0: 33
 * samples, then a golden-section refinement around the best. Projecting onto a (locally) convex set
 * never moves a point away from any point of the set, so the part of the lattice cell inside the
 * region stays covered.
 */
function projectOntoBoundary(
  region: MassRegion,
  toU: (t0: number, t3: number) => [number, number],
  tau0: number,
  r: number,
  target: [number, number],
): [number, number] {
  const fLow = region.fLowHz;
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
    for (let it = 0; it < 44; it++) {
      const m = 0.5 * (lo + hi);
      const below = curve(m)[0] < tc;
      if (below === piece.decreasing) hi = m;
      else lo = m;
    }
    const sMid = 0.5 * (lo + hi);
    const h = 1e-6 * (piece.sHi - piece.sLo);
    const sa = Math.max(piece.sLo, sMid - h);
    const sb = Math.min(piece.sHi, sMid + h);
    const pa = toU(...curve(sa));
    const pb = toU(...curve(sb));
    const perUnit = Math.hypot(pb[0] - pa[0], pb[1] - pa[1]) / (sb - sa);
    // Skip a piece whose nearest part is already farther than the best found (or than 3r from τ0's end).
    const dEnd = dist2(sMid);
    const tauPer = Math.abs(pb[0] - pa[0]) > 0 ? Math.abs(curve(sb)[0] - curve(sa)[0]) / (sb - sa) : 0;
    if (tc !== tau0 && tauPer > 0 && (Math.abs(tau0 - tc) / tauPer) * perUnit > 3 * r && dEnd > bestD) continue;
    const half = perUnit > 0 ? (3 * r) / perUnit : piece.sHi - piece.sLo;
    const wLo = Math.max(piece.sLo, sMid - half);
    const wHi = Math.min(piece.sHi, sMid + half);
    const n = 16;
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
    const nearest = goldenSectionMax((x) => -dist2(x), a, b, 32);
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

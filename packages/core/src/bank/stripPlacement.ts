// Templates in rows along a thin band of the region: cheaper than a lattice where the band is narrow.
import type { MassRegion } from "./massRegion.js";
import type { PhaseChart } from "./phaseChart.js";
import type { LatticePatch, LatticePoint } from "./patch.js";
import { metricDistanceSquared, metricFactor, type Metric2 } from "./metric.js";
import { triangleCoveringRadius } from "./triangleCover.js";
import { goldenSectionMax } from "./goldenSection.js";

export interface StripOptions {
  region: MassRegion;
  chart: PhaseChart;
  /**
   * The patches to cover: one, or a run of neighbours along τ0 (each one's tau0Hi the next one's
   * tau0Lo) with the same η-range, covered as one band.
   */
  patches: LatticePatch[];
  /** Index of the first of them (the `patch` label of the points). */
  patchIndex: number;
  /**
   * Run the band on past the τ0-sides of the patches until its end normals clear them (default true).
   * Without it the corners at those sides are not covered: for comparing counts only.
   */
  clearEnds?: boolean;
  /** Covering radius sqrt(1 − MM) in the patch's metric. */
  radius: number;
  /** Largest number of rows tried (default 16); wider bands are left to the lattice. */
  maxRows?: number;
}

/** Templates must reach every point of their triangles and edge spans within this fraction of r. */
const COVER_SAFETY = 0.99;
/** A station may lie at most this factor beyond the ideal staggered rows' step for the local width. */
const GROWTH = 1.05;
/** Bisection steps between the station and a candidate that failed its checks. */
const BISECTIONS = 10;
/** Segments of a cross-section over which its metric length is summed. */
const ACROSS = 8;
/** Grid nodes of cross-sections per piece and per width sample. */
const CROSS_NODES = 4;
/** Arc-length sub-step of the march along the band's middle (edge points are collected at each), in covering radii. */
const SUB_STEP = 1 / 12;

/**
 * Covers the part of a run of patches inside the region, {τ0 ∈ [a, b], max(η1, η_low(τ0)) ≤ η ≤ η2},
 * with staggered rows of templates running along the band (our construction; no published source).
 *
 * Geometry. Lengths are measured in the placement metric sampled over the patches (lattice.ts),
 * interpolated bilinearly between samples. A station σ is the band's middle curve at τ0 = σ, and its
 * cross-section is the normal there (in the local metric), not the line τ0 = σ: the two differ a lot
 * where the band runs obliquely to τ0. The band is cut along σ into pieces of constant row count k.
 * On each cross-section, the rows sit at metric distances edge + i·d from the lower edge (summed over
 * 8 segments in their own local metric), with edge and d from {@link rowSpacing} for the section's
 * width; k minimises the density k / spacing for the piece's widest section (widths at 65 stations).
 *
 * March. A piece starts and ends with a full column of k templates on its end normals; in between,
 * each station carries the rows of one parity (all rows when k = 1), so neighbouring rows alternate.
 * A station is accepted only if (i) every triangle it closes between neighbouring rows — the row's
 * previous template, its new one and the neighbour row's latest — has covering radius
 * (triangleCover.ts) at most 0.99 r in the local metric at the triangle's centre, and (ii) for an outer
 * row, every edge point collected since that row's previous template (one per sub-step of r/12 along
 * the band) lies within 0.99 r of that template or the new one. The zig-zag of triangles between two
 * rows covers the strip between them, and (ii) the strip between an outer row and the band's edge. The
 * step tried first is 1.05 × the ideal staggered step for the local width; if it fails, bisection
 * between the station and it finds the farthest step that passes. A piece where nothing passes gives
 * null (the lattice covers those patches).
 *
 * Ends. Neighbouring pieces share their end normal. Where the band reaches a τ0-side of the run (not a
 * tip of the region, where its width is zero), the last piece runs on until its end normal clears
 * that side (`clearEnds`), so the corners there are covered too.
 *
 * Cost. Staggered rows need about k / spacing templates per unit length of band: for a band of width
 * w = 3r, k = 2, edge = r/2 and spacing = √3 r as in the hexagonal lattice, with no boundary layer.
 * The checks make the coverage of the placement metric's discs hold at every station; how well that
 * metric predicts direct matches is measured with direct matches (test/bank/economy.test.ts,
 * test/reference/bank.test.ts).
 */
export function placeStrips(options: StripOptions): LatticePoint[] | null {
  const { region, chart, patches, patchIndex, radius: r } = options;
  const patch = patches[0];
  const clearEnds = options.clearEnds ?? true;
  const maxRows = options.maxRows ?? 16;
  const toX = (t0: number, eta: number): [number, number] => chart.toX(t0, region.tau3At(t0, eta));
  const { tau0Lo: a, etaLo: e1, etaHi: e2 } = patch;
  const b = patches[patches.length - 1].tau0Hi;
  // η_low on a grid (with the chain's kinks as nodes), interpolated linearly: over [a, b], and a
  // quarter of its length beyond either side (inside the region's range, 64 nodes each), where the
  // rows' normals and the run's ends reach.
  const aL = Math.max(region.tau0Min, a - 0.25 * (b - a));
  const bR = Math.min(region.tau0Max, b + 0.25 * (b - a));
  const nodes: number[] = [];
  const nGrid = Math.min(4096, 256 * patches.length);
  for (let k = 0; k <= nGrid; k++) nodes.push(k === nGrid ? b : a + ((b - a) * k) / nGrid);
  for (let k = 0; k < 64; k++) nodes.push(aL + ((a - aL) * k) / 64, b + ((bR - b) * (k + 1)) / 64);
  for (const t of region.chainTau0) if (t > aL && t < bR && t !== a && t !== b) nodes.push(t);
  nodes.sort((p, q) => p - q);
  const lows = nodes.map((t) => Math.max(e1, region.etaLow(t)));
  // The band must be one piece: a sub-range [aa, bb] of τ0 where the patch meets the region.
  const iA = nodes.indexOf(a);
  const iB = nodes.lastIndexOf(b);
  let first = -1;
  let last = -1;
  for (let k = iA; k <= iB; k++) {
    if (lows[k] > e2) continue;
    if (first < 0) first = k;
    else if (last < k - 1) return null;
    last = k;
  }
  if (first < 0) return [];
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
  // Where the band starts and ends inside [a, b] (between grid nodes: bisection on the exact η_low).
  const edgeBetween = (tIn: number, tOut: number): number => {
    let p = tIn;
    let q = tOut;
    for (let it = 0; it < 50; it++) {
      const m = 0.5 * (p + q);
      if (Math.max(e1, region.etaLow(m)) <= e2) p = m;
      else q = m;
    }
    return p;
  };
  const aa = first > iA ? edgeBetween(nodes[first], nodes[first - 1]) : a;
  const bb = last < iB ? edgeBetween(nodes[last], nodes[last + 1]) : b;
  if (!(bb > aa)) return [];

  const etaAtFraction = (t: number, frac: number): number => {
    const lo = low(t);
    return lo + (e2 - lo) * frac;
  };
  // The metric where the rows run: the sampled placement metrics of the patch holding τ0 (lattice.ts),
  // interpolated bilinearly in (τ0, band fraction) between the 9 × 5 samples (not conservative:
  // coverage rests on the checks' 1% margin, measured with direct matches); the patch's own
  // (conservative) metric where it was not sampled there.
  const metricAt = (t: number, frac: number): Metric2 => {
    let pi = 0;
    let pj = patches.length - 1;
    while (pi < pj) {
      const m = (pi + pj) >> 1;
      if (t > patches[m].tau0Hi) pi = m + 1;
      else pj = m;
    }
    const here = patches[pi];
    const nT = here.sampleTau0.length;
    const rows = here.samples;
    if (nT < 2) return here.metric;
    const i0 = Math.min(nT - 2, Math.max(0, Math.floor(((t - here.tau0Lo) / (here.tau0Hi - here.tau0Lo)) * (nT - 1))));
    const lower = rows[i0];
    const upper = rows[i0 + 1];
    if (!lower || !upper) return here.metric;
    const nE = lower.length;
    const j0 = Math.min(nE - 2, Math.max(0, Math.floor(frac * (nE - 1))));
    const u = Math.min(1, Math.max(0, ((t - here.tau0Lo) / (here.tau0Hi - here.tau0Lo)) * (nT - 1) - i0));
    const v = Math.min(1, Math.max(0, frac * (nE - 1) - j0));
    const c00 = lower[j0];
    const c01 = lower[j0 + 1];
    const c10 = upper[j0];
    const c11 = upper[j0 + 1];
    const w00 = (1 - u) * (1 - v);
    const w01 = (1 - u) * v;
    const w10 = u * (1 - v);
    const w11 = u * v;
    return {
      g00: w00 * c00.g00 + w01 * c01.g00 + w10 * c10.g00 + w11 * c11.g00,
      g01: w00 * c00.g01 + w01 * c01.g01 + w10 * c10.g01 + w11 * c11.g01,
      g11: w00 * c00.g11 + w01 * c01.g11 + w10 * c10.g11 + w11 * c11.g11,
    };
  };
  /** W v with M = Wᵀ W (metric.ts metricFactor): coordinates in which M is Euclidean. */
  const whiten = (m: Metric2, v0: number, v1: number): [number, number] => {
    const { w00, w01, w11 } = metricFactor(m);
    return [w00 * v0 + w01 * v1, w11 * v1];
  };
  const length = (m: Metric2, p: [number, number], q: [number, number]): number =>
    Math.sqrt(metricDistanceSquared(m, q[0] - p[0], q[1] - p[1]));
  // Direction (chart coordinates) of the curve η = fraction of the band, at τ0 = t: the chart step
  // over τ0 ∈ [t − dTau, t + dTau] (central difference).
  const dTau = 1e-4 * (bb - aa);
  const tangent = (t: number, frac: number): [number, number] => {
    const p = toX(t - dTau, etaAtFraction(t - dTau, frac));
    const q = toX(t + dTau, etaAtFraction(t + dTau, frac));
    return [q[0] - p[0], q[1] - p[1]];
  };
  const inner = (m: Metric2, p: [number, number], q: [number, number]): number =>
    m.g00 * p[0] * q[0] + m.g01 * (p[0] * q[1] + p[1] * q[0]) + m.g11 * p[1] * q[1];
  /**
   * Where the normal to the band at station σ (the middle curve's point at τ0 = σ, normal in the
   * metric there) crosses the curve at fraction f: the τ0 of the crossing, by two Newton steps on
   * ⟨R(s) − M, T⟩ = 0 with dR/ds ≈ T / (2 dTau) (the curves run nearly parallel).
   */
  let frameSigma = NaN;
  let frame = { m: patch.metric, T: [1, 0] as [number, number], M: [0, 0] as [number, number], scale: 0 };
  const onNormal = (sigma: number, f: number): number => {
    if (f === 0.5) return sigma;
    if (sigma !== frameSigma) {
      const m = metricAt(sigma, 0.5);
      const T = tangent(sigma, 0.5);
      frame = { m, T, M: toX(sigma, etaAtFraction(sigma, 0.5)), scale: (2 * dTau) / inner(m, T, T) };
      frameSigma = sigma;
    }
    const { m, T, M, scale } = frame;
    let sOut = sigma;
    for (let it = 0; it < 2; it++) {
      const R = toX(sOut, etaAtFraction(sOut, f));
      sOut -= inner(m, [R[0] - M[0], R[1] - M[1]], T) * scale;
    }
    return Math.min(region.tau0Max, Math.max(region.tau0Min, sOut));
  };
  /**
   * The band's cross-section on the normal at σ: the metric distance from its lower edge to the points
   * at the fractions j/ACROSS, summed over the segments between them (each in the local metric at its
   * middle), so that rows can be set at given distances where the metric varies across the band.
   */
  const across = (sigma: number): Float64Array => {
    const cum = new Float64Array(ACROSS + 1);
    let prev = toX(onNormal(sigma, 0), etaAtFraction(onNormal(sigma, 0), 0));
    for (let j = 1; j <= ACROSS; j++) {
      const f = j / ACROSS;
      const sj = onNormal(sigma, f);
      const x = toX(sj, etaAtFraction(sj, f));
      cum[j] = cum[j - 1] + length(metricAt(onNormal(sigma, f - 0.5 / ACROSS), f - 0.5 / ACROSS), prev, x);
      prev = x;
    }
    return cum;
  };
  const fractionAtDistance = (cum: Float64Array, d: number): number => {
    if (!(d > 0)) return 0;
    for (let j = 1; j <= ACROSS; j++) {
      if (cum[j] >= d) return (j - 1 + (d - cum[j - 1]) / Math.max(1e-300, cum[j] - cum[j - 1])) / ACROSS;
    }
    return 1;
  };

  // The band's perpendicular width at nodes along it; pieces of constant row count k between them.
  const nW = 64;
  const ts: number[] = [];
  const ws: number[] = [];
  for (let k = 0; k <= nW; k++) {
    const t = aa + ((bb - aa) * k) / nW;
    ts.push(t);
    ws.push(across(t)[ACROSS]);
  }
  const rowsFor = (w: number): number => {
    let best = 0;
    let bestDensity = Infinity;
    for (let k = 1; k <= maxRows; k++) {
      const spacing = rowSpacing(w, k, COVER_SAFETY * r).spacing;
      if (!(spacing > 0.5 * r)) continue;
      const density = k / spacing;
      if (density < bestDensity) {
        bestDensity = density;
        best = k;
      }
    }
    return best;
  };
  const pieces: { lo: number; hi: number; rows: number }[] = [];
  for (let j = 0; j < nW; j++) {
    const k = rowsFor(Math.max(ws[j], ws[j + 1]));
    if (k === 0) return null;
    const lastPiece = pieces[pieces.length - 1];
    if (lastPiece && lastPiece.rows === k) lastPiece.hi = ts[j + 1];
    else pieces.push({ lo: ts[j], hi: ts[j + 1], rows: k });
  }
  // Where the band ends at a side of the patch (not at a tip of the region), its end normals lean
  // across that side: the first and last pieces run on until their end normals clear it.
  const clear = (end: number, direction: 1 | -1): number => {
    let sigma = end;
    for (let it = 0; it < 3; it++) {
      const over = Math.max(0, ...[0, 1].map((f) => direction * (end - onNormal(sigma, f))));
      if (over === 0) break;
      sigma = Math.min(region.tau0Max, Math.max(region.tau0Min, sigma + direction * over * 1.05));
    }
    return sigma;
  };
  if (clearEnds && aa === a && a > region.tau0Min) pieces[0].lo = clear(a, -1);
  if (clearEnds && bb === b && b < region.tau0Max) pieces[pieces.length - 1].hi = clear(b, 1);

  // Cross-sections for the march, on a fine grid of stations and interpolated between (they only say
  // where the rows go; the checks decide coverage).
  const gridLo = pieces[0].lo;
  const gridHi = pieces[pieces.length - 1].hi;
  const nCross = CROSS_NODES * (pieces.length + nW);
  const crossCache = new Map<number, Float64Array>();
  const crossNode = (i: number): Float64Array => {
    let c = crossCache.get(i);
    if (!c) {
      c = across(gridLo + ((gridHi - gridLo) * i) / nCross);
      crossCache.set(i, c);
    }
    return c;
  };
  const crossAt = (t: number): Float64Array => {
    const x = Math.min(nCross, Math.max(0, ((t - gridLo) / (gridHi - gridLo)) * nCross));
    const i = Math.min(nCross - 1, Math.floor(x));
    const f = x - i;
    const p = crossNode(i);
    const q = crossNode(i + 1);
    const c = new Float64Array(ACROSS + 1);
    for (let j = 0; j <= ACROSS; j++) c[j] = (1 - f) * p[j] + f * q[j];
    return c;
  };
  const out: LatticePoint[] = [];
  for (const piece of pieces) if (!marchPiece(piece.lo, piece.hi, piece.rows)) return null;
  return out;

  /** A placed (or tentative) template: its station σ, band fraction, chirp time τ0 = s, η and chart position. */
  interface Station {
    t: number;
    s: number;
    frac: number;
    eta: number;
    x: [number, number];
  }
  interface EdgePoint {
    t: number;
    x: [number, number];
    m: Metric2;
  }
  function stationAt(sigma: number, frac: number): Station {
    const sOut = onNormal(sigma, frac);
    const eta = etaAtFraction(sOut, frac);
    return { t: sigma, s: sOut, frac, eta, x: toX(sOut, eta) };
  }
  function edgeAt(sigma: number, frac: number): EdgePoint {
    const sOut = onNormal(sigma, frac);
    return { t: sigma, x: toX(sOut, etaAtFraction(sOut, frac)), m: metricAt(sOut, frac) };
  }
  function place(p: Station): void {
    out.push({ tau0: p.s, tau3: region.tau3At(p.s, p.eta), patch: patchIndex, projected: false });
  }

  /**
   * Staggered rows between the normals at stations lo and hi: a full column of k templates on the
   * normal at hi, then stations down the band, each holding the rows of one parity (all rows when
   * k = 1) on its normal, and a full column at lo. Each station goes as far as its checks allow
   * (at most GROWTH times the previous step): every triangle it closes between neighbouring rows has
   * covering radius ≤ 0.99 r, and every edge point since the outer row's previous template lies
   * within 0.99 r of that template or the new one.
   */
  function marchPiece(lo: number, hi: number, k: number): boolean {
    const fractionsAt = (t: number): number[] => {
      const cum = crossAt(t);
      const w = cum[ACROSS];
      const { edge } = rowSpacing(w, k, r);
      const d = k > 1 ? (w - 2 * edge) / (k - 1) : 0;
      return Array.from({ length: k }, (_, i) => fractionAtDistance(cum, edge + i * d));
    };
    const last: Station[] = fractionsAt(hi).map((f) => stationAt(hi, f));
    for (const p of last) place(p);
    // Edge points of the band (fractions 0 and 1), by station, since the oldest template of the outer rows.
    const lowTrail: EdgePoint[] = [edgeAt(hi, 0)];
    const highTrail: EdgePoint[] = [edgeAt(hi, 1)];
    const limit = COVER_SAFETY * r;

    const triangleOk = (p: Station, q: Station, o: Station): boolean => {
      const m = metricAt((p.s + q.s + o.s) / 3, (p.frac + q.frac + o.frac) / 3);
      return triangleCoveringRadius(whiten(m, p.x[0], p.x[1]), whiten(m, q.x[0], q.x[1]), whiten(m, o.x[0], o.x[1])) <= limit;
    };
    const edgeOk = (trail: EdgePoint[], extra: EdgePoint, prev: Station, next: Station): boolean => {
      const check = (e: EdgePoint): boolean => Math.min(length(e.m, e.x, prev.x), length(e.m, e.x, next.x)) <= limit;
      if (!check(extra)) return false;
      for (let n = trail.length - 1; n >= 0; n--) {
        const e = trail[n];
        if (e.t > prev.t) break;
        if (e.t >= next.t && !check(e)) return false;
      }
      return true;
    };
    /** The new templates at station σ for the given rows, in order, or null where a check fails. */
    const tryStation = (sigma: number, rowList: number[]): Map<number, Station> | null => {
      const fr = fractionsAt(sigma);
      const placed = new Map<number, Station>();
      const lowEdge = rowList.includes(0) ? edgeAt(sigma, 0) : null;
      const highEdge = rowList.includes(k - 1) ? edgeAt(sigma, 1) : null;
      for (const i of rowList) {
        const p = stationAt(sigma, fr[i]);
        const prev = last[i];
        for (const n of [i - 1, i + 1]) {
          if (n < 0 || n >= k) continue;
          if (!triangleOk(prev, p, placed.get(n) ?? last[n])) return null;
        }
        if (i === 0 && !edgeOk(lowTrail, lowEdge!, prev, p)) return null;
        if (i === k - 1 && !edgeOk(highTrail, highEdge!, prev, p)) return null;
        placed.set(i, p);
      }
      return placed;
    };
    const commit = (placed: Map<number, Station>, sigma: number): void => {
      for (const [i, p] of placed) {
        last[i] = p;
        place(p);
      }
      // Forget edge points beyond the new station (passed by a rejected sub-step), and those older
      // than every outer row's template.
      for (const trail of [lowTrail, highTrail]) {
        while (trail.length > 0 && trail[trail.length - 1].t < sigma) trail.pop();
      }
      lowTrail.push(edgeAt(sigma, 0));
      highTrail.push(edgeAt(sigma, 1));
      const oldest = Math.max(last[0].t, last[k - 1].t);
      for (const trail of [lowTrail, highTrail]) {
        let drop = 0;
        while (drop < trail.length - 1 && trail[drop + 1].t >= oldest) drop++;
        if (drop > 0) trail.splice(0, drop);
      }
    };
    const parityRows = (station: number): number[] =>
      k === 1 ? [0] : Array.from({ length: k }, (_, i) => i).filter((i) => i % 2 === station % 2);
    // A full column: the rows whose template is older first, so each triangle closes in order.
    const fullColumnRows = (): number[] => Array.from({ length: k }, (_, i) => i).sort((p, q) => last[q].t - last[p].t || p - q);
    const midAt = (t: number): [number, number] => toX(t, etaAtFraction(t, 0.5));

    let station = 0;
    let t = hi;
    let dt = Math.max((hi - lo) / 4096, 1e-9 * hi);
    while (t > lo) {
      const rowList = parityRows(station + 1);
      // The step of ideal staggered rows for the local width (half a row's spacing when k ≥ 2), and
      // a little more: the checks, not the model, decide.
      const cap = GROWTH * (k === 1 ? 1 : 0.5) * rowSpacing(crossAt(t)[ACROSS], k, r).spacing;
      // March the middle of the band in sub-steps (arc ≤ SUB_STEP·r) to the cap, collecting edge points.
      let arc = 0;
      let tCur = t;
      let pCur = midAt(t);
      for (;;) {
        let tn = Math.max(lo, tCur - dt);
        let pn = midAt(tn);
        let step = length(metricAt(tn, 0.5), pCur, pn);
        for (let g = 0; step > SUB_STEP * r && g < 60; g++) {
          dt *= 0.5;
          tn = Math.max(lo, tCur - dt);
          pn = midAt(tn);
          step = length(metricAt(tn, 0.5), pCur, pn);
        }
        if (step < 0.5 * SUB_STEP * r) dt *= 1.5;
        if (arc + step > cap) {
          tCur -= (tCur - tn) * Math.max(0, (cap - arc) / step); // the cap, linear in τ0 within the sub-step
          break;
        }
        arc += step;
        tCur = tn;
        pCur = pn;
        lowTrail.push(edgeAt(tn, 0));
        highTrail.push(edgeAt(tn, 1));
        if (tn <= lo) break;
      }
      const tEnd = tCur;
      if (tEnd <= lo) {
        // The piece's end: a full column at lo, if it closes from here.
        const end = tryStation(lo, fullColumnRows());
        if (end) {
          commit(end, lo);
          return true;
        }
      } else {
        const placed = tryStation(tEnd, rowList);
        if (placed) {
          commit(placed, tEnd);
          t = tEnd;
          station++;
          continue;
        }
      }
      // Bisect between the station and the farthest candidate for the farthest that passes.
      let p = t;
      let q = tEnd;
      let best: Map<number, Station> | null = null;
      for (let it = 0; it < BISECTIONS; it++) {
        const mid = 0.5 * (p + q);
        const placed = tryStation(mid, rowList);
        if (placed) {
          p = mid;
          best = placed;
        } else q = mid;
      }
      // Nothing passes (the band changes too fast for rows): the lattice covers these patches.
      if (!best) return false;
      commit(best, p);
      t = p;
      station++;
    }
    return true;
  }
}
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
  const best = goldenSectionMax(spacingAt, 0, Math.min(w / 2, r), 40);
  return { edge: best.x, spacing: best.value };
}

// Lay rows along a band: march staggered rows down one piece of constant row count, each station checked triangle by triangle.
import { ACROSS, fractionAtDistance, metricLength as length, type BandGeometry } from "./bandGeometry.js";
import { metricFactor, type Metric2 } from "./metric.js";
import type { MassRegion } from "./massRegion.js";
import type { LatticePoint } from "./patch.js";
import { rowSpacing } from "./rowSpacing.js";
import { triangleCoveringRadius } from "./triangleCover.js";

/**
 * Templates must reach every point of their triangles and edge spans within this fraction of r: the
 * margin for the bilinear metric between samples (bandMetric.ts). Ours: measured here with direct
 * matches (test/bank/economy.test.ts: every one of 400 draws over 1–3 M_sun from 30 Hz reaches MM).
 */
export const COVER_SAFETY = 0.99;
/** A station may lie at most this factor beyond the ideal staggered rows' step for the local width (ours, no source). */
export const GROWTH = 1.05;
/** Bisection steps between the station and a candidate that failed its checks (2^−10 of the step; ours, no source). */
export const BISECTIONS = 10;
/** Arc-length sub-step of the march along the band's middle (edge points are collected at each), in covering radii (ours, no source). */
export const SUB_STEP = 1 / 12;
/** The first τ0 step of the march: this fraction of the piece, but at least MARCH_MIN_STEP × its upper end. */
export const MARCH_FIRST_DIVISIONS = 4096;
export const MARCH_MIN_STEP = 1e-9;
/** Halvings of a sub-step still longer than SUB_STEP before it is taken anyway, and the growth after a short one (ours, no source). */
export const MARCH_MAX_HALVINGS = 60;
export const MARCH_GROWTH = 1.5;

/** A placed (or tentative) template: its station σ, band fraction, chirp time τ0 = s, η and chart position. */
interface Station {
  t: number;
  s: number;
  frac: number;
  eta: number;
  x: [number, number];
}
/** A point of the band's edge at station t, with the metric there. */
interface EdgePoint {
  t: number;
  x: [number, number];
  m: Metric2;
}

export interface MarchOptions {
  region: MassRegion;
  geometry: BandGeometry;
  /** Cross-section at a station (crossSectionGrid of bandGeometry.ts). */
  crossAt: (t: number) => Float64Array;
  /** The piece's stations: from hi down to lo. */
  lo: number;
  hi: number;
  /** Row count k of the piece. */
  rows: number;
  /** Covering radius sqrt(1 − MM). */
  radius: number;
  /** The `patch` label of the points. */
  patchIndex: number;
}

/** W v with M = Wᵀ W (metric.ts metricFactor): coordinates in which M is Euclidean. */
function whiten(m: Metric2, v0: number, v1: number): [number, number] {
  const { w00, w01, w11 } = metricFactor(m);
  return [w00 * v0 + w01 * v1, w11 * v1];
}

/**
 * Staggered rows between the normals at stations lo and hi: a full column of k templates on the
 * normal at hi, then stations down the band, each holding the rows of one parity (all rows when
 * k = 1) on its normal, and a full column at lo. Each station goes as far as its checks allow
 * (at most GROWTH times the ideal step): every triangle it closes between neighbouring rows has
 * covering radius ≤ COVER_SAFETY r, and every edge point since the outer row's previous template lies
 * within COVER_SAFETY r of that template or the new one. Null where no step passes (the band changes too
 * fast for rows): the lattice covers those patches.
 */
export function marchPiece(options: MarchOptions): LatticePoint[] | null {
  const { region, geometry, crossAt, lo, hi, rows: k, radius: r, patchIndex } = options;
  const { toX, etaAtFraction, metricAt, onNormal } = geometry;
  const out: LatticePoint[] = [];
  const stationAt = (sigma: number, frac: number): Station => {
    const sOut = onNormal(sigma, frac);
    const eta = etaAtFraction(sOut, frac);
    return { t: sigma, s: sOut, frac, eta, x: toX(sOut, eta) };
  };
  const edgeAt = (sigma: number, frac: number): EdgePoint => {
    const sOut = onNormal(sigma, frac);
    return { t: sigma, x: toX(sOut, etaAtFraction(sOut, frac)), m: metricAt(sOut, frac) };
  };
  const place = (p: Station): void => {
    out.push({ tau0: p.s, tau3: region.tau3At(p.s, p.eta), patch: patchIndex, projected: false });
  };
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
  let dt = Math.max((hi - lo) / MARCH_FIRST_DIVISIONS, MARCH_MIN_STEP * hi);
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
      for (let g = 0; step > SUB_STEP * r && g < MARCH_MAX_HALVINGS; g++) {
        dt *= 0.5;
        tn = Math.max(lo, tCur - dt);
        pn = midAt(tn);
        step = length(metricAt(tn, 0.5), pCur, pn);
      }
      if (step < 0.5 * SUB_STEP * r) dt *= MARCH_GROWTH;
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
        return out;
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
    if (!best) return null;
    commit(best, p);
    t = p;
    station++;
  }
  return out;
}

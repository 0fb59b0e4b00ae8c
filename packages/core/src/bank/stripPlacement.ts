// Templates in rows along a thin band of the region: cheaper than a lattice where the band is narrow.
import type { MassRegion } from "./massRegion.js";
import type { PhaseChart } from "./phaseChart.js";
import { metricRatioRange, type LatticePatch, type LatticePoint } from "./lattice.js";
import { metricFactor, type Metric2 } from "./metric.js";

export interface StripOptions {
  region: MassRegion;
  chart: PhaseChart;
  patch: LatticePatch;
  patchIndex: number;
  /** Covering radius sqrt(1 − MM) in the patch's metric. */
  radius: number;
  /** Largest number of rows tried (default 8); wider bands are left to the lattice. */
  maxRows?: number;
}

/** Spacing kept below the straight-strip limit, against the band's curvature between sub-steps. */
const SPACING_SAFETY = 0.98;
/** Arc-length sub-step of the march along a row, in covering radii. */
const SUB_STEP = 1 / 12;

/**
 * Covers the part of a patch inside the region, {τ0 ∈ [a, b], max(η1, η_low(τ0)) ≤ η ≤ η2}, with rows
 * of templates running along the band. The band is cut along τ0 into pieces of constant row count k;
 * in a piece, row i lies at the fraction (2i + 1)/(2k) of the band's η-extent and is responsible for the
 * sub-band between the fractions i/k and (i + 1)/k. Lengths are measured in the local placement
 * metric: the patch's sampled metrics, made conservative over each sample cell (not the patch's single
 * conservative metric, which the lattice needs and which can be 1.4× the local one). In a locally
 * Euclidean metric, a row of discs of radius r whose centres lie on the mid-line of a straight strip of
 * half-width h covers the strip when neighbouring centres are at most 2 sqrt(r² − h²) apart (common
 * practice, no source). The march along each row measures h as the perpendicular distance from the row
 * to its sub-band's edges, keeps the largest h since the last template, and places the next template
 * before the arc length reaches 0.98 × 2 sqrt(r² − h²); the first and last templates of a row sit at
 * its piece's ends. k (1 to maxRows) minimises the density k / sqrt(r² − (w/2k)²) for the piece's
 * largest perpendicular width w (sampled at 65 points along the patch); if some piece is too wide for
 * maxRows rows (h > 0.95 r), null: the lattice covers that patch.
 *
 * Our construction. A band of width w ≲ 2r costs about one template per 2 sqrt(r² − w²/4) of its
 * length, where a hexagonal lattice with its boundary layer costs about (0.385 w/r + 0.74)/r; the caller
 * keeps whichever of the two needs fewer templates. Every template lies inside the region (on a row
 * between the band's edges). Coverage between the sampled widths and across the band's curvature is
 * not proven; it is checked with direct matches (test/reference/bank.test.ts, test/bank/lattice.test.ts).
 */
export function placeStrips(options: StripOptions): LatticePoint[] | null {
  const { region, chart, patch, patchIndex, radius: r } = options;
  const maxRows = options.maxRows ?? 8;
  const toX = (t0: number, eta: number): [number, number] => chart.toX(t0, region.tau3At(t0, eta));
  const { tau0Lo: a, tau0Hi: b, etaLo: e1, etaHi: e2 } = patch;
  // η_low on a grid over [a, b] (with the chain's kinks as nodes), interpolated linearly.
  const nodes: number[] = [];
  const nGrid = 256;
  for (let k = 0; k <= nGrid; k++) nodes.push(a + ((b - a) * k) / nGrid);
  for (const t of region.chainTau0) if (t > a && t < b) nodes.push(t);
  nodes.sort((p, q) => p - q);
  const lows = nodes.map((t) => Math.max(e1, region.etaLow(t)));
  const inBand = lows.map((lo) => lo <= e2);
  // The band must be one piece: a sub-range [aa, bb] of τ0 where the patch meets the region.
  const first = inBand.indexOf(true);
  const last = inBand.lastIndexOf(true);
  if (first < 0) return [];
  for (let k = first; k <= last; k++) if (!inBand[k]) return null;
  const low = (t: number): number => {
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
  const aa = first > 0 ? edgeBetween(nodes[first], nodes[first - 1]) : a;
  const bb = last < nodes.length - 1 ? edgeBetween(nodes[last], nodes[last + 1]) : b;
  if (!(bb > aa)) return [];

  const etaAtFraction = (t: number, frac: number): number => {
    const lo = low(t);
    return lo + (e2 - lo) * frac;
  };
  // The metric where the rows run: the patch's sampled placement metrics (lattice.ts), made
  // conservative over the sample cell around the point (the cell corner's metric scaled by the largest
  // generalised eigenvalue of the other corners against it); the patch's own metric where the
  // patch was not sampled there.
  const nT = patch.sampleTau0.length;
  const metricAt = (t: number, frac: number): Metric2 => {
    const rows = patch.samples;
    if (nT < 2) return patch.metric;
    const i0 = Math.min(nT - 2, Math.max(0, Math.floor(((t - a) / (b - a)) * (nT - 1))));
    const lower = rows[i0];
    const upper = rows[i0 + 1];
    if (!lower || !upper) return patch.metric;
    const nE = lower.length;
    const j0 = Math.min(nE - 2, Math.max(0, Math.floor(frac * (nE - 1))));
    const base = lower[j0];
    let scale = 1;
    for (const c of [lower[j0 + 1], upper[j0], upper[j0 + 1]]) scale = Math.max(scale, metricRatioRange(c, base)[1]);
    return { g00: base.g00 * scale, g01: base.g01 * scale, g11: base.g11 * scale };
  };
  /** W v with M = Wᵀ W (metric.ts metricFactor): coordinates in which M is Euclidean. */
  const whiten = (m: Metric2, v0: number, v1: number): [number, number] => {
    const { w00, w01, w11 } = metricFactor(m);
    return [w00 * v0 + w01 * v1, w11 * v1];
  };
  const length = (m: Metric2, p: [number, number], q: [number, number]): number => {
    const [u0, u1] = whiten(m, q[0] - p[0], q[1] - p[1]);
    return Math.hypot(u0, u1);
  };
  // Direction (chart coordinates) of the curve η = fraction of the band, at τ0 = t (central difference).
  const tangent = (t: number, frac: number): [number, number] => {
    const dt = 1e-4 * (bb - aa);
    const p = toX(Math.max(aa, t - dt), etaAtFraction(Math.max(aa, t - dt), frac));
    const q = toX(Math.min(bb, t + dt), etaAtFraction(Math.min(bb, t + dt), frac));
    return [q[0] - p[0], q[1] - p[1]];
  };
  // Distance of q from the line through p along the direction t, in the metric m.
  const crossDistance = (p: [number, number], q: [number, number], t: [number, number], m: Metric2): number => {
    const [d0, d1] = whiten(m, q[0] - p[0], q[1] - p[1]);
    const [t0, t1] = whiten(m, t[0], t[1]);
    return Math.abs(d0 * t1 - d1 * t0) / Math.hypot(t0, t1);
  };

  // The band's perpendicular width at nodes along it; pieces of constant row count k between them.
  const nW = 64;
  const widthAt = (t: number): number => crossDistance(toX(t, etaAtFraction(t, 0)), toX(t, e2), tangent(t, 0.5), metricAt(t, 0.5));
  const ts: number[] = [];
  const ws: number[] = [];
  for (let k = 0; k <= nW; k++) {
    const t = aa + ((bb - aa) * k) / nW;
    ts.push(t);
    ws.push(widthAt(t));
  }
  const rowsFor = (w: number): number => {
    let best = 0;
    let bestDensity = Infinity;
    for (let k = 1; k <= maxRows; k++) {
      const h = w / (2 * k);
      if (h > 0.95 * r) continue;
      const density = k / Math.sqrt(r * r - h * h);
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
  const out: LatticePoint[] = [];
  const place = (t: number, eta: number): void => {
    out.push({ tau0: t, tau3: region.tau3At(t, eta), patch: patchIndex, projected: false });
  };
  for (const piece of pieces) marchPiece(piece.lo, piece.hi, piece.rows);

  function marchPiece(lo: number, hi: number, rows: number): void {
    for (let i = 0; i < rows; i++) {
      const fMid = (2 * i + 1) / (2 * rows);
      const fLo = i / rows;
      const fHi = (i + 1) / rows;
      const halfWidth = (t: number, p: [number, number]): number => {
        const tg = tangent(t, fMid);
        const m = metricAt(t, fMid);
        return Math.max(crossDistance(p, toX(t, etaAtFraction(t, fLo)), tg, m), crossDistance(p, toX(t, etaAtFraction(t, fHi)), tg, m));
      };
      // March from hi down to lo in sub-steps of about SUB_STEP · r of arc length.
      let t = hi;
      let p = toX(t, etaAtFraction(t, fMid));
      place(t, etaAtFraction(t, fMid));
      let hMax = halfWidth(t, p);
      let arc = 0;
      let prev: { t: number; arc: number; h: number } = { t, arc: 0, h: hMax };
      let dt = (hi - lo) / 16;
      while (t > lo) {
        // Next sub-step: shrink dt until the arc step is at most SUB_STEP · r.
        let tn = Math.max(lo, t - dt);
        let pn = toX(tn, etaAtFraction(tn, fMid));
        let step = length(metricAt(tn, fMid), p, pn);
        for (let guard = 0; step > SUB_STEP * r && guard < 60; guard++) {
          dt *= 0.5;
          tn = Math.max(lo, t - dt);
          pn = toX(tn, etaAtFraction(tn, fMid));
          step = length(metricAt(tn, fMid), p, pn);
        }
        if (step < 0.5 * SUB_STEP * r) dt *= 1.5;
        const hn = halfWidth(tn, pn);
        const arcN = arc + step;
        const hSpan = Math.max(hMax, hn);
        const limit = SPACING_SAFETY * 2 * Math.sqrt(Math.max(0, r * r - hSpan * hSpan));
        if (arcN > limit && prev.arc > 0) {
          // Place at the previous sub-step; the span restarts there.
          place(prev.t, etaAtFraction(prev.t, fMid));
          arc = arcN - prev.arc;
          hMax = Math.max(prev.h, hn);
        } else {
          arc = arcN;
          hMax = hSpan;
        }
        prev = { t: tn, arc, h: hn };
        t = tn;
        p = pn;
      }
      if (arc > 0) place(lo, etaAtFraction(lo, fMid));
    }
  }
  return out;
}

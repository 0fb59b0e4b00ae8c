// Templates in rows along a thin band of the region: cheaper than a lattice where the band is narrow.
import type { MassRegion } from "./massRegion.js";
import type { PhaseChart } from "./phaseChart.js";
import type { LatticePatch, LatticePoint } from "./lattice.js";

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
 * sub-band between the fractions i/k and (i + 1)/k. In the patch's metric (whitened, so covering balls
 * are discs of radius r), a row of discs whose centres lie on the mid-line of a straight strip of
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
  const G = patch.metric;
  const w00 = Math.sqrt(G.g00);
  const w01 = G.g01 / w00;
  const w11 = Math.sqrt(Math.max(G.g11 - w01 * w01, 1e-300));
  const toU = (t0: number, eta: number): [number, number] => {
    const [x0, x1] = chart.toX(t0, region.tau3At(t0, eta));
    return [w00 * x0 + w01 * x1, w11 * x1];
  };
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
  // Unit tangent of the curve η = fraction of the band, at τ0 = t (central difference in τ0).
  const tangent = (t: number, frac: number): [number, number] => {
    const dt = 1e-4 * (bb - aa);
    const p = toU(Math.max(aa, t - dt), etaAtFraction(Math.max(aa, t - dt), frac));
    const q = toU(Math.min(bb, t + dt), etaAtFraction(Math.min(bb, t + dt), frac));
    const d0 = q[0] - p[0];
    const d1 = q[1] - p[1];
    const n = Math.hypot(d0, d1);
    return [d0 / n, d1 / n];
  };
  const crossDistance = (p: [number, number], q: [number, number], t: [number, number]): number =>
    Math.abs((q[0] - p[0]) * t[1] - (q[1] - p[1]) * t[0]);

  // The band's perpendicular width at nodes along it; pieces of constant row count k between them.
  const nW = 64;
  const widthAt = (t: number): number => crossDistance(toU(t, etaAtFraction(t, 0)), toU(t, e2), tangent(t, 0.5));
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
        return Math.max(crossDistance(p, toU(t, etaAtFraction(t, fLo)), tg), crossDistance(p, toU(t, etaAtFraction(t, fHi)), tg));
      };
      // March from hi down to lo in sub-steps of about SUB_STEP · r of arc length.
      let t = hi;
      let p = toU(t, etaAtFraction(t, fMid));
      place(t, etaAtFraction(t, fMid));
      let hMax = halfWidth(t, p);
      let arc = 0;
      let prev: { t: number; arc: number; h: number } = { t, arc: 0, h: hMax };
      let dt = (hi - lo) / 16;
      while (t > lo) {
        // Next sub-step: shrink dt until the arc step is at most SUB_STEP · r.
        let tn = Math.max(lo, t - dt);
        let pn = toU(tn, etaAtFraction(tn, fMid));
        let step = Math.hypot(pn[0] - p[0], pn[1] - p[1]);
        for (let guard = 0; step > SUB_STEP * r && guard < 60; guard++) {
          dt *= 0.5;
          tn = Math.max(lo, t - dt);
          pn = toU(tn, etaAtFraction(tn, fMid));
          step = Math.hypot(pn[0] - p[0], pn[1] - p[1]);
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

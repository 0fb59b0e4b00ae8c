// Cross-sections of a band: normals to its middle curve in the local metric, and metric distances across it.
import { bandMetricAt } from "./bandMetric.js";
import type { BandProfile } from "./bandProfile.js";
import type { MassRegion } from "./massRegion.js";
import { metricDistanceSquared, type Metric2 } from "./metric.js";
import type { LatticePatch } from "./patch.js";
import type { PhaseChart } from "./phaseChart.js";

/** Segments of a cross-section over which its metric length is summed (ours, no source). */
export const ACROSS = 8;
/** Half-step of the central difference along the band, as a fraction of its τ0 extent (ours, no source). */
export const TANGENT_STEP = 1e-4;
/** Newton steps that put a point of a curve on a normal (the curves run nearly parallel; ours, no source). */
export const NORMAL_NEWTON_STEPS = 2;

/** A band's geometry in the chart, for a run of patches and its profile. */
export interface BandGeometry {
  /** Chart position of (τ0, η). */
  toX(tau0: number, eta: number): [number, number];
  /** η at band fraction `frac` of [low(τ0), etaHi]. */
  etaAtFraction(tau0: number, frac: number): number;
  /** The placement metric there (bandMetric.ts). */
  metricAt(tau0: number, frac: number): Metric2;
  /** τ0 where the normal at station σ (in the metric at the middle curve there) crosses the curve at fraction f. */
  onNormal(sigma: number, f: number): number;
  /** Cumulative metric distance from the lower edge to the points at fractions j/ACROSS of the normal at σ. */
  across(sigma: number): Float64Array;
}

/** Metric length of the chart step p → q. */
export function metricLength(m: Metric2, p: [number, number], q: [number, number]): number {
  return Math.sqrt(metricDistanceSquared(m, q[0] - p[0], q[1] - p[1]));
}

/**
 * The band's geometry. A station σ is the middle curve (fraction ½) at τ0 = σ; its normal is taken in
 * the metric there, and where it crosses the curve at fraction f is found by NORMAL_NEWTON_STEPS
 * Newton steps on ⟨R(s) − M, T⟩ = 0 with dR/ds ≈ T / (2 dτ) (the curves run nearly parallel); the
 * frame of the last station is remembered (stations are asked for many fractions in turn). A
 * cross-section's length is summed over ACROSS segments, each in the local metric at its middle, so
 * rows can be set at given distances where the metric varies across the band.
 */
export function createBandGeometry(region: MassRegion, chart: PhaseChart, patches: readonly LatticePatch[], profile: BandProfile): BandGeometry {
  const { aa, bb, etaHi: e2 } = profile;
  const toX = (t0: number, eta: number): [number, number] => chart.toX(t0, region.tau3At(t0, eta));
  const etaAtFraction = (t: number, frac: number): number => {
    const lo = profile.low(t);
    return lo + (e2 - lo) * frac;
  };
  const metricAt = (t: number, frac: number): Metric2 => bandMetricAt(patches, t, frac);
  // Direction (chart coordinates) of the curve at fraction `frac`, at τ0 = t: central difference.
  const dTau = TANGENT_STEP * (bb - aa);
  const tangent = (t: number, frac: number): [number, number] => {
    const p = toX(t - dTau, etaAtFraction(t - dTau, frac));
    const q = toX(t + dTau, etaAtFraction(t + dTau, frac));
    return [q[0] - p[0], q[1] - p[1]];
  };
  const inner = (m: Metric2, p: [number, number], q: [number, number]): number =>
    m.g00 * p[0] * q[0] + m.g01 * (p[0] * q[1] + p[1] * q[0]) + m.g11 * p[1] * q[1];
  let frameSigma = NaN;
  let frame = { m: patches[0].metric, T: [1, 0] as [number, number], M: [0, 0] as [number, number], scale: 0 };
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
    for (let it = 0; it < NORMAL_NEWTON_STEPS; it++) {
      const R = toX(sOut, etaAtFraction(sOut, f));
      sOut -= inner(m, [R[0] - M[0], R[1] - M[1]], T) * scale;
    }
    return Math.min(region.tau0Max, Math.max(region.tau0Min, sOut));
  };
  const across = (sigma: number): Float64Array => {
    const cum = new Float64Array(ACROSS + 1);
    let prev = toX(onNormal(sigma, 0), etaAtFraction(onNormal(sigma, 0), 0));
    for (let j = 1; j <= ACROSS; j++) {
      const f = j / ACROSS;
      const sj = onNormal(sigma, f);
      const x = toX(sj, etaAtFraction(sj, f));
      cum[j] = cum[j - 1] + metricLength(metricAt(onNormal(sigma, f - 0.5 / ACROSS), f - 0.5 / ACROSS), prev, x);
      prev = x;
    }
    return cum;
  };
  return { toX, etaAtFraction, metricAt, onNormal, across };
}

/** The band fraction at metric distance d from the lower edge, linear within the segment of `cum` (BandGeometry.across) holding it. */
export function fractionAtDistance(cum: Float64Array, d: number): number {
  if (!(d > 0)) return 0;
  for (let j = 1; j <= ACROSS; j++) {
    if (cum[j] >= d) return (j - 1 + (d - cum[j - 1]) / Math.max(1e-300, cum[j] - cum[j - 1])) / ACROSS;
  }
  return 1;
}

/**
 * Cross-sections on `nodes` + 1 evenly spaced stations of [lo, hi], each computed when first asked
 * for, and linear between them (they only say where the rows go; the march's checks decide coverage).
 */
export function crossSectionGrid(geometry: BandGeometry, lo: number, hi: number, nodes: number): (t: number) => Float64Array {
  const cache = new Map<number, Float64Array>();
  const node = (i: number): Float64Array => {
    let c = cache.get(i);
    if (!c) {
      c = geometry.across(lo + ((hi - lo) * i) / nodes);
      cache.set(i, c);
    }
    return c;
  };
  return (t) => {
    const x = Math.min(nodes, Math.max(0, ((t - lo) / (hi - lo)) * nodes));
    const i = Math.min(nodes - 1, Math.floor(x));
    const f = x - i;
    const p = node(i);
    const q = node(i + 1);
    const c = new Float64Array(ACROSS + 1);
    for (let j = 0; j <= ACROSS; j++) c[j] = (1 - f) * p[j] + f * q[j];
    return c;
  };
}

// Proper area of a mass region under a metric, and the template count it implies for a lattice.
import type { MassRegion } from "./massRegion.js";
import type { Metric2 } from "./metric.js";
import { metricDensity } from "./metric.js";
import { chirpTimesFromMassEta } from "./chirpTimeCoordinates.js";

/** Gauss–Legendre nodes and weights on [−1, 1] (Newton iteration on P_n; common practice, no source). */
export function gaussLegendre(n: number): { x: Float64Array; w: Float64Array } {
  const x = new Float64Array(n);
  const w = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let z = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let dp = 1;
    for (let it = 0; it < 100; it++) {
      let p0 = 1;
      let p1 = z;
      for (let k = 2; k <= n; k++) {
        const p2 = ((2 * k - 1) * z * p1 - (k - 1) * p0) / k;
        p0 = p1;
        p1 = p2;
      }
      dp = (n * (z * p1 - p0)) / (z * z - 1);
      const dz = p1 / dp;
      z -= dz;
      if (Math.abs(dz) < 1e-15) break;
    }
    x[i] = z;
    w[i] = 2 / ((1 - z * z) * dp * dp);
  }
  return { x, w };
}

/**
 * ∫ sqrt(det g) dτ0 dτ3 over the region: its proper area under the metric `metricAt` (dimensionless,
 * since g is in s⁻²). Integrated in (τ0, η), where the region is {τ0 ∈ [τ0Min, τ0Max],
 * η_low(τ0) ≤ η ≤ 1/4}, with dτ3 = (3/5)(τ3/η) dη at fixed τ0 (τ3 ∝ τ0^{2/5} η^{−3/5}, from the
 * chirp-time definitions, Sathyaprakash 1994); Gauss–Legendre in both, τ0 split at the kinks of the
 * region's upper chain.
 */
export function regionProperArea(region: MassRegion, metricAt: (tau0: number, tau3: number) => Metric2, order = 16): number {
  const { x, w } = gaussLegendre(order);
  const knots = [...region.chainTau0].sort((p, q) => p - q);
  let total = 0;
  for (let s = 0; s + 1 < knots.length; s++) {
    const a = knots[s];
    const b = knots[s + 1];
    if (!(b > a)) continue;
    for (let i = 0; i < order; i++) {
      const t0 = 0.5 * (a + b) + 0.5 * (b - a) * x[i];
      const eLo = region.etaLow(t0);
      if (!(eLo < 0.25)) continue;
      let inner = 0;
      for (let j = 0; j < order; j++) {
        const eta = 0.5 * (eLo + 0.25) + 0.5 * (0.25 - eLo) * x[j];
        const t3 = region.tau3At(t0, eta);
        inner += w[j] * metricDensity(metricAt(t0, t3)) * ((3 / 5) * t3) / eta;
      }
      total += w[i] * 0.5 * (b - a) * inner * 0.5 * (0.25 - eLo);
    }
  }
  return total;
}

/** Proper area of one hexagonal cell of covering radius sqrt(1 − MM): (3√3/2)(1 − MM). */
export function hexagonCellArea(minimalMatch: number): number {
  return ((3 * Math.sqrt(3)) / 2) * (1 - minimalMatch);
}

/**
 * Proper length ∮ sqrt(g(dθ, dθ)) of the region's boundary (equal-mass curve and upper chain) under
 * the metric `metricAt`, by the midpoint rule on `segmentsPerPiece` pieces of each curve.
 */
export function regionProperPerimeter(region: MassRegion, metricAt: (tau0: number, tau3: number) => Metric2, segmentsPerPiece = 300): number {
  const curves: ((s: number) => [number, number])[] = [
    (s) => {
      const t0 = region.tau0Min + s * (region.tau0Max - region.tau0Min);
      return [t0, region.tau3At(t0, 0.25)];
    },
  ];
  for (const e of region.upperChain) {
    curves.push((s) => {
      const m1 = e.from[0] + s * (e.to[0] - e.from[0]);
      const m2 = e.from[1] + s * (e.to[1] - e.from[1]);
      const m = m1 + m2;
      const eta = (m1 * m2) / (m * m);
      const t0 = chirpTimesFromMassEta(m, eta, region.fMinHz).tau0;
      return [t0, region.tau3At(t0, eta)];
    });
  }
  let total = 0;
  for (const c of curves) {
    let prev = c(0);
    for (let k = 1; k <= segmentsPerPiece; k++) {
      const next = c(k / segmentsPerPiece);
      const g = metricAt(0.5 * (prev[0] + next[0]), 0.5 * (prev[1] + next[1]));
      const d0 = next[0] - prev[0];
      const d3 = next[1] - prev[1];
      total += Math.sqrt(Math.max(0, g.g00 * d0 * d0 + 2 * g.g01 * d0 * d3 + g.g11 * d3 * d3));
      prev = next;
    }
  }
  return total;
}

/**
 * Templates a lattice keeps beyond a boundary of proper length P: the cells whose centres lie outside
 * but which reach inside. For a straight boundary and hexagons of circumradius r the centres within
 * the hexagon's support distance h(θ) count; h averages to perimeter/(2π) = 6r/(2π), so the layer holds
 * (3r/π) P / ((3√3/2) r²) = (2/(√3 π)) P / r ≈ 0.368 P/r templates (Cauchy's mean-width formula;
 * our estimate, no published source). Added to the area term it estimates a bounded region's count.
 */
export function boundaryLayerEstimate(perimeter: number, minimalMatch: number): number {
  return ((2 / (Math.sqrt(3) * Math.PI)) * perimeter) / Math.sqrt(1 - minimalMatch);
}

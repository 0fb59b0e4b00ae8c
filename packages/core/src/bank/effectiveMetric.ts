// The quadratic form the lattice is laid with: the phase metric, narrowed where the ISCO cutoff moves.
import type { Metric2, MetricSample } from "./metric.js";

/**
 * A metric G whose ball {Δ : Δᵀ G Δ ≤ 1 − MM} lies inside the set of displacements that keep the
 * match ≥ MM when the mismatch is modelled as
 *   1 − match ≈ Δᵀ g Δ + ½ D |Δ ln M|,                                               (*)
 * g the phase metric of metric.ts (Owen, Phys. Rev. D 53, 6749 (1996)) and ½ D |Δ ln M| the loss
 * from the templates' different ISCO cutoffs (D from MetricSample.cutoffSensitivity; ln M = ln τ3 −
 * ln τ0 + const, so ∇ ln M = (−1/τ0, 1/τ3)). With y = Lᵀ Δ (g = L Lᵀ) and the unit vector e along
 * L⁻¹ ∇ln M, (*) reads |y|² + 2a |e·y| with a = ¼ D |L⁻¹ ∇ ln M|, and {(*) ≤ r²} is the lens where
 * two discs of radius R = sqrt(r² + a²) centred at ±a e overlap. G is the largest-area ellipse centred
 * at 0 inside that lens (semi-axes A across e, B along e; found numerically), so a lattice that covers
 * the plane with G-balls of radius r covers it with lenses. Where the cutoff does not move (D = 0,
 * e.g. light binaries whose ISCO lies far above the sensitive band) G = g.
 *
 * Our construction (no published source); the linear term (*) was checked against directly computed
 * matches of TaylorF2 templates (test/bank/metric.test.ts).
 */
export function effectiveMetric(sample: MetricSample, tau0: number, tau3: number, minimalMatch: number): Metric2 {
  const g = sample.g;
  const r2 = 1 - minimalMatch;
  const l00 = Math.sqrt(g.g00);
  const l10 = g.g01 / l00;
  const l11 = Math.sqrt(Math.max(g.g11 - l10 * l10, 1e-300));
  // z = L⁻¹ u with u = ∇ ln M.
  const u0 = -1 / tau0;
  const u1 = 1 / tau3;
  const z0 = u0 / l00;
  const z1 = (u1 - l10 * z0) / l11;
  const beta = Math.hypot(z0, z1);
  const a = 0.25 * sample.cutoffSensitivity * beta;
  const r = Math.sqrt(r2);
  if (!(a > 1e-4 * r)) return { ...g };
  const { across, along } = lensEllipse(r, a);
  // G_y = r² (e⊥ e⊥ᵀ / A² + e eᵀ / B²), then G = L G_y Lᵀ.
  const e0 = z0 / beta;
  const e1 = z1 / beta;
  const pa = r2 / (across * across);
  const pb = r2 / (along * along);
  const y00 = pa * e1 * e1 + pb * e0 * e0;
  const y01 = (pb - pa) * e0 * e1;
  const y11 = pa * e0 * e0 + pb * e1 * e1;
  // L = [[l00, 0], [l10, l11]].
  return {
    g00: l00 * l00 * y00,
    g01: l00 * (l10 * y00 + l11 * y01),
    g11: l10 * l10 * y00 + 2 * l10 * l11 * y01 + l11 * l11 * y11,
  };
}

/**
 * Semi-axes of the largest centred ellipse inside the lens {(|y∥| + a)² + y⊥² ≤ r² + a²}:
 * maximise A·B subject to A² ≤ min_{s∈[0,1)} (R² − (B s + a)²) / (1 − s²) (the ellipse point
 * (y⊥, y∥) = (A cos t, B sin t), s = sin t, inside the disc centred at a), by a golden-section search
 * over B ∈ (0, R − a] and a grid over s. A is shrunk by 0.5 % against the grid's coarseness.
 */
export function lensEllipse(r: number, a: number): { across: number; along: number } {
  const R2 = r * r + a * a;
  const bMax = Math.sqrt(R2) - a;
  const nS = 512;
  const acrossFor = (b: number): number => {
    let m = Infinity;
    for (let k = 0; k < nS; k++) {
      const s = k / nS;
      const t = b * s + a;
      const v = (R2 - t * t) / (1 - s * s);
      if (v < m) m = v;
    }
    return Math.sqrt(Math.max(0, m));
  };
  const gr = (Math.sqrt(5) - 1) / 2;
  let lo = 0;
  let hi = bMax;
  let x1 = hi - gr * (hi - lo);
  let x2 = lo + gr * (hi - lo);
  let f1 = x1 * acrossFor(x1);
  let f2 = x2 * acrossFor(x2);
  for (let it = 0; it < 40; it++) {
    if (f1 < f2) {
      lo = x1;
      x1 = x2;
      f1 = f2;
      x2 = lo + gr * (hi - lo);
      f2 = x2 * acrossFor(x2);
    } else {
      hi = x2;
      x2 = x1;
      f2 = f1;
      x1 = hi - gr * (hi - lo);
      f1 = x1 * acrossFor(x1);
    }
  }
  const along = f1 > f2 ? x1 : x2;
  return { across: 0.995 * acrossFor(along), along };
}

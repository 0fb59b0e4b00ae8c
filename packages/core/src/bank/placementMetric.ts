// The quadratic form the lattice is laid with: the largest ellipse inside the minimal-match contour.
import { metricFactor, type Metric2 } from "./metric.js";
import type { TangentMatch } from "./tangentMatch.js";

/** Directions (over half a turn) in which the contour is found; it is symmetric under Δ → −Δ (A(−Δ) = A(Δ)). */
const N_DIRECTIONS = 12;
/** Angles at which the interpolated contour constrains the ellipse. */
const N_DENSE = 96;
/** Radii are shrunk by this factor against interpolation between the sampled directions. */
const SAFETY = 0.99;
/** The ellipse may reach at most this many metric radii along any direction. */
const MAX_STRETCH = 2.5;

/**
 * A metric G whose ball {Δ : Δᵀ G Δ ≤ 1 − MM} lies inside the set of displacements that keep the
 * modelled match ≥ MM, where the mismatch is modelled as
 *   1 − match ≈ (1 − A(Δ)) + ½ D |Δ ln M|,                                               (*)
 * A the match of the linearised phase (tangentMatch.ts; its second-order expansion is the metric of
 * Owen, Phys. Rev. D 53, 6749 (1996)) and ½ D |Δ ln M| the loss from the templates' different ISCO
 * cutoffs (D from MetricSample.cutoffSensitivity; ∇ ln M = (−1/τ0, 1/τ3) in the chirp times).
 * A lattice that covers the plane with G-balls of radius sqrt(1 − MM) then keeps every point's
 * modelled match ≥ MM.
 *
 * Construction (ours; no published source): in coordinates y = Lᵀ Δ whitened by the quadratic metric
 * g = L Lᵀ, the contour {(*) = 1 − MM} is found along 12 directions over half a turn (by iteration on
 * the radius, using (*) ∝ s^p locally), interpolated linearly in angle and shrunk by 1 %, and G is the
 * largest-area centred ellipse inside it (a search over the ellipse's orientation and aspect ratio,
 * its size then set by the tightest direction). Where the quadratic metric were exact and the cutoff
 * did not move, G would be g (up to the 1 % shrink); in fact A falls more slowly than the parabola
 * along the nearly degenerate direction (the contour reaches 1.2–2 metric radii there from 10–30 Hz),
 * so G is longer there and the lattice needs fewer templates.
 */
export function placementMetric(tangent: TangentMatch, tau0: number, tau3: number, minimalMatch: number): Metric2 {
  const { g, cutoffSensitivity } = tangent.sample;
  const target = 1 - minimalMatch;
  const r = Math.sqrt(target);
  // g = L Lᵀ with L = Wᵀ lower triangular (metricFactor).
  const { w00: l00, w01: l10, w11: l11 } = metricFactor(g);
  const u0 = -1 / tau0;
  const u1 = 1 / tau3;
  const radii = new Float64Array(N_DIRECTIONS);
  for (let k = 0; k < N_DIRECTIONS; k++) {
    const phi = (Math.PI * k) / N_DIRECTIONS;
    // Δ = L⁻ᵀ y for the unit y at angle φ: one unit of metric distance.
    const d3 = Math.sin(phi) / l11;
    const d0 = (Math.cos(phi) - l10 * d3) / l00;
    const cut = 0.5 * cutoffSensitivity * Math.abs(u0 * d0 + u1 * d3);
    const model = (s: number): number => tangent.mismatch(s * d0, s * d3) + cut * s;
    radii[k] = contourRadius(model, target, k > 0 ? radii[k - 1] : r, MAX_STRETCH * r);
  }
  const radiusAt = (phi: number): number => {
    let x = (phi / Math.PI) * N_DIRECTIONS;
    x -= N_DIRECTIONS * Math.floor(x / N_DIRECTIONS);
    const i = Math.floor(x);
    const f = x - i;
    return SAFETY * ((1 - f) * radii[i % N_DIRECTIONS] + f * radii[(i + 1) % N_DIRECTIONS]);
  };
  const dense = new Float64Array(N_DENSE);
  const cosD = new Float64Array(N_DENSE);
  const sinD = new Float64Array(N_DENSE);
  for (let j = 0; j < N_DENSE; j++) {
    const phi = (Math.PI * j) / N_DENSE;
    dense[j] = radiusAt(phi);
    cosD[j] = Math.cos(phi);
    sinD[j] = Math.sin(phi);
  }
  // Ellipse with semi-axes e^{a}, e^{−a} (times a scale) along (cos α, sin α) and across it: the
  // largest scale that fits is min_j ρ_j / ρ_shape(φ_j); maximise that scale (the area is ∝ scale²).
  const fit = (alpha: number, a: number): number => {
    const ca = Math.cos(alpha);
    const sa = Math.sin(alpha);
    const p = Math.exp(-2 * a);
    const q = Math.exp(2 * a);
    let scale = Infinity;
    for (let j = 0; j < N_DENSE; j++) {
      const along = cosD[j] * ca + sinD[j] * sa;
      const across = sinD[j] * ca - cosD[j] * sa;
      const inv2 = along * along * p + across * across * q; // 1/ρ_shape²
      const s = dense[j] * Math.sqrt(inv2);
      if (s < scale) scale = s;
    }
    return scale;
  };
  let bestAlpha = 0;
  let bestA = 0;
  let bestScale = fit(0, 0);
  const search = (alphaLo: number, alphaStep: number, nAlpha: number, aLo: number, aStep: number, nA: number): void => {
    let ba = bestAlpha;
    let bb = bestA;
    for (let i = 0; i < nAlpha; i++) {
      const alpha = alphaLo + i * alphaStep;
      for (let j = 0; j < nA; j++) {
        const a = aLo + j * aStep;
        const s = fit(alpha, a);
        if (s > bestScale) {
          bestScale = s;
          ba = alpha;
          bb = a;
        }
      }
    }
    bestAlpha = ba;
    bestA = bb;
  };
  search(0, Math.PI / 18, 18, -0.9, 0.1, 19);
  search(bestAlpha - Math.PI / 18, Math.PI / 90, 11, bestA - 0.1, 0.02, 11);
  search(bestAlpha - Math.PI / 90, Math.PI / 900, 21, bestA - 0.02, 0.002, 21);
  // G_y = r² (e eᵀ / A² + e⊥ e⊥ᵀ / B²), A = scale e^{a}, B = scale e^{−a}; then G = L G_y Lᵀ.
  const ca = Math.cos(bestAlpha);
  const sa = Math.sin(bestAlpha);
  const pa = target / (bestScale * bestScale * Math.exp(2 * bestA));
  const pb = target / (bestScale * bestScale * Math.exp(-2 * bestA));
  const y00 = pa * ca * ca + pb * sa * sa;
  const y01 = (pa - pb) * ca * sa;
  const y11 = pa * sa * sa + pb * ca * ca;
  return {
    g00: l00 * l00 * y00,
    g01: l00 * (l10 * y00 + l11 * y01),
    g11: l10 * l10 * y00 + 2 * l10 * l11 * y01 + l11 * l11 * y11,
  };
}

/**
 * The s > 0 with model(s) = target (to 0.03 % in the mismatch), for a mismatch model that grows like
 * s^p (p between 1 and 2) near the contour: iterate s ← s (target/model(s))^{1/p} from `start` (the
 * neighbouring direction's radius), p re-estimated from the last two steps. Capped at sMax.
 */
function contourRadius(model: (s: number) => number, target: number, start: number, sMax: number): number {
  let s = Math.min(start, sMax);
  let m = model(s);
  let p = 2;
  for (let it = 0; it < 20; it++) {
    if (Math.abs(m / target - 1) < 3e-4) break;
    let next = s * Math.pow(target / m, 1 / p);
    if (next > sMax) next = sMax;
    if (next === s) break;
    const mNext = model(next);
    if (mNext > 0 && m > 0 && Math.abs(Math.log(next / s)) > 1e-9) {
      const est = Math.log(mNext / m) / Math.log(next / s);
      p = Math.min(3, Math.max(0.8, est));
    }
    s = next;
    m = mNext;
    if (s === sMax && m < target) break;
  }
  return s;
}

// The match of two templates when the phase is linear in the chirp times: the all-orders form of the metric.
import type { MetricSample } from "./metric.js";

/**
 * The match model whose second-order expansion is the metric. Around a point θ, write the phase of a
 * neighbour θ + Δ as Ψ(θ) + Δ·∂Ψ/∂θ (linear in Δ; the Newtonian and 1.5PN terms of Ψ are exactly
 * linear in τ0 and τ3, Sathyaprakash 1994, the others nearly so). Its match with θ, maximised over
 * coalescence phase and time, is
 *   A(Δ) = max_t |J[exp(i(Δ·ψ + 2πf t))]|,
 * with J and ψ = ∂Ψ/∂θ as in metric.ts. This is the ambiguity function of Owen, Phys. Rev. D 53, 6749
 * (1996), Sec. II, for the linearised phase; expanding 1 − A to second order in Δ gives the metric
 * (Owen 1996, Eqs. (2.22), (2.27)), but A keeps the higher orders, which matter from mismatches of a
 * few per cent on: along the nearly degenerate direction a quadratic prediction of 0.05 overstates the
 * mismatch by up to 0.022 (test/reference/bank.test.ts measures both against directly computed matches).
 */
export interface TangentMatch {
  /** The metric sample (quadratic metric, cutoff and its sensitivity) at the point. */
  readonly sample: MetricSample;
  /** 1 − A(Δ) for Δ = (dTau0, dTau3) (seconds). */
  mismatch(dTau0: number, dTau3: number): number;
}

/**
 * Builds the model from the quadrature of metric.ts: `weights` (normalised to sum 1), the phase
 * derivatives ∂Ψ/∂τ0 and ∂Ψ/∂τ3 at the nodes (rad/s), and ω = 2πf at the nodes (rad/s).
 *
 * The maximum over t uses Newton's method on F(t) = |Z(t)|², Z(t) = Σ w e^{i(Δ·ψ + (ω − ω̄) t)},
 * with F' = 2 Re(Z̄ Z') and F'' = 2(|Z'|² + Re(Z̄ Z'')), started from the least-squares time
 * t₀ = −Cov(ω, Δ·ψ)/Var(ω) (the quadratic-order optimum; common practice, no source).
 */
export function createTangentMatch(
  sample: MetricSample,
  weights: Float64Array,
  dPsiDTau0: Float64Array,
  dPsiDTau3: Float64Array,
  omega: Float64Array,
): TangentMatch {
  const n = weights.length;
  let mean = 0;
  for (let q = 0; q < n; q++) mean += weights[q] * omega[q];
  const om = new Float64Array(n);
  let varOm = 0;
  for (let q = 0; q < n; q++) {
    om[q] = omega[q] - mean;
    varOm += weights[q] * om[q] * om[q];
  }
  const sigma = Math.sqrt(varOm);
  const phase = new Float64Array(n);

  const mismatch = (d0: number, d3: number): number => {
    let mp = 0;
    for (let q = 0; q < n; q++) {
      phase[q] = d0 * dPsiDTau0[q] + d3 * dPsiDTau3[q];
      mp += weights[q] * phase[q];
    }
    let cov = 0;
    for (let q = 0; q < n; q++) cov += weights[q] * om[q] * (phase[q] - mp);
    let t = -cov / varOm;
    let best = 0;
    for (let it = 0; it < 12; it++) {
      let zr = 0;
      let zi = 0;
      let z1r = 0;
      let z1i = 0;
      let z2r = 0;
      let z2i = 0;
      for (let q = 0; q < n; q++) {
        const ph = phase[q] + om[q] * t;
        const c = weights[q] * Math.cos(ph);
        const s = weights[q] * Math.sin(ph);
        const o = om[q];
        zr += c;
        zi += s;
        // Z' = i Σ w ω e^{iφ}, Z'' = −Σ w ω² e^{iφ}
        z1r -= o * s;
        z1i += o * c;
        z2r -= o * o * c;
        z2i -= o * o * s;
      }
      const f = zr * zr + zi * zi;
      if (f > best) best = f;
      const d1 = 2 * (zr * z1r + zi * z1i);
      const d2 = 2 * (z1r * z1r + z1i * z1i + zr * z2r + zi * z2i);
      // Newton where F is concave; otherwise a bounded step uphill.
      let step = d2 < 0 ? -d1 / d2 : Math.sign(d1) * (0.1 / sigma);
      const cap = 0.5 / sigma;
      if (Math.abs(step) > cap) step = Math.sign(step) * cap;
      t += step;
      if (Math.abs(step) * sigma < 1e-7) break;
    }
    return 1 - Math.sqrt(best);
  };

  return { sample, mismatch };
}

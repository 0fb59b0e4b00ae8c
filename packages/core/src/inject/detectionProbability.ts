import { InputError } from "../errors.js";

/**
 * Exponentially scaled modified Bessel function of order zero, I₀(x)·e^{−|x|}, from the
 * polynomial approximations of Abramowitz & Stegun, Handbook of Mathematical Functions (1964),
 * eqs. 9.8.1 (|x| ≤ 3.75, |ε| < 1.6e-7 relative) and 9.8.2 (|x| > 3.75, |ε| < 1.9e-7).
 */
export function besselI0Scaled(x: number): number {
  const ax = Math.abs(x);
  if (ax <= 3.75) {
    const t = (x / 3.75) ** 2;
    const i0 = 1 + t * (3.5156229 + t * (3.0899424 + t * (1.2067492 + t * (0.2659732 + t * (0.0360768 + t * 0.0045813)))));
    return i0 * Math.exp(-ax);
  }
  const t = 3.75 / ax;
  const p =
    0.39894228 +
    t * (0.01328592 + t * (0.00225319 + t * (-0.00157565 + t * (0.00916281 + t * (-0.02057706 + t * (0.02635537 + t * (-0.01647633 + t * 0.00392377)))))));
  return p / Math.sqrt(ax);
}

/**
 * Marcum Q-function of order one, Q₁(a, b) = ∫_b^∞ x exp(−(x² + a²)/2) I₀(a x) dx: the probability
 * that the modulus of a complex Gaussian variable with unit variance per quadrature and mean of
 * modulus a exceeds b (the Rice distribution; Marcum, IRE Trans. Inf. Theory 6, 59 (1960);
 * Helstrom, Statistical Theory of Signal Detection (1968), ch. V). Computed by Simpson's rule on
 * the scaled integrand x e^{−(x−a)²/2} I₀(ax)e^{−ax} over [b, max(a, b) + 40] (the rest is below
 * 1e-300), accurate to ~1e-7.
 */
export function marcumQ1(a: number, b: number): number {
  if (!(a >= 0) || !Number.isFinite(a)) throw new InputError(`marcumQ1: a must be a non-negative number (got ${a})`);
  if (!(b >= 0) || !Number.isFinite(b)) throw new InputError(`marcumQ1: b must be a non-negative number (got ${b})`);
  const upper = Math.max(a, b) + 40;
  const f = (x: number) => x * Math.exp(-0.5 * (x - a) * (x - a)) * besselI0Scaled(a * x);
  const steps = 2 * Math.ceil((upper - b) / 0.01);
  const h = (upper - b) / steps;
  let s = f(b) + f(upper);
  for (let i = 1; i < steps; i++) s += (i % 2 === 1 ? 4 : 2) * f(b + i * h);
  return Math.min(1, Math.max(0, (s * h) / 3));
}

/**
 * Probability that a matched filter finds a signal of optimal SNR ρ with a template of fitting
 * factor FF above the threshold |z| ≥ ρ*, in stationary Gaussian noise, at the signal's own time
 * and phase-maximised: |z|² is then non-central χ² with 2 degrees of freedom and non-centrality
 * (FF·ρ)², so P = Q₁(FF·ρ, ρ*) (e.g. Allen et al., Phys. Rev. D 85, 122006 (2012), Sec. II).
 * Maximising over a bank and over time makes the real search find a little more than this.
 */
export function gaussianDetectionProbability(optimalSnr: number, threshold: number, fittingFactor = 1): number {
  if (!(fittingFactor > 0 && fittingFactor <= 1)) throw new InputError(`fittingFactor must be in (0, 1] (got ${fittingFactor})`);
  return marcumQ1(fittingFactor * optimalSnr, threshold);
}

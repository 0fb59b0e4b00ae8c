// Post-Newtonian phase coefficients of quasi-circular, non-spinning compact binaries, as functions
// of the symmetric mass ratio η, written as series in v with logarithmic terms kept separate:
//   S(v) = Σ_{k=0}^{7} (a_k + b_k ln v) v^k ,
// where k is twice the PN order (k = 1 is zero for both series below).
import { checkEta, checkPnOrder } from "./taylorf2Validate.js";

/** Euler's constant γ_E (common practice, no source). */
export const EULER_GAMMA = 0.5772156649015329;

/**
 * PN velocity at the Schwarzschild ISCO, v_lso = (π G M f_isco / c³)^{1/3} = 6^{−1/2}, the same for
 * every mass (f_isco = c³ / (6^{3/2} π G M)). Reference velocity of the 2.5PN log term below.
 */
export const V_LSO = 1 / Math.sqrt(6);

/** Coefficients (a_k, b_k), k = 0..7, of a PN series Σ (a_k + b_k ln v) v^k. */
export interface PnLogSeries {
  /** Non-log coefficients a_0..a_7. */
  readonly a: Float64Array;
  /** Coefficients b_0..b_7 of ln v (non-zero only at k = 5, 6 here). */
  readonly b: Float64Array;
}

/**
 * Writes the TaylorF2 (stationary-phase) phase coefficients for symmetric mass ratio `eta`, truncated
 * at twice-PN-order `pnOrder` (terms with k > pnOrder are zero), into `a` and `b` (length ≥ 8), so that
 *
 *   Ψ(f) = 2π f t_c − φ_c − π/4 + (3 / (128 η v⁵)) Σ_{k=0}^{7} (a_k + b_k ln v) v^k,   v = (π G M f / c³)^{1/3}.
 *
 * Non-spinning 3.5PN coefficients (θ = −11831/9240, λ = −1987/3080 substituted):
 *   a0 = 1, a1 = 0, a2 = 3715/756 + 55η/9, a3 = −16π,
 *   a4 = 15293365/508032 + 27145η/504 + 3085η²/72,
 *   2.5PN: π (38645/756 − 65η/9) (1 + 3 ln(v / v_lso)), v_lso = 6^{−1/2} (see {@link V_LSO}); the
 *     constant part only shifts φ_c, and since v_lso is mass-independent every template uses the same
 *     reference, so a5 = π(38645/756 − 65η/9)(1 − 3 ln v_lso), b5 = 3π(38645/756 − 65η/9),
 *   3PN: 11583231236531/4694215680 − 640π²/3 − 6848γ_E/21 − (6848/21) ln(4v)
 *        + (−15737765635/3048192 + 2255π²/12) η + 76055η²/1728 − 127825η³/1296,
 *   a7 = π (77096675/254016 + 378515η/1512 − 74045η²/756).
 * Sources: Blanchet, Living Rev. Relativ. 17, 2 (2014) (3.5PN flux and energy of circular orbits,
 * from which the phasing follows); the stationary-phase series in this form: Buonanno, Iyer, Ochsner,
 * Pan & Sathyaprakash, Phys. Rev. D 80, 084043 (2009), Sec. III (TaylorF2).
 */
export function taylorF2PhaseCoefficientsInto(eta: number, pnOrder: number, a: Float64Array, b: Float64Array): void {
  const pi = Math.PI;
  const e2 = eta * eta;
  a.fill(0, 0, 8);
  b.fill(0, 0, 8);
  a[0] = 1;
  if (pnOrder >= 2) a[2] = 3715 / 756 + (55 / 9) * eta;
  if (pnOrder >= 3) a[3] = -16 * pi;
  if (pnOrder >= 4) a[4] = 15293365 / 508032 + (27145 / 504) * eta + (3085 / 72) * e2;
  if (pnOrder >= 5) {
    const p5 = pi * (38645 / 756 - (65 / 9) * eta);
    a[5] = p5 * (1 - 3 * Math.log(V_LSO));
    b[5] = 3 * p5;
  }
  if (pnOrder >= 6) {
    a[6] =
      11583231236531 / 4694215680 -
      (640 / 3) * pi * pi -
      (6848 / 21) * EULER_GAMMA -
      (6848 / 21) * Math.log(4) +
      (-15737765635 / 3048192 + (2255 / 12) * pi * pi) * eta +
      (76055 / 1728) * e2 -
      (127825 / 1296) * e2 * eta;
    b[6] = -6848 / 21;
  }
  if (pnOrder >= 7) a[7] = pi * (77096675 / 254016 + (378515 / 1512) * eta - (74045 / 756) * e2);
}

/** Allocating form of {@link taylorF2PhaseCoefficientsInto}; validates `eta` ∈ (0, 1/4] and `pnOrder` ∈ 0..7. */
export function taylorF2PhaseCoefficients(eta: number, pnOrder = 7): PnLogSeries {
  checkEta("taylorF2PhaseCoefficients", eta);
  checkPnOrder("taylorF2PhaseCoefficients", pnOrder);
  const a = new Float64Array(8);
  const b = new Float64Array(8);
  taylorF2PhaseCoefficientsInto(Math.min(eta, 0.25), pnOrder, a, b);
  return { a, b };
}

/**
 * Coefficients of the 3.5PN orbital phase of a quasi-circular non-spinning binary as a function of
 * v = x^{1/2} = (G M ω / c³)^{1/3}:
 *
 *   φ_orb(v) = φ_0 − (1 / (32 η v⁵)) Σ_{k=0}^{7} (a_k + b_k ln v) v^k ,
 *
 * the series of Blanchet, Living Rev. Relativ. 17, 2 (2014) (orbital phase φ(x) of circular orbits):
 *   1 + (3715/1008 + 55η/12) x − 10π x^{3/2} + (15293365/1016064 + 27145η/1008 + 3085η²/144) x²
 *   + (38645/1344 − 65η/16) π x^{5/2} ln(x/x₀)
 *   + [12348611926451/18776862720 − 160π²/3 − 1712γ_E/21 − (856/21) ln(16x)
 *      + (−15737765635/12192768 + 2255π²/48) η + 76055η²/6912 − 127825η³/5184] x³
 *   + (77096675/2032128 + 378515η/12096 − 74045η²/6048) π x^{7/2}.
 * The constant x₀ only shifts φ_0; we take x₀ = v_lso² = 1/6. The GW phase is 2 φ_orb.
 */
export function orbitalPhaseCoefficients(eta: number, pnOrder = 7): PnLogSeries {
  checkEta("orbitalPhaseCoefficients", eta);
  checkPnOrder("orbitalPhaseCoefficients", pnOrder);
  const pi = Math.PI;
  const e = Math.min(eta, 0.25);
  const e2 = e * e;
  const a = new Float64Array(8);
  const b = new Float64Array(8);
  a[0] = 1;
  if (pnOrder >= 2) a[2] = 3715 / 1008 + (55 / 12) * e;
  if (pnOrder >= 3) a[3] = -10 * pi;
  if (pnOrder >= 4) a[4] = 15293365 / 1016064 + (27145 / 1008) * e + (3085 / 144) * e2;
  if (pnOrder >= 5) {
    // ln(x/x₀) = 2 ln v − ln x₀ with x₀ = 1/6.
    const p5 = pi * (38645 / 1344 - (65 / 16) * e);
    a[5] = p5 * Math.log(6);
    b[5] = 2 * p5;
  }
  if (pnOrder >= 6) {
    a[6] =
      12348611926451 / 18776862720 -
      (160 / 3) * pi * pi -
      (1712 / 21) * EULER_GAMMA -
      (856 / 21) * Math.log(16) +
      (-15737765635 / 12192768 + (2255 / 48) * pi * pi) * e +
      (76055 / 6912) * e2 -
      (127825 / 5184) * e2 * e;
    b[6] = -1712 / 21; // −(856/21) ln(v²)
  }
  if (pnOrder >= 7) a[7] = pi * (77096675 / 2032128 + (378515 / 12096) * e - (74045 / 6048) * e2);
  return { a, b };
}

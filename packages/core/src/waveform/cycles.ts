// Number of gravitational-wave cycles a quasi-circular non-spinning inspiral spends between two
// GW frequencies, split by PN order.
import { M_SUN, T_SUN } from "../physics/constants.js";
import { iscoGwFrequency } from "../physics/isco.js";
import { InputError } from "../errors.js";
import { orbitalPhaseCoefficients, taylorF2PhaseCoefficients } from "./pnCoefficients.js";
import { addAlignedSpinPhaseTermsInto, requireAlignedSpins } from "./alignedSpinPhase.js";
import { requireMasses, requirePositiveFinite } from "./taylorf2Validate.js";

/** GW cycle counts between two frequencies, total and per PN order. */
export interface GwCycleCounts {
  /** Sum of all contributions through 3.5PN. */
  readonly total: number;
  /**
   * Contribution of each order, indexed by twice the PN order: [0] Newtonian, [1] 0.5PN (zero),
   * [2] 1PN, [3] 1.5PN (tail), [4] 2PN, [5] 2.5PN, [6] 3PN, [7] 3.5PN.
   */
  readonly byTwicePnOrder: readonly number[];
}

/**
 * GW cycles from fMinHz to fMaxHz (default: the ISCO GW frequency c³/(6^{3/2} π G M)):
 *   N = (φ_orb(f2) − φ_orb(f1)) / π,   φ_orb(v) = φ_0 − (1/(32η v⁵)) Σ_k (a_k + b_k ln v) v^k,
 * v = (π G M f / c³)^{1/3}, with the 3.5PN orbital phase of circular orbits of Blanchet,
 * Living Rev. Relativ. 17, 2 (2014) ({@link orbitalPhaseCoefficients}); f_GW = 2 f_orb, so one GW
 * cycle is π of orbital phase. The per-order split is the term-by-term difference, as in that
 * review's table of cycle counts from 10 Hz to the ISCO.
 */
export function gwCycleCounts(m1Solar: number, m2Solar: number, fMinHz: number, fMaxHz?: number): GwCycleCounts {
  const where = "gwCycleCounts";
  requireMasses(where, m1Solar, m2Solar);
  requirePositiveFinite(where, "fMinHz", fMinHz);
  const mTotal = m1Solar + m2Solar;
  const f2 = fMaxHz ?? iscoGwFrequency(mTotal * M_SUN);
  requirePositiveFinite(where, "fMaxHz", f2);
  if (!(f2 > fMinHz)) {
    throw new InputError(`${where}: fMaxHz (${f2}) must exceed fMinHz (${fMinHz})`);
  }
  const eta = (m1Solar * m2Solar) / (mTotal * mTotal);
  const { a, b } = orbitalPhaseCoefficients(Math.min(eta, 0.25));
  const piM = Math.PI * mTotal * T_SUN;
  const v1 = Math.cbrt(piM * fMinHz);
  const v2 = Math.cbrt(piM * f2);
  const l1 = Math.log(v1);
  const l2 = Math.log(v2);
  const byTwicePnOrder: number[] = [];
  let total = 0;
  for (let k = 0; k < 8; k++) {
    const term = (v: number, lv: number) => (a[k] + b[k] * lv) * Math.pow(v, k - 5);
    // φ_orb(v2) − φ_orb(v1) = (1/(32η)) [S_k(v1) − S_k(v2)], then divide by π.
    const n = (term(v1, l1) - term(v2, l2)) / (32 * eta * Math.PI);
    byTwicePnOrder.push(n);
    total += n;
  }
  return { total, byTwicePnOrder };
}

/**
 * GW cycles from fMinHz to fMaxHz (default: the Schwarzschild ISCO of the total mass) of the
 * TaylorF2 phasing with aligned spins chi1, chi2 ∈ (−1, 1): the GW phase at the stationary point is
 * φ(f) = 2π f t(f) − Ψ(f) − π/4 with 2π t(f) = dΨ/df (Cutler & Flanagan, Phys. Rev. D 49, 2658 (1994)),
 * so with Ψ = 3/(128 η v⁵) Σ (a_k + b_k ln v) v^k and f d/df = (v/3) d/dv,
 *   φ(v) = 3/(128 η) Σ_k [((k − 8)/3)(a_k + b_k ln v) + b_k/3] v^{k−5},   N = (φ(v2) − φ(v1)) / 2π,
 * coefficients of taylorF2PhaseCoefficients plus addAlignedSpinPhaseTermsInto. Without spins it
 * equals the total of {@link gwCycleCounts} up to the truncation difference of the two series.
 */
export function stationaryPhaseCycles(
  m1Solar: number,
  m2Solar: number,
  fMinHz: number,
  fMaxHz?: number,
  chi1 = 0,
  chi2 = 0,
): number {
  const where = "stationaryPhaseCycles";
  requireMasses(where, m1Solar, m2Solar);
  requirePositiveFinite(where, "fMinHz", fMinHz);
  requireAlignedSpins(where, chi1, chi2);
  const mTotal = m1Solar + m2Solar;
  const f2 = fMaxHz ?? iscoGwFrequency(mTotal * M_SUN);
  requirePositiveFinite(where, "fMaxHz", f2);
  if (!(f2 > fMinHz)) throw new InputError(`${where}: fMaxHz (${f2}) must exceed fMinHz (${fMinHz})`);
  const eta = Math.min((m1Solar * m2Solar) / (mTotal * mTotal), 0.25);
  const { a, b } = taylorF2PhaseCoefficients(eta, 7);
  if (chi1 !== 0 || chi2 !== 0) addAlignedSpinPhaseTermsInto(m1Solar, m2Solar, chi1, chi2, 7, a, b);
  const piM = Math.PI * mTotal * T_SUN;
  const phase = (v: number): number => {
    const lv = Math.log(v);
    let s = 0;
    for (let k = 0; k < 8; k++) s += (((k - 8) / 3) * (a[k] + b[k] * lv) + b[k] / 3) * Math.pow(v, k - 5);
    return (3 / (128 * eta)) * s;
  };
  return (phase(Math.cbrt(piM * f2)) - phase(Math.cbrt(piM * fMinHz))) / (2 * Math.PI);
}

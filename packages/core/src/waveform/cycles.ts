// Number of gravitational-wave cycles a quasi-circular non-spinning inspiral spends between two
// GW frequencies, split by PN order.
import { M_SUN, T_SUN } from "../physics/constants.js";
import { iscoGwFrequency } from "../physics/isco.js";
import { InputError } from "../errors.js";
import { orbitalPhaseCoefficients } from "./pnCoefficients.js";
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
 * GW cycles from fLowHz to fHighHz (default: the ISCO GW frequency c³/(6^{3/2} π G M)):
 *   N = (φ_orb(f2) − φ_orb(f1)) / π,   φ_orb(v) = φ_0 − (1/(32η v⁵)) Σ_k (a_k + b_k ln v) v^k,
 * v = (π G M f / c³)^{1/3}, with the 3.5PN orbital phase of circular orbits of Blanchet,
 * Living Rev. Relativ. 17, 2 (2014) ({@link orbitalPhaseCoefficients}); f_GW = 2 f_orb, so one GW
 * cycle is π of orbital phase. The per-order split is the term-by-term difference, as in that
 * review's table of cycle counts from 10 Hz to the ISCO.
 */
export function gwCycleCounts(m1Solar: number, m2Solar: number, fLowHz: number, fHighHz?: number): GwCycleCounts {
  const where = "gwCycleCounts";
  requireMasses(where, m1Solar, m2Solar);
  requirePositiveFinite(where, "fLowHz", fLowHz);
  const mTotal = m1Solar + m2Solar;
  const f2 = fHighHz ?? iscoGwFrequency(mTotal * M_SUN);
  requirePositiveFinite(where, "fHighHz", f2);
  if (!(f2 > fLowHz)) {
    throw new InputError(`${where}: fHighHz (${f2}) must exceed fLowHz (${fLowHz})`);
  }
  const eta = (m1Solar * m2Solar) / (mTotal * mTotal);
  const { a, b } = orbitalPhaseCoefficients(Math.min(eta, 0.25));
  const piM = Math.PI * mTotal * T_SUN;
  const v1 = Math.cbrt(piM * fLowHz);
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

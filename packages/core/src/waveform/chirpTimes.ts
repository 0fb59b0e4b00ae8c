// Chirp times (Newtonian and 1.5PN durations from a reference frequency) and the PN time to
// coalescence of a non-spinning inspiral.
import { T_SUN } from "../physics/constants.js";
import { InputError } from "../errors.js";
import { taylorF2PhaseCoefficientsInto } from "./pnCoefficients.js";
import { checkPnOrder, requireMasses, requirePositiveFinite } from "./taylorf2Validate.js";

const scratchA = new Float64Array(8);
const scratchB = new Float64Array(8);

/**
 * Chirp times (s) from the lower frequency f0 = fMinHz, with M = G(m1+m2)/c³ in seconds and η = m1m2/(m1+m2)²:
 *   τ0 = 5 / (256 π f0 η) (π M f0)^{−5/3}   (Newtonian duration),
 *   τ3 = 1 / (8 f0 η) (π M f0)^{−2/3}         (the 1.5PN "tail" term, entering the duration with a minus sign).
 * Source: Sathyaprakash, Phys. Rev. D 50, R7111 (1994).
 */
export function chirpTimes(m1Solar: number, m2Solar: number, fMinHz: number): { tau0: number; tau3: number } {
  requireMasses("chirpTimes", m1Solar, m2Solar);
  requirePositiveFinite("chirpTimes", "fMinHz", fMinHz);
  const mTotal = m1Solar + m2Solar;
  const eta = (m1Solar * m2Solar) / (mTotal * mTotal);
  const x = Math.PI * mTotal * T_SUN * fMinHz;
  return {
    tau0: (5 / (256 * Math.PI * fMinHz * eta)) * Math.pow(x, -5 / 3),
    tau3: (1 / (8 * fMinHz * eta)) * Math.pow(x, -2 / 3),
  };
}

/**
 * Inverse of {@link chirpTimes}: τ0/τ3 = 5 / (32 π² M f0) gives M = 5 τ3 / (32 π² f0 τ0) (seconds), then
 * η = 5 / (256 π f0 τ0) (π M f0)^{−5/3} and m1,2 = M (1 ± √(1 − 4η)) / 2 (m1 ≥ m2), in solar masses.
 * Returns null when there is no physical solution (η > 1/4 beyond rounding, 1e-12 relative).
 * Source: Sathyaprakash, Phys. Rev. D 50, R7111 (1994) (inverting its chirp-time definitions).
 */
export function massesFromChirpTimes(
  tau0: number,
  tau3: number,
  fMinHz: number,
): { m1Solar: number; m2Solar: number } | null {
  requirePositiveFinite("massesFromChirpTimes", "tau0 (s)", tau0);
  requirePositiveFinite("massesFromChirpTimes", "tau3 (s)", tau3);
  requirePositiveFinite("massesFromChirpTimes", "fMinHz", fMinHz);
  const mSeconds = (5 * tau3) / (32 * Math.PI * Math.PI * fMinHz * tau0);
  const eta = (5 / (256 * Math.PI * fMinHz * tau0)) * Math.pow(Math.PI * mSeconds * fMinHz, -5 / 3);
  if (!(eta <= 0.25 * (1 + 1e-12))) return null;
  const e = Math.min(eta, 0.25);
  const root = Math.sqrt(1 - 4 * e);
  const mSolar = mSeconds / T_SUN;
  return { m1Solar: (mSolar * (1 + root)) / 2, m2Solar: (mSolar * (1 - root)) / 2 };
}

/**
 * PN time to coalescence (s) from GW frequency fHz: the TaylorF2 relation
 *   t_c − t(f) = −(1/2π) dΨ/df = −(M / (256 η v⁸)) Σ_k [(k − 5)(a_k + b_k ln v) + b_k] v^k,
 * v = (π M f)^{1/3}, with the phase coefficients of {@link taylorF2PhaseCoefficientsInto} up to
 * twice-PN-order `pnOrder` (default 7 = 3.5PN). It equals the PN chirp-time series
 *   5M/(256 η v⁸) [1 + (743/252 + 11η/3) v² − (32π/5) v³ + … ] (Blanchet, Living Rev. Relativ. 17, 2 (2014);
 * the stationary-phase condition t(f) = t_c + (1/2π) dΨ/df, e.g. Cutler & Flanagan, Phys. Rev. D 49, 2658 (1994)).
 * At pnOrder 0 it is τ0 of {@link chirpTimes}; at high v the truncated series can fail to be monotonic.
 */
export function pnTimeToCoalescence(fHz: number, m1Solar: number, m2Solar: number, pnOrder = 7): number {
  requirePositiveFinite("pnTimeToCoalescence", "fHz", fHz);
  requireMasses("pnTimeToCoalescence", m1Solar, m2Solar);
  checkPnOrder("pnTimeToCoalescence", pnOrder);
  const mTotal = m1Solar + m2Solar;
  const eta = (m1Solar * m2Solar) / (mTotal * mTotal);
  const mSeconds = mTotal * T_SUN;
  const v = Math.cbrt(Math.PI * mSeconds * fHz);
  if (!(v > 0)) throw new InputError(`pnTimeToCoalescence: fHz ${fHz} is too small to represent`);
  taylorF2PhaseCoefficientsInto(eta, pnOrder, scratchA, scratchB);
  const lv = Math.log(v);
  let s = 0;
  for (let k = 7; k >= 0; k--) s = s * v + ((k - 5) * (scratchA[k] + scratchB[k] * lv) + scratchB[k]);
  const v4 = v * v * v * v;
  return (-mSeconds / (256 * eta * v4 * v4)) * s;
}

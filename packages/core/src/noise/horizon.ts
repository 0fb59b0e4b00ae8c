import { InputError } from "../errors.js";
import { C, GM_SUN, M_SUN, MPC } from "../physics/constants.js";
import { iscoGwFrequency } from "../physics/isco.js";
import { asPsdModel, type PsdInput } from "./interpolatePsd.js";

/**
 * Ratio of the horizon distance (optimal sky position and orientation) to the range averaged over
 * sky position and orientation (the radius of the sphere with the same sensitive volume):
 * 2.264 (Finn & Chernoff, Phys. Rev. D 47, 2198 (1993)).
 */
export const FINN_CHERNOFF_RANGE_FACTOR = 2.264;

export interface HorizonOptions {
  /** Component masses in solar masses. */
  massSolar1: number;
  massSolar2: number;
  /** One-sided noise PSD (model, table or sampled estimate). */
  psd: PsdInput;
  /** Lower integration limit (Hz); default the PSD model's fMinHz (a sampled PSD: its first bin). */
  fMinHz?: number;
  /**
   * Upper integration limit (Hz); default the GW frequency at the ISCO of the total mass. The
   * limit is also capped at the PSD's fMaxHz when it has one (a table or sampled estimate).
   */
  fMaxHz?: number;
  /** Detection threshold on the optimal SNR; default 8. */
  snr?: number;
}

export interface HorizonResult {
  /** Distance (Mpc) at which an optimally oriented, overhead source has SNR `snr`. */
  horizonMpc: number;
  /** Orientation- and sky-averaged range (Mpc): horizonMpc / 2.264. */
  rangeMpc: number;
  /** The integration limits used (Hz). */
  fMinHz: number;
  fMaxHz: number;
  /** GW frequency at the ISCO of the total mass (Hz). */
  fIscoHz: number;
}

/**
 * ∫_{a}^{b} f^{−7/3} / S(f) df, computed in u = ln f as ∫ f^{−4/3}/S du by Simpson's rule with the
 * number of intervals doubled until two successive results agree to 1e−9 relative (at most 2^21
 * intervals). Frequencies where S = +Infinity contribute nothing.
 */
function inspiralIntegral(evaluate: (f: number) => number, a: number, b: number, name: string): number {
  const u0 = Math.log(a);
  const u1 = Math.log(b);
  const g = (u: number): number => {
    const f = Math.exp(u);
    const s = evaluate(f);
    if (s === Infinity) return 0;
    if (!(s > 0)) throw new InputError(`horizon: the PSD "${name}" is not positive at ${f} Hz (got ${s})`);
    return Math.pow(f, -4 / 3) / s;
  };
  let intervals = 64;
  let h = (u1 - u0) / intervals;
  let ends = g(u0) + g(u1);
  let evenSum = 0; // interior points at even indices
  let oddSum = 0;
  for (let i = 1; i < intervals; i++) {
    if (i % 2 === 0) evenSum += g(u0 + i * h);
    else oddSum += g(u0 + i * h);
  }
  let simpson = (h / 3) * (ends + 2 * evenSum + 4 * oddSum);
  while (intervals < 1 << 21) {
    // Halve the step: all old points become even points, the new midpoints are the odd points.
    evenSum += oddSum;
    intervals *= 2;
    h /= 2;
    oddSum = 0;
    for (let i = 1; i < intervals; i += 2) oddSum += g(u0 + i * h);
    const next = (h / 3) * (ends + 2 * evenSum + 4 * oddSum);
    const converged = Math.abs(next - simpson) <= 1e-9 * Math.abs(next);
    simpson = next;
    if (converged && intervals >= 1024) break;
  }
  return simpson;
}

/**
 * Horizon distance and averaged range of a non-spinning binary for a noise PSD, from the Newtonian
 * (stationary-phase, leading-order) inspiral amplitude of an optimally oriented source overhead,
 *   |h̃(f)| = √(5/24) π^{−2/3} (c/D) (G𝓜/c³)^{5/6} f^{−7/6},
 * so that ρ² = 4 ∫ |h̃|²/S df = (4/D²)·(5/24) π^{−4/3} (G𝓜)^{5/3} c^{−3} ∫_{fLow}^{fHigh} f^{−7/3}/S df
 * and the horizon is the D at which ρ equals the threshold (Allen et al., Phys. Rev. D 85, 122006
 * (2012), Eqs. 3.4ff.; Sathyaprakash & Schutz, Living Rev. Relativ. 12, 2 (2009)). 𝓜 is the chirp
 * mass (m1 m2)^{3/5}/(m1 + m2)^{1/5}. The integral runs to the ISCO GW frequency
 * f = c³/(6^{3/2} π G M) (Schwarzschild ISCO; common practice) unless fMaxHz is given. The range
 * is horizon / 2.264 (Finn & Chernoff, Phys. Rev. D 47, 2198 (1993)).
 */
export function horizonDistance(options: HorizonOptions): HorizonResult {
  const { massSolar1: m1, massSolar2: m2 } = options;
  const snr = options.snr ?? 8;
  if (!(m1 > 0) || !Number.isFinite(m1)) throw new InputError(`horizon: massSolar1 must be a positive number of solar masses (got ${m1})`);
  if (!(m2 > 0) || !Number.isFinite(m2)) throw new InputError(`horizon: massSolar2 must be a positive number of solar masses (got ${m2})`);
  if (!(snr > 0) || !Number.isFinite(snr)) throw new InputError(`horizon: snr must be a positive number (got ${snr})`);
  const model = asPsdModel(options.psd);
  const fIsco = iscoGwFrequency((m1 + m2) * M_SUN);
  const fLow = options.fMinHz ?? model.fMinHz;
  if (!(fLow > 0) || !Number.isFinite(fLow)) throw new InputError(`horizon: fMinHz must be a positive number of Hz (got ${fLow})`);
  let fHigh = options.fMaxHz ?? fIsco;
  if (!(fHigh > 0) || !Number.isFinite(fHigh)) throw new InputError(`horizon: fMaxHz must be a positive number of Hz (got ${fHigh})`);
  if (model.fMaxHz !== undefined) fHigh = Math.min(fHigh, model.fMaxHz);
  if (!(fHigh > fLow)) {
    throw new InputError(`horizon: the upper frequency ${fHigh.toPrecision(6)} Hz (ISCO or the PSD's end) is not above fMinHz = ${fLow} Hz`);
  }
  const integral = inspiralIntegral((f) => model.evaluate(f), fLow, fHigh, model.name);
  const mcSolar = Math.pow(m1 * m2, 0.6) / Math.pow(m1 + m2, 0.2);
  const amplitude2 = (5 / 24) * Math.pow(Math.PI, -4 / 3) * Math.pow(GM_SUN * mcSolar, 5 / 3) / (C * C * C);
  const horizonM = Math.sqrt(4 * amplitude2 * integral) / snr;
  const horizonMpc = horizonM / MPC;
  return { horizonMpc, rangeMpc: horizonMpc / FINN_CHERNOFF_RANGE_FACTOR, fMinHz: fLow, fMaxHz: fHigh, fIscoHz: fIsco };
}

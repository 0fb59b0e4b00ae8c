// TaylorF2: the stationary-phase frequency-domain inspiral of a quasi-circular compact binary with
// spins aligned with the orbital angular momentum (χ1, χ2; default 0 = non-spinning), 3.5PN phase
// (spin terms: waveform/alignedSpinPhase.ts) with the Newtonian (quadrupole) amplitude, cut at the
// Schwarzschild ISCO of the total mass. With χ1 = χ2 = 0 no spin term is evaluated at all.
//
// Conventions (the project's):
//   Fourier transform  h̃(f) = ∫ h(t) e^{−2πift} dt;  one-sided PSD;  (a|b) = 4 Re ∫ a b* / S_n df.
//   h̃(f) = A f^{−7/6} e^{−iΨ(f)},
//   Ψ(f) = 2π f t_c − φ_c − π/4 + (3 / (128 η v⁵)) Σ_k (a_k + b_k ln v) v^k,  v = (π G M f / c³)^{1/3},
// with t_c = 0 and φ_c = 0 here: the template's coalescence is at t = 0, so a signal coalescing at
// t = t_c has the transform taylorF2Into(...) × e^{−2πi f t_c} (verified against an FFT of a
// time-domain Newtonian chirp in test/waveform/taylorf2Fft.test.ts). With this sign, h(t) = A(t) cos φ(t)
// with φ increasing in time gives h̃ ∝ e^{+i(φ(t_f) − 2π f t_f + π/4)} at the stationary point
// 2π F(t_f) = 2π f, i.e. e^{−iΨ}.
import { M_SUN, MPC, C, T_SUN } from "../physics/constants.js";
import { iscoGwFrequency } from "../physics/isco.js";
import { InputError } from "../errors.js";
import { taylorF2PhaseCoefficientsInto } from "./pnCoefficients.js";
import { addAlignedSpinPhaseTermsInto, requireAlignedSpins } from "./alignedSpinPhase.js";
import {
  checkPnOrder,
  requireBinCount,
  requireMasses,
  requirePositiveFinite,
  requirePositiveOrInfinity,
} from "./taylorf2Validate.js";

/** sqrt(5/24) π^{−2/3}: the optimally oriented SPA amplitude factor (Sathyaprakash & Schutz 2009). */
const AMPLITUDE_FACTOR = Math.sqrt(5 / 24) * Math.pow(Math.PI, -2 / 3);

// Scratch for the coefficient series (the library is single-threaded per worker).
const scratchA = new Float64Array(8);
const scratchB = new Float64Array(8);

/**
 * Amplitude prefactor A (s) with |h̃(f)| = A f^{−7/6} for an optimally oriented source (face-on,
 * overhead): A = sqrt(5/24) π^{−2/3} (c / D) (G Mc / c³)^{5/6}.
 * Source: Sathyaprakash & Schutz, Living Rev. Relativ. 12, 2 (2009) (SPA amplitude of the
 * quadrupole chirp h(t) = 4 (G Mc)^{5/3} (π f)^{2/3} / (c⁴ D) cos φ(t)).
 */
function amplitudePrefactor(m1Solar: number, m2Solar: number, distanceMpc: number): number {
  const mTotal = (m1Solar + m2Solar) * T_SUN;
  const eta = (m1Solar * m2Solar) / ((m1Solar + m2Solar) * (m1Solar + m2Solar));
  const chirpMassSeconds = Math.pow(eta, 0.6) * mTotal;
  return AMPLITUDE_FACTOR * (C / (distanceMpc * MPC)) * Math.pow(chirpMassSeconds, 5 / 6);
}

/**
 * TaylorF2 amplitude prefactor A (s) of an optimally oriented (face-on, overhead) source at
 * `distanceMpc` (default 1 Mpc): |h̃(f)| = A f^{−7/6}, A = sqrt(5/24) π^{−2/3} (c / D) (G Mc / c³)^{5/6}
 * (Sathyaprakash & Schutz, Living Rev. Relativ. 12, 2 (2009)). The same A as {@link taylorF2Into}.
 */
export function taylorF2Amplitude(m1Solar: number, m2Solar: number, distanceMpc = 1): number {
  requireMasses("taylorF2Amplitude", m1Solar, m2Solar);
  requirePositiveFinite("taylorF2Amplitude", "distanceMpc", distanceMpc);
  return amplitudePrefactor(m1Solar, m2Solar, distanceMpc);
}

/**
 * Writes the TaylorF2 phase as a series in the frequency itself (Hz), for evaluation without
 * computing v per frequency: with μ = (π G M / c³)^{1/3}, v = μ f^{1/3} and ln v = ln μ + (ln f)/3,
 * the phase of {@link taylorF2Phase} (t_c = 0, φ_c = 0) is
 *   Ψ(f) = −π/4 + f^{−5/3} Σ_{k=0}^{7} (c_k + d_k ln f) f^{k/3},
 *   c_k = (3/(128η)) μ^{k−5} (a_k + b_k ln μ),  d_k = (3/(128η)) μ^{k−5} b_k / 3,
 * the same series rearranged (Blanchet, Living Rev. Relativ. 17, 2 (2014); Buonanno et al.,
 * Phys. Rev. D 80, 084043 (2009), Sec. III). Only d_5 and d_6 are non-zero. `c` and `d` need
 * length ≥ 8. Aligned spins chi1, chi2 ∈ (−1, 1) (default 0) add the terms of
 * waveform/alignedSpinPhase.ts. No allocation; checks the masses, spins, PN order and the arrays.
 */
export function taylorF2FrequencySeriesInto(
  m1Solar: number,
  m2Solar: number,
  pnOrder: number,
  c: Float64Array,
  d: Float64Array,
  chi1 = 0,
  chi2 = 0,
): void {
  const where = "taylorF2FrequencySeriesInto";
  requireMasses(where, m1Solar, m2Solar);
  checkPnOrder(where, pnOrder);
  requireAlignedSpins(where, chi1, chi2);
  if (!(c instanceof Float64Array) || c.length < 8 || !(d instanceof Float64Array) || d.length < 8) {
    throw new InputError(`${where}: c and d must be Float64Arrays of length ≥ 8`);
  }
  frequencySeries(m1Solar, m2Solar, pnOrder, c, d, chi1, chi2);
}

/** Non-spinning coefficients of η, plus the aligned-spin terms only when a spin is non-zero. */
function phaseCoefficients(m1Solar: number, m2Solar: number, pnOrder: number, chi1: number, chi2: number): number {
  const mTotal = m1Solar + m2Solar;
  const eta = (m1Solar * m2Solar) / (mTotal * mTotal);
  taylorF2PhaseCoefficientsInto(eta, pnOrder, scratchA, scratchB);
  if (chi1 !== 0 || chi2 !== 0) addAlignedSpinPhaseTermsInto(m1Solar, m2Solar, chi1, chi2, pnOrder, scratchA, scratchB);
  return eta;
}

function frequencySeries(
  m1Solar: number,
  m2Solar: number,
  pnOrder: number,
  c: Float64Array,
  d: Float64Array,
  chi1: number,
  chi2: number,
): void {
  const mTotal = m1Solar + m2Solar;
  const eta = phaseCoefficients(m1Solar, m2Solar, pnOrder, chi1, chi2);
  const mu = Math.cbrt(Math.PI * mTotal * T_SUN);
  const lnMu = Math.log(mu);
  const pre = 3 / (128 * eta);
  let muPow = 1 / (mu * mu * mu * mu * mu); // μ^{k−5} at k = 0
  for (let k = 0; k < 8; k++) {
    c[k] = pre * muPow * (scratchA[k] + scratchB[k] * lnMu);
    d[k] = (pre * muPow * scratchB[k]) / 3;
    muPow *= mu;
  }
}

/**
 * The bins k with fMinHz ≤ k·dfHz ≤ min(f_isco(M), fMaxHz), k ≥ 1, clipped to 0..nBins−1:
 * returns {kStart, kEnd} (kEnd one past the last); {0, 0} when the band holds no bin.
 * f_isco = c³ / (6^{3/2} π G M) (Schwarzschild ISCO of the total mass; physics/isco.ts).
 */
export function taylorF2BinRange(
  nBins: number,
  dfHz: number,
  fMinHz: number,
  m1Solar: number,
  m2Solar: number,
  fMaxHz = Infinity,
): { kStart: number; kEnd: number } {
  const where = "taylorF2BinRange";
  requireBinCount(where, nBins);
  requirePositiveFinite(where, "dfHz", dfHz);
  requirePositiveFinite(where, "fMinHz", fMinHz);
  requireMasses(where, m1Solar, m2Solar);
  requirePositiveOrInfinity(where, "fMaxHz", fMaxHz);
  return binRange(nBins, dfHz, fMinHz, m1Solar, m2Solar, fMaxHz);
}

function binRange(
  nBins: number,
  dfHz: number,
  fMinHz: number,
  m1Solar: number,
  m2Solar: number,
  fMaxHz: number,
): { kStart: number; kEnd: number } {
  const fMax = Math.min(iscoGwFrequency((m1Solar + m2Solar) * M_SUN), fMaxHz);
  let kStart = Math.max(1, Math.ceil(fMinHz / dfHz));
  while (kStart > 1 && (kStart - 1) * dfHz >= fMinHz) kStart--;
  while (kStart * dfHz < fMinHz) kStart++;
  let kEnd = Math.min(nBins, Math.floor(fMax / dfHz) + 1);
  while (kEnd > 0 && (kEnd - 1) * dfHz > fMax) kEnd--;
  while (kEnd < nBins && kEnd * dfHz <= fMax) kEnd++;
  if (kEnd <= kStart) return { kStart: 0, kEnd: 0 };
  return { kStart, kEnd };
}

/**
 * Stationary-phase phase Ψ(f) (radians) for t_c = 0, φ_c = 0, up to twice-PN-order
 * `pnOrder` (0..7, default 7 = 3.5PN):
 *   Ψ(f) = −π/4 + (3 / (128 η v⁵)) Σ_k (a_k + b_k ln v) v^k,  v = (π G M f / c³)^{1/3},
 * coefficients from {@link taylorF2PhaseCoefficientsInto} (Blanchet, Living Rev. Relativ. 17, 2 (2014);
 * Buonanno et al., Phys. Rev. D 80, 084043 (2009), Sec. III). The 2.5PN log is referred to
 * v_lso = 6^{−1/2}. Aligned spins chi1, chi2 ∈ (−1, 1) (default 0) add the terms of
 * {@link addAlignedSpinPhaseTermsInto}. The template is h̃(f) = A f^{−7/6} e^{−iΨ(f)} (see the file header for the sign).
 */
export function taylorF2Phase(fHz: number, m1Solar: number, m2Solar: number, pnOrder = 7, chi1 = 0, chi2 = 0): number {
  const where = "taylorF2Phase";
  requirePositiveFinite(where, "fHz", fHz);
  requireMasses(where, m1Solar, m2Solar);
  checkPnOrder(where, pnOrder);
  requireAlignedSpins(where, chi1, chi2);
  const mTotal = m1Solar + m2Solar;
  const eta = phaseCoefficients(m1Solar, m2Solar, pnOrder, chi1, chi2);
  return phaseAt(Math.cbrt(Math.PI * mTotal * T_SUN * fHz), eta, scratchA, scratchB);
}

/** Ψ at PN velocity v for coefficient series (a, b): −π/4 + 3/(128 η v⁵) Σ (a_k + b_k ln v) v^k. */
function phaseAt(v: number, eta: number, a: Float64Array, b: Float64Array): number {
  const lv = Math.log(v);
  let s = a[7] + b[7] * lv;
  for (let k = 6; k >= 0; k--) s = s * v + (a[k] + b[k] * lv);
  const v2 = v * v;
  return (3 / (128 * eta)) * s / (v2 * v2 * v) - Math.PI / 4;
}

function checkCommon(
  where: string,
  out: Float64Array,
  nBins: number,
  dfHz: number,
  fMinHz: number,
  m1Solar: number,
  m2Solar: number,
  distanceMpc: number,
  fMaxHz: number,
): void {
  requireBinCount(where, nBins);
  if (!(out instanceof Float64Array) || out.length < 2 * nBins) {
    throw new InputError(
      `${where}: out must be a Float64Array of length ≥ 2·nBins = ${2 * nBins} (got ${out instanceof Float64Array ? out.length : typeof out})`,
    );
  }
  requirePositiveFinite(where, "dfHz", dfHz);
  requirePositiveFinite(where, "fMinHz", fMinHz);
  requireMasses(where, m1Solar, m2Solar);
  requirePositiveFinite(where, "distanceMpc", distanceMpc);
  requirePositiveOrInfinity(where, "fMaxHz", fMaxHz);
}

/**
 * Writes the TaylorF2 template h̃(f_k), f_k = k·dfHz, k = 0..nBins−1, interleaved (re, im) into
 * out[0..2·nBins): h̃(f) = A f^{−7/6} e^{−iΨ(f)} on fMinHz ≤ f ≤ min(f_isco, fMaxHz), zero elsewhere,
 * with Ψ from {@link taylorF2Phase} (t_c = 0, φ_c = 0; coalescence at t = 0; a signal coalescing at
 * t_c is this × e^{−2πi f t_c}) and A the optimally oriented (face-on, overhead) amplitude at
 * `distanceMpc` (default 1 Mpc): |h̃(f)| = sqrt(5/24) π^{−2/3} (c/D) (G Mc/c³)^{5/6} f^{−7/6}
 * (Sathyaprakash & Schutz, Living Rev. Relativ. 12, 2 (2009)). f_isco = c³/(6^{3/2} π G M).
 * Aligned spins chi1, chi2 ∈ (−1, 1) (default 0) enter the phase only; the amplitude keeps its
 * leading (Newtonian) order. Units of h̃: seconds (strain per Hz). Returns kEnd, one past the last non-zero bin (0 if none).
 * Reference implementation (Math.cbrt/log per bin); {@link createTaylorF2Generator} is the fast one.
 */
export function taylorF2Into(
  out: Float64Array,
  nBins: number,
  dfHz: number,
  fMinHz: number,
  m1Solar: number,
  m2Solar: number,
  distanceMpc = 1,
  fMaxHz = Infinity,
  pnOrder = 7,
  chi1 = 0,
  chi2 = 0,
): number {
  const where = "taylorF2Into";
  checkCommon(where, out, nBins, dfHz, fMinHz, m1Solar, m2Solar, distanceMpc, fMaxHz);
  checkPnOrder(where, pnOrder);
  requireAlignedSpins(where, chi1, chi2);
  const { kStart, kEnd } = binRange(nBins, dfHz, fMinHz, m1Solar, m2Solar, fMaxHz);
  out.fill(0, 0, 2 * kStart);
  out.fill(0, 2 * kEnd, 2 * nBins);
  if (kEnd === 0) return 0;
  const mTotal = m1Solar + m2Solar;
  const eta = phaseCoefficients(m1Solar, m2Solar, pnOrder, chi1, chi2);
  const amp = amplitudePrefactor(m1Solar, m2Solar, distanceMpc);
  const piM = Math.PI * mTotal * T_SUN;
  for (let k = kStart; k < kEnd; k++) {
    const f = k * dfHz;
    const psi = phaseAt(Math.cbrt(piM * f), eta, scratchA, scratchB);
    const mag = amp * Math.pow(f, -7 / 6);
    out[2 * k] = mag * Math.cos(psi);
    out[2 * k + 1] = -mag * Math.sin(psi);
  }
  return kEnd;
}

/** A TaylorF2 template maker for one frequency grid f_k = k·dfHz, k = 0..nBins−1. */
export interface TaylorF2Generator {
  readonly nBins: number;
  readonly dfHz: number;
  /** Twice the PN order of the phase (0..7). */
  readonly pnOrder: number;
  /**
   * Same output as {@link taylorF2Into} with this grid and PN order (equal to ~1e-10 relative):
   * writes out[0..2·nBins), returns kEnd (0 if no bin is in band). Aligned spins chi1, chi2
   * ∈ (−1, 1), default 0. No allocation.
   */
  generate(
    out: Float64Array,
    fMinHz: number,
    m1Solar: number,
    m2Solar: number,
    distanceMpc?: number,
    fMaxHz?: number,
    chi1?: number,
    chi2?: number,
  ): number;
}

/**
 * Precomputes, once per grid, f^{1/3}, f^{−5/3}, ln f and f^{−7/6} per bin, so a template costs a
 * Horner sum, a cos and a sin per bin, with the phase written as the series in f of
 * {@link taylorF2FrequencySeriesInto} (Blanchet 2014; Buonanno et al. 2009, Sec. III). Exact to
 * rounding; the search's faster, approximate phase path is waveform/taylorF2Phasor.ts.
 * Memory: 4 Float64Arrays of nBins.
 */
export function createTaylorF2Generator(
  nBins: number,
  dfHz: number,
  options: { pnOrder?: number } = {},
): TaylorF2Generator {
  const where = "createTaylorF2Generator";
  requireBinCount(where, nBins);
  requirePositiveFinite(where, "dfHz", dfHz);
  const pnOrder = options.pnOrder ?? 7;
  checkPnOrder(where, pnOrder);

  const fThird = new Float64Array(nBins); // f^{1/3}
  const fMinus53 = new Float64Array(nBins); // f^{−5/3}
  const logF = new Float64Array(nBins); // ln f
  const fMinus76 = new Float64Array(nBins); // f^{−7/6}
  for (let k = 1; k < nBins; k++) {
    const f = k * dfHz;
    const x = Math.cbrt(f);
    fThird[k] = x;
    fMinus53[k] = 1 / (f * x * x);
    logF[k] = Math.log(f);
    fMinus76[k] = Math.pow(f, -7 / 6);
  }
  const c = new Float64Array(8);
  const d = new Float64Array(8);
  const quarterPi = Math.PI / 4;

  return {
    nBins,
    dfHz,
    pnOrder,
    generate(out, fMinHz, m1Solar, m2Solar, distanceMpc = 1, fMaxHz = Infinity, chi1 = 0, chi2 = 0) {
      checkCommon("TaylorF2Generator.generate", out, nBins, dfHz, fMinHz, m1Solar, m2Solar, distanceMpc, fMaxHz);
      requireAlignedSpins("TaylorF2Generator.generate", chi1, chi2);
      const { kStart, kEnd } = binRange(nBins, dfHz, fMinHz, m1Solar, m2Solar, fMaxHz);
      out.fill(0, 0, 2 * kStart);
      out.fill(0, 2 * kEnd, 2 * nBins);
      if (kEnd === 0) return 0;
      frequencySeries(m1Solar, m2Solar, pnOrder, c, d, chi1, chi2);
      const c0 = c[0], c1 = c[1], c2 = c[2], c3 = c[3], c4 = c[4], c5 = c[5], c6 = c[6], c7 = c[7];
      const d5 = d[5], d6 = d[6];
      const amp = amplitudePrefactor(m1Solar, m2Solar, distanceMpc);
      for (let k = kStart; k < kEnd; k++) {
        const x = fThird[k];
        const lf = logF[k];
        // Only k = 5, 6 carry logarithms (see taylorF2PhaseCoefficientsInto).
        const s = c0 + x * (c1 + x * (c2 + x * (c3 + x * (c4 + x * (c5 + d5 * lf + x * (c6 + d6 * lf + x * c7))))));
        const psi = fMinus53[k] * s - quarterPi;
        const mag = amp * fMinus76[k];
        out[2 * k] = mag * Math.cos(psi);
        out[2 * k + 1] = -mag * Math.sin(psi);
      }
      return kEnd;
    },
  };
}

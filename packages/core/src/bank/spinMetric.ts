// The match metric of aligned-spin TaylorF2 templates in three chirp-time coordinates (τ0, τ3, τs).
//
// τ0 and τ3 are the non-spinning Newtonian and 1.5PN chirp times (chirpTimeCoordinates.ts); the spin
// chirp time τs = τ3 β / (4π) carries the 1.5PN spin-orbit term, which enters the phase as
// −(16π − 4β) v³, so the 1.5PN part of the phase is linear in τ3 − τs. Up to 1.5PN the phase is then
// linear in all three coordinates, so the metric in them is nearly constant: only the 1PN and higher
// orders and the cutoff at the ISCO make it vary (the three-dimensional analogue of Owen &
// Sathyaprakash, Phys. Rev. D 60, 022002 (1999), Sec. III).
import { T_SUN } from "../physics/constants.js";
import type { PsdModel } from "../noise/psdModel.js";
import { taylorF2PhaseCoefficientsInto, V_LSO } from "../waveform/pnCoefficients.js";
import { chirpTimesFromMassEta, iscoFrequencyHz, massEtaFromChirpTimes } from "./chirpTimeCoordinates.js";
import { spinOrbitBeta } from "../waveform/alignedSpinPhase.js";

/** A symmetric 3 × 3 metric: [g00, g01, g02, g11, g12, g22]. */
export type Metric3 = Float64Array;

/** A point in the spin chirp-time coordinates (s). */
export type SpinCoordinates = [tau0: number, tau3: number, tauS: number];

/** Equal aligned spin χ whose 1.5PN parameter β equals the given one: β = χ (113 − 76η) / 12 for χ1 = χ2 = χ. */
export function equalSpinFromBeta(beta: number, eta: number): number {
  return (12 * beta) / (113 - 76 * eta);
}

/**
 * (τ0, τ3, τs) of masses m1, m2 (solar) with aligned spins χ1, χ2 from f0: τs = τ3 β / (4π), β the
 * 1.5PN spin-orbit parameter (Kidder, Will & Wiseman, Phys. Rev. D 47, R4183 (1993)).
 */
export function spinCoordinatesFromComponents(m1Solar: number, m2Solar: number, chi1: number, chi2: number, f0Hz: number): SpinCoordinates {
  const m = m1Solar + m2Solar;
  const ct = chirpTimesFromMassEta(m, (m1Solar * m2Solar) / (m * m), f0Hz);
  return [ct.tau0, ct.tau3, (ct.tau3 * spinOrbitBeta(m1Solar, m2Solar, chi1, chi2)) / (4 * Math.PI)];
}

/** Total mass, η and the equal spin χ of a point (τ0, τ3, τs); no validation (η > 1/4 and |χ| ≥ 1 are returned as they are). */
export function massEtaSpinFromCoordinates(tau0: number, tau3: number, tauS: number, f0Hz: number): { totalMassSolar: number; eta: number; spin: number } {
  const { totalMassSolar, eta } = massEtaFromChirpTimes(tau0, tau3, f0Hz);
  const beta = (4 * Math.PI * tauS) / tau3;
  return { totalMassSolar, eta, spin: equalSpinFromBeta(beta, eta) };
}

/** Scratch for the non-spinning coefficients (equalSpinPhaseInto allocates nothing per call). */
const COEFF_A = new Float64Array(8);
const COEFF_B = new Float64Array(8);

/**
 * The TaylorF2 phase Ψ(f) (t_c = φ_c = 0) of total mass M, symmetric mass ratio η and equal aligned
 * spins χ1 = χ2 = χ, written in η alone so that it can be differentiated across η = 1/4. Non-spinning
 * coefficients as in pnCoefficients.ts (Blanchet, Living Rev. Relativ. 17, 2 (2014)); with χa = 0
 * the spin terms of alignedSpinPhase.ts reduce to (Kidder, Will & Wiseman 1993; Poisson 1998;
 * Arun et al., Phys. Rev. D 79, 104023 (2009); Bohé, Marsat & Blanchet, Class. Quantum Grav. 30,
 * 135009 (2013)): +(113/3 − 76η/3)χ v³, −10χ²[(79/8)η + (81/16)(1 − 2η)] v⁴,
 * −γ(1 + 3 ln(v/v_lso)) v⁵ with γ = (732985/2268 − 24260η/81 − 340η²/9)χ, π(2270/3 − 520η)χ v⁶ and
 * (−25150083775/3048192 + 10566655595η/762048 − 1042165η²/3024 + 5345η³/36)χ v⁷.
 * Writes Ψ at each frequency of `fHz` into `out`.
 */
export function equalSpinPhaseInto(totalMassSolar: number, eta: number, spin: number, fHz: Float64Array, out: Float64Array): void {
  const pi = Math.PI;
  const e2 = eta * eta;
  const x = spin;
  // The non-spinning coefficients (η may exceed 1/4 here: no clamp), then the equal-spin terms.
  taylorF2PhaseCoefficientsInto(eta, 7, COEFF_A, COEFF_B);
  const a2 = COEFF_A[2];
  const a3 = COEFF_A[3] + (113 / 3 - (76 / 3) * eta) * x;
  const a4 = COEFF_A[4] - 10 * x * x * ((79 / 8) * eta + (81 / 16) * (1 - 2 * eta));
  const gamma = (732985 / 2268 - (24260 / 81) * eta - (340 / 9) * e2) * x;
  const a5 = COEFF_A[5] - gamma * (1 - 3 * Math.log(V_LSO));
  const b5 = COEFF_B[5] - 3 * gamma;
  const a6 = COEFF_A[6] + pi * (2270 / 3 - 520 * eta) * x;
  const b6 = COEFF_B[6];
  const a7 = COEFF_A[7] + (-25150083775 / 3048192 + (10566655595 / 762048) * eta - (1042165 / 3024) * e2 + (5345 / 36) * e2 * eta) * x;
  const pre = 3 / (128 * eta);
  const mT = pi * totalMassSolar * T_SUN;
  for (let i = 0; i < fHz.length; i++) {
    const v = Math.cbrt(mT * fHz[i]);
    const lv = Math.log(v);
    let s = a7;
    s = s * v + (a6 + b6 * lv);
    s = s * v + (a5 + b5 * lv);
    s = s * v + a4;
    s = s * v + a3;
    s = s * v + a2;
    s = s * v; // a1 = 0
    s = s * v + 1;
    const v2 = v * v;
    out[i] = (pre * s) / (v2 * v2 * v) - pi / 4;
  }
}

export interface SpinMetricOptions {
  psd: PsdModel;
  /** Lower end of the inner products (Hz): the bank's fmin, also the reference of the chirp times. */
  fMinHz: number;
  /** Fixed upper end (Hz); default each point's ISCO frequency. */
  fMaxHz?: number;
  /** Frequencies of the quadrature (log-spaced; default 160). */
  points?: number;
  /**
   * Minimal match the metric is used at (default 0.97): sets the quadratic stand-in for the loss from
   * the moving ISCO cutoff (see {@link createSpinMetric}).
   */
  minimalMatch?: number;
}

/** Evaluates the metric at points of the spin chirp-time coordinates. Not thread-safe (reuses scratch arrays). */
export interface SpinMetric {
  /** The metric at (τ0, τ3, τs), written into `out` (allocated when absent) and returned. */
  at(tau0: number, tau3: number, tauS: number, out?: Metric3): Metric3;
}

/**
 * The match metric g_ij with time and phase maximised out (Owen, Phys. Rev. D 53, 6749 (1996), Sec. II):
 *   g_ij = ½ [⟨ψi ψj⟩ − ⟨ψi⟩⟨ψj⟩ − (⟨ψi ω⟩ − ⟨ψi⟩⟨ω⟩)(⟨ψj ω⟩ − ⟨ψj⟩⟨ω⟩) / (⟨ω²⟩ − ⟨ω⟩²)],
 * ψi = ∂Ψ/∂u_i, ω = 2πf, ⟨x⟩ = ∫ x f^{−7/3}/S df / ∫ f^{−7/3}/S df from fLow to the point's ISCO
 * (or fMaxHz), so that 1 − match ≈ g_ij Δu_i Δu_j. The derivatives are central differences of
 * {@link equalSpinPhaseInto} (relative steps 1e-5); the integrals a trapezoid rule on a log grid.
 *
 * When the ISCO ends the band, a template of another total mass ends elsewhere, which costs a mismatch
 * linear in the change: c |Δ ln M| with c = ½ f_c w(f_c) (the share of (h|h) per unit ln f at the
 * cutoff f_c, halved for the match; first order, common practice, no source). It is added as
 * k (Δ ln M)², k = 2c²/(1 − MM), which equals the linear term where it uses half the mismatch
 * budget 1 − MM and is below it on the axis (conservative there).
 */
export function createSpinMetric(options: SpinMetricOptions): SpinMetric {
  const { psd, fMinHz } = options;
  const n = options.points ?? 160;
  const f = new Float64Array(n);
  const w = new Float64Array(n);
  const phase = [new Float64Array(n), new Float64Array(n)];
  const d = [new Float64Array(n), new Float64Array(n), new Float64Array(n)];
  const psdTop = psd.fMaxHz ?? Infinity;
  const phaseAt = (t0: number, t3: number, ts: number, out: Float64Array): void => {
    const p = massEtaSpinFromCoordinates(t0, t3, ts, fMinHz);
    equalSpinPhaseInto(p.totalMassSolar, p.eta, p.spin, f, out);
  };
  return {
    at(tau0, tau3, tauS, out = new Float64Array(6)) {
      const m = massEtaFromChirpTimes(tau0, tau3, fMinHz).totalMassSolar;
      const fTop = Math.min(iscoFrequencyHz(m), options.fMaxHz ?? Infinity, psdTop);
      const lnLo = Math.log(fMinHz);
      const step = (Math.log(Math.max(fTop, fMinHz * 1.0001)) - lnLo) / (n - 1);
      let norm = 0;
      for (let i = 0; i < n; i++) {
        f[i] = Math.exp(lnLo + i * step);
        const s = psd.evaluate(f[i]);
        // Trapezoid on ln f: df = f d(ln f).
        const trap = i === 0 || i === n - 1 ? 0.5 : 1;
        w[i] = s > 0 && Number.isFinite(s) ? (trap * step * f[i] * Math.pow(f[i], -7 / 3)) / s : 0;
        norm += w[i];
      }
      for (let i = 0; i < n; i++) w[i] /= norm;
      // Density of the normalised weight per unit ln f at the cutoff (w[n−1] holds half a step).
      const cutoffDensity = fTop < Math.min(options.fMaxHz ?? Infinity, psdTop) * (1 - 1e-12) ? (2 * w[n - 1]) / step : 0;
      const u = [tau0, tau3, tauS];
      const h = [1e-5 * tau0, 1e-5 * tau3, 1e-5 * tau3];
      for (let j = 0; j < 3; j++) {
        const up = u.slice();
        const dn = u.slice();
        up[j] += h[j];
        dn[j] -= h[j];
        phaseAt(up[0], up[1], up[2], phase[0]);
        phaseAt(dn[0], dn[1], dn[2], phase[1]);
        const dj = d[j];
        for (let i = 0; i < n; i++) dj[i] = (phase[0][i] - phase[1][i]) / (2 * h[j]);
      }
      let mW = 0;
      let mW2 = 0;
      const mP = [0, 0, 0];
      const mPW = [0, 0, 0];
      const mPP = [0, 0, 0, 0, 0, 0];
      for (let i = 0; i < n; i++) {
        const wi = w[i];
        const om = 2 * Math.PI * f[i];
        mW += wi * om;
        mW2 += wi * om * om;
        const p0 = d[0][i];
        const p1 = d[1][i];
        const p2 = d[2][i];
        mP[0] += wi * p0;
        mP[1] += wi * p1;
        mP[2] += wi * p2;
        mPW[0] += wi * p0 * om;
        mPW[1] += wi * p1 * om;
        mPW[2] += wi * p2 * om;
        mPP[0] += wi * p0 * p0;
        mPP[1] += wi * p0 * p1;
        mPP[2] += wi * p0 * p2;
        mPP[3] += wi * p1 * p1;
        mPP[4] += wi * p1 * p2;
        mPP[5] += wi * p2 * p2;
      }
      const varW = mW2 - mW * mW;
      const c = [mPW[0] - mP[0] * mW, mPW[1] - mP[1] * mW, mPW[2] - mP[2] * mW];
      const pairs: [number, number][] = [[0, 0], [0, 1], [0, 2], [1, 1], [1, 2], [2, 2]];
      // ln M = ln τ3 − ln τ0 + const, so ∇ ln M = (−1/τ0, 1/τ3, 0).
      const cut = 0.5 * cutoffDensity;
      const k2 = (2 * cut * cut) / (1 - (options.minimalMatch ?? 0.97));
      const grad = [-1 / tau0, 1 / tau3, 0];
      pairs.forEach(([i, j], k) => {
        out[k] = 0.5 * (mPP[k] - mP[i] * mP[j] - (c[i] * c[j]) / varW) + k2 * grad[i] * grad[j];
      });
      return out;
    },
  };
}

/** g(Δ, Δ) for a symmetric 3 × 3 metric. */
export function metricDistance2(g: Metric3, d0: number, d1: number, d2: number): number {
  return g[0] * d0 * d0 + g[3] * d1 * d1 + g[5] * d2 * d2 + 2 * (g[1] * d0 * d1 + g[2] * d0 * d2 + g[4] * d1 * d2);
}

/** Cholesky factor L (lower, row-major 3 × 3) with g = L Lᵀ; throws when g is not positive definite. */
export function choleskyFactor3(g: Metric3): Float64Array {
  const l00 = Math.sqrt(g[0]);
  const l10 = g[1] / l00;
  const l20 = g[2] / l00;
  const l11 = Math.sqrt(g[3] - l10 * l10);
  const l21 = (g[4] - l20 * l10) / l11;
  const l22 = Math.sqrt(g[5] - l20 * l20 - l21 * l21);
  if (!(l00 > 0 && l11 > 0 && l22 > 0)) throw new Error("spin metric: not positive definite");
  return Float64Array.of(l00, 0, 0, l10, l11, 0, l20, l21, l22);
}

/** det g of a symmetric 3 × 3 metric. */
export function metricDeterminant3(g: Metric3): number {
  return g[0] * (g[3] * g[5] - g[4] * g[4]) - g[1] * (g[1] * g[5] - g[4] * g[2]) + g[2] * (g[1] * g[4] - g[3] * g[2]);
}

// Parameter-space metric of the match for non-spinning inspirals, in chirp-time coordinates (τ0, τ3).
import { InputError } from "../errors.js";
import type { PsdModel } from "../noise/psdModel.js";
import { taylorF2PhaseCoefficientsInto } from "../waveform/pnCoefficients.js";
import { T_SUN } from "../physics/constants.js";
import { iscoFrequencyHz, massEtaFromChirpTimes } from "./chirpTimeCoordinates.js";
import { createTangentMatch, type TangentMatch } from "./tangentMatch.js";

/** A symmetric 2×2 metric g_ij in (τ0, τ3), units s⁻². Mismatch ≈ g00 dτ0² + 2 g01 dτ0 dτ3 + g11 dτ3². */
export interface Metric2 {
  g00: number;
  g01: number;
  g11: number;
}

export interface ChirpTimeMetricOptions {
  /** Noise curve S_n(f). */
  psd: PsdModel;
  /** Lower cutoff of the match integrals and reference frequency f0 of the chirp times, Hz. */
  fMinHz: number;
  /**
   * Fixed upper cutoff, Hz. The integrals run to min(f_ISCO of the point's total mass, fMaxHz):
   * a template stops at its ISCO, so the metric uses the point's own ISCO (the derivative of the
   * cutoff itself is neglected, as usual). Default: no fixed cutoff (ISCO only).
   */
  fMaxHz?: number;
  /** Twice the PN order of the TaylorF2 phase (default 7, i.e. 3.5PN). */
  pnOrder?: number;
  /** Quadrature nodes per e-fold of frequency (default 200; trapezoid rule in ln f). */
  pointsPerEFold?: number;
}

/** The metric at one point together with what the upper cutoff does there. */
export interface MetricSample {
  g: Metric2;
  /** Upper cutoff of the integrals (Hz): min(ISCO of the point's total mass, fMaxHz). */
  cutoffHz: number;
  /**
   * D = f_c (f_c^{−7/3}/S(f_c)) / I7: the fraction of the squared SNR per unit ln f at the cutoff f_c
   * when the cutoff is the ISCO (0 when a fixed fHigh below the ISCO is the cutoff). Two templates whose
   * ISCOs differ by Δ ln f_c = −Δ ln M lose, besides the phase mismatch, a further ≈ ½ D |Δ ln M| of
   * match, because the longer one carries power the shorter one lacks: match ≈ sqrt(I7(f_a)/I7(f_b)).
   * This term is linear in the displacement, so no quadratic metric holds it; see placementMetric.ts.
   */
  cutoffSensitivity: number;
}

/** Metric evaluator bound to one noise curve and cutoff. Not thread-safe (reuses scratch arrays). */
export interface ChirpTimeMetric {
  readonly fMinHz: number;
  readonly fMaxHz: number;
  /** Upper cutoff (Hz) of the integrals at this point: min(ISCO of its total mass, fMaxHz). */
  upperCutoffHz(tau0: number, tau3: number): number;
  /** The metric at (τ0, τ3) (seconds), projected over coalescence time and phase. */
  at(tau0: number, tau3: number): Metric2;
  /** The metric with the cutoff and its sensitivity at (τ0, τ3). */
  sample(tau0: number, tau3: number): MetricSample;
  /** The match model of the phase linearised at (τ0, τ3), whose expansion is the metric (tangentMatch.ts). */
  tangent(tau0: number, tau3: number): TangentMatch;
}

/** Fewest quadrature steps across the band from fLow to the cutoff (see createChirpTimeMetric). */
const MIN_BAND_NODES = 32;

/** g_ij Δθ^i Δθ^j: the squared metric distance, i.e. the predicted mismatch 1 − match (Owen 1996). */
export function metricDistanceSquared(g: Metric2, dTau0: number, dTau3: number): number {
  return g.g00 * dTau0 * dTau0 + 2 * g.g01 * dTau0 * dTau3 + g.g11 * dTau3 * dTau3;
}

/**
 * The Cholesky factor of g, g = Wᵀ W with W = [[w00, w01], [0, w11]] upper triangular: u = W Δ are
 * coordinates in which g is Euclidean (|u|² = Δᵀ g Δ). Common practice, no source.
 */
export function metricFactor(g: Metric2): { w00: number; w01: number; w11: number } {
  const w00 = Math.sqrt(g.g00);
  const w01 = g.g01 / w00;
  return { w00, w01, w11: Math.sqrt(Math.max(g.g11 - w01 * w01, 1e-300)) };
}

/** √det g, the proper-area density of the metric in the (τ0, τ3) plane (s⁻²). */
export function metricDensity(g: Metric2): number {
  return Math.sqrt(Math.max(0, g.g00 * g.g11 - g.g01 * g.g01));
}

/**
 * Creates the metric of the match for non-spinning inspirals in chirp-time coordinates θ = (τ0, τ3),
 * computed from the noise curve and the low-frequency cutoff.
 *
 * With the moment functional J[a] = (1/I7) ∫ a(f) f^{−7/3}/S_n(f) df, I7 = ∫ f^{−7/3}/S_n(f) df over
 * [fLow, f_up], and ψ_α = ∂Ψ/∂θ^α the derivatives of the stationary-phase phase Ψ(f) with respect to
 * (t_c, τ0, τ3), the metric after maximising over the phase φ_c is
 *   γ_αβ = ½ (J[ψ_α ψ_β] − J[ψ_α] J[ψ_β])                    (Owen, Phys. Rev. D 53, 6749 (1996), Eq. (2.22);
 *                                                            Owen & Sathyaprakash, PRD 60, 022002 (1999), Eq. (3.5)),
 * with ψ_tc = 2πf, and maximising over t_c projects it to the intrinsic 2×2 metric
 *   g_ij = γ_ij − γ_{tc i} γ_{tc j} / γ_{tc tc}                  (Owen 1996, Eq. (2.27)),
 * so that 1 − match ≈ g_ij Δθ^i Δθ^j for nearby templates.
 *
 * Ψ is the 3.5PN TaylorF2 phase (3/(128 η v⁵)) Σ (a_k + b_k ln v) v^k (see
 * waveform/pnCoefficients.ts); its derivatives are analytic in ln M and η (the η-derivatives of the
 * polynomial coefficients by a central difference) and mapped to (τ0, τ3) by the chain rule with
 * ∂ln M/∂τ0 = −1/τ0, ∂ln M/∂τ3 = 1/τ3, ∂ln η/∂τ0 = 2/(3τ0), ∂ln η/∂τ3 = −5/(3τ3) (from the chirp-time
 * definitions, Sathyaprakash 1994). The integrals use the trapezoid rule on a logarithmic frequency grid
 * (`pointsPerEFold` nodes per e-fold, the last interval ending exactly at the cutoff). The quadrature
 * is done on centred values, so the variances are computed without cancellation.
 */
export function createChirpTimeMetric(options: ChirpTimeMetricOptions): ChirpTimeMetric {
  const { psd } = options;
  const fMinHz = options.fMinHz;
  const fMaxHz = options.fMaxHz ?? Infinity;
  const pnOrder = options.pnOrder ?? 7;
  const perEFold = options.pointsPerEFold ?? 200;
  if (!(fMinHz > 0) || !Number.isFinite(fMinHz)) throw new InputError(`metric: fMinHz must be a positive number (got ${fMinHz})`);
  if (!(fMaxHz > fMinHz)) throw new InputError(`metric: fMaxHz must exceed fMinHz (got ${fMaxHz} ≤ ${fMinHz})`);
  if (!Number.isInteger(pnOrder) || pnOrder < 0 || pnOrder > 7) throw new InputError(`metric: pnOrder must be an integer 0..7 (got ${pnOrder})`);
  if (!(perEFold >= 10)) throw new InputError(`metric: pointsPerEFold must be ≥ 10 (got ${perEFold})`);

  const h = 1 / perEFold;
  // Grid nodes f_k = fLow e^{k h}, grown on demand; weight w_k = f^{−7/3}/S(f) · f (measure d ln f).
  let nGrid = 0;
  let lnF = new Float64Array(0);
  let wGrid = new Float64Array(0);
  const weightAt = (f: number): number => {
    const s = psd.evaluate(f);
    return s > 0 && Number.isFinite(s) ? Math.pow(f, -4 / 3) / s : 0;
  };
  const ensureGrid = (fTop: number): void => {
    const need = Math.ceil(Math.log(fTop / fMinHz) / h) + 2;
    if (need <= nGrid) return;
    const n = Math.max(need, Math.ceil(nGrid * 1.5));
    const ln = new Float64Array(n);
    const w = new Float64Array(n);
    ln.set(lnF);
    w.set(wGrid);
    for (let k = nGrid; k < n; k++) {
      ln[k] = Math.log(fMinHz) + k * h;
      w[k] = weightAt(Math.exp(ln[k]));
    }
    lnF = ln;
    wGrid = w;
    nGrid = n;
  };
  // Scratch for one evaluation.
  let cap = 0;
  let wq = new Float64Array(0); // quadrature weight × moment weight
  let p0 = new Float64Array(0);
  let p1 = new Float64Array(0);
  let ft = new Float64Array(0);
  const ensureScratch = (n: number): void => {
    if (n <= cap) return;
    cap = n;
    wq = new Float64Array(n);
    p0 = new Float64Array(n);
    p1 = new Float64Array(n);
    ft = new Float64Array(n);
  };
  let lastN = 0;
  const a = new Float64Array(8);
  const b = new Float64Array(8);
  const ap = new Float64Array(8);
  const bp = new Float64Array(8);
  const am = new Float64Array(8);
  const bm = new Float64Array(8);

  const upperCutoffHz = (tau0: number, tau3: number): number => {
    const { totalMassSolar } = massEtaFromChirpTimes(tau0, tau3, fMinHz);
    return Math.min(iscoFrequencyHz(totalMassSolar), fMaxHz);
  };

  const sample = (tau0: number, tau3: number): MetricSample => {
    const { totalMassSolar, eta } = massEtaFromChirpTimes(tau0, tau3, fMinHz);
    const fIsco = iscoFrequencyHz(totalMassSolar);
    const fUp = Math.min(fIsco, fMaxHz);
    if (!(fUp > fMinHz)) {
      throw new InputError(`metric: upper cutoff ${fUp.toFixed(1)} Hz (ISCO of ${totalMassSolar.toFixed(2)} M_sun) is not above the low-frequency cutoff ${fMinHz} Hz`);
    }
    ensureGrid(fUp);
    const lnUp = Math.log(fUp);
    // Nodes 0..j lie below the cutoff; node j+1 is replaced by the cutoff itself. A band narrower
    // than MIN_BAND_NODES steps of the shared grid gets its own uniform grid of that many steps
    // instead: with a handful of nodes the variances left after projecting out time and phase are
    // all rounding (and the metric indefinite).
    const narrow = lnUp - lnF[0] < MIN_BAND_NODES * h;
    const hBand = narrow ? (lnUp - lnF[0]) / MIN_BAND_NODES : h;
    let j = narrow ? MIN_BAND_NODES : Math.floor((lnUp - lnF[0]) / h);
    if (!narrow && j >= nGrid - 1) j = nGrid - 2;
    const lastStep = narrow ? 0 : lnUp - lnF[j];
    const n = lastStep > 1e-12 ? j + 2 : j + 1;
    ensureScratch(n);
    lastN = n;
    taylorF2PhaseCoefficientsInto(eta, pnOrder, a, b);
    const de = 1e-6;
    taylorF2PhaseCoefficientsInto(eta + de, pnOrder, ap, bp);
    taylorF2PhaseCoefficientsInto(eta - de, pnOrder, am, bm);
    for (let k = 0; k < 8; k++) {
      ap[k] = (ap[k] - am[k]) / (2 * de);
      bp[k] = (bp[k] - bm[k]) / (2 * de);
    }
    const mSec = totalMassSolar * T_SUN;
    const pref = 3 / (128 * eta);
    const dlnM0 = -1 / tau0;
    const dlnM3 = 1 / tau3;
    const deta0 = (2 * eta) / (3 * tau0);
    const deta3 = (-5 * eta) / (3 * tau3);
    for (let q = 0; q < n; q++) {
      let lf: number;
      let wTrap: number;
      let wf: number;
      if (narrow) {
        lf = q === j ? lnUp : lnF[0] + q * hBand;
        wf = weightAt(Math.exp(lf));
        wTrap = q === 0 || q === j ? hBand / 2 : hBand;
      } else if (q <= j) {
        lf = lnF[q];
        wf = wGrid[q];
        // Trapezoid weights on nodes 0..j (uniform h) plus the last, shorter interval.
        if (n === j + 1) wTrap = q === 0 || q === j ? h / 2 : h;
        else wTrap = q === 0 ? h / 2 : q < j ? h : (h + lastStep) / 2;
      } else {
        lf = lnUp;
        wf = weightAt(fUp);
        wTrap = lastStep / 2;
      }
      const f = Math.exp(lf);
      const v = Math.cbrt(Math.PI * mSec * f);
      const lnv = Math.log(v);
      // Σ over k of the series and its derivatives, with v^{k−5}.
      let vk = 1 / (v * v * v * v * v);
      let psi = 0;
      let dLnM = 0;
      let dEtaSeries = 0;
      for (let k = 0; k < 8; k++) {
        const term = a[k] + b[k] * lnv;
        psi += term * vk;
        dLnM += (((k - 5) / 3) * term + b[k] / 3) * vk;
        dEtaSeries += (ap[k] + bp[k] * lnv) * vk;
        vk *= v;
      }
      psi *= pref;
      dLnM *= pref;
      const dEta = -psi / eta + pref * dEtaSeries;
      p0[q] = dlnM0 * dLnM + deta0 * dEta;
      p1[q] = dlnM3 * dLnM + deta3 * dEta;
      ft[q] = 2 * Math.PI * f;
      wq[q] = wTrap * wf;
    }
    // Weighted means, then centred second moments (covariances) of (2πf, ψ0, ψ3).
    let sw = 0;
    let mt = 0;
    let m0 = 0;
    let m1 = 0;
    for (let q = 0; q < n; q++) {
      const w = wq[q];
      sw += w;
      mt += w * ft[q];
      m0 += w * p0[q];
      m1 += w * p1[q];
    }
    mt /= sw;
    m0 /= sw;
    m1 /= sw;
    let ctt = 0;
    let ct0 = 0;
    let ct1 = 0;
    let c00 = 0;
    let c01 = 0;
    let c11 = 0;
    for (let q = 0; q < n; q++) {
      const w = wq[q];
      const dt = ft[q] - mt;
      const d0 = p0[q] - m0;
      const d1 = p1[q] - m1;
      ctt += w * dt * dt;
      ct0 += w * dt * d0;
      ct1 += w * dt * d1;
      c00 += w * d0 * d0;
      c01 += w * d0 * d1;
      c11 += w * d1 * d1;
    }
    const s = 0.5 / sw;
    return {
      g: {
        g00: s * (c00 - (ct0 * ct0) / ctt),
        g01: s * (c01 - (ct0 * ct1) / ctt),
        g11: s * (c11 - (ct1 * ct1) / ctt),
      },
      cutoffHz: fUp,
      cutoffSensitivity: fIsco <= fMaxHz ? weightAt(fUp) / sw : 0,
    };
  };
  const at = (tau0: number, tau3: number): Metric2 => sample(tau0, tau3).g;

  const tangent = (tau0: number, tau3: number): TangentMatch => {
    const smp = sample(tau0, tau3);
    const n = lastN;
    let sw = 0;
    for (let q = 0; q < n; q++) sw += wq[q];
    const w = new Float64Array(n);
    for (let q = 0; q < n; q++) w[q] = wq[q] / sw;
    return createTangentMatch(smp, w, p0.slice(0, n), p1.slice(0, n), ft.slice(0, n));
  };

  return { fMinHz, fMaxHz, upperCutoffHz, at, sample, tangent };
}

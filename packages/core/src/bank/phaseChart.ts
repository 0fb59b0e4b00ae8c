// Nearly flat coordinates (x0, x1) on the (τ0, τ3) plane, from the principal components of the
// TaylorF2 phase coefficients; the lattice is laid in them.
import type { PsdModel } from "../noise/psdModel.js";
import { T_SUN } from "../physics/constants.js";
import { taylorF2PhaseCoefficientsInto } from "../waveform/pnCoefficients.js";
import { iscoFrequencyHz, massEtaFromChirpTimes } from "./chirpTimeCoordinates.js";
import type { MassRegion } from "./massRegion.js";
import { totalMassFromTau0Eta } from "./massRegion.js";
import type { Metric2 } from "./metric.js";

/** Number of phase basis functions: f^{−5/3}, f^{−1}, f^{−2/3}, f^{−1/3}, f^{1/3}, f^{2/3}, ln f, f^{1/3} ln f. */
const N_BASIS = 8;

/** A map from chirp times to chart coordinates and back. Not thread-safe (scratch arrays). */
export interface PhaseChart {
  /** Chart coordinates of (τ0, τ3); each unit is about one unit of metric distance (√mismatch). */
  toX(tau0: number, tau3: number): [number, number];
  /** ∂(x0, x1)/∂(τ0, τ3) as [[∂x0/∂τ0, ∂x0/∂τ3], [∂x1/∂τ0, ∂x1/∂τ3]]. */
  jacobian(tau0: number, tau3: number): [[number, number], [number, number]];
  /** (τ0, τ3) with toX = (x0, x1), by Newton's method from the guess; null if it does not converge. */
  toTau(x0: number, x1: number, guessTau0: number, guessTau3: number): [number, number] | null;
  /** A metric given in (τ0, τ3) at that point, expressed in chart coordinates: J⁻ᵀ g J⁻¹. */
  pullBack(g: Metric2, tau0: number, tau3: number): Metric2;
}

export interface PhaseChartOptions {
  psd: PsdModel;
  fMinHz: number;
  fMaxHz?: number;
  region: MassRegion;
  pnOrder?: number;
}

/**
 * Builds the chart. The TaylorF2 phase is linear in its coefficients:
 *   Ψ(f) = Σ_j c_j(M, η) φ_j(f) (+ terms in 1 and f, which the match removes by maximising over φ_c and
 *   t_c), with φ_j the eight functions above and c_j from the 3.5PN coefficients (waveform/pnCoefficients.ts;
 *   Blanchet, Living Rev. Relativ. 17, 2 (2014)),
 * so in the approximation 1 − match ≈ ½ Var_J(ΔΨ) (the metric's, Owen 1996) the mismatch of two
 * templates is the squared distance Δcᵀ Γ Δc with Γ_jl = ½ J[(Pφ_j)(Pφ_l)], P the projection
 * orthogonal to {1, f} under the moment functional J of metric.ts (weights f^{−7/3}/S_n on [fLow, f_ref]).
 * The templates form a nearly flat two-dimensional surface in that space; its two principal components
 * over the region (PCA of Γ^{1/2} c over a grid of samples) are the chart coordinates. Principal
 * components of the PN coefficients as nearly flat bank coordinates: Brown, Harry, Lundgren & Nitz,
 * Phys. Rev. D 86, 084017 (2012) (from memory). f_ref, the upper end of the chart's weights, is the
 * geometric mean of the ISCO frequencies of the lightest and heaviest binaries (or fHigh if lower);
 * the chart only has to be nearly flat — the true metric (metric.ts, with each point's own cutoff) is
 * pulled back into it for placement.
 */
export function createPhaseChart(options: PhaseChartOptions): PhaseChart {
  const { psd, fMinHz, region } = options;
  const pnOrder = options.pnOrder ?? 7;
  const fRef = Math.min(
    options.fMaxHz ?? Infinity,
    Math.sqrt(iscoFrequencyHz(region.equalMassTotalMin) * iscoFrequencyHz(region.equalMassTotalMax)),
  );
  // Weighted, projected basis on a log grid (trapezoid in ln f).
  const nF = 800;
  const lnLo = Math.log(fMinHz);
  const h = (Math.log(fRef) - lnLo) / (nF - 1);
  const f = new Float64Array(nF);
  const w = new Float64Array(nF);
  let sw = 0;
  for (let q = 0; q < nF; q++) {
    f[q] = Math.exp(lnLo + q * h);
    const s = psd.evaluate(f[q]);
    w[q] = (q === 0 || q === nF - 1 ? 0.5 : 1) * (s > 0 && Number.isFinite(s) ? Math.pow(f[q], -4 / 3) / s : 0);
    sw += w[q];
  }
  for (let q = 0; q < nF; q++) w[q] /= sw;
  const phi: Float64Array[] = [];
  for (let j = 0; j < N_BASIS; j++) {
    const v = new Float64Array(nF);
    for (let q = 0; q < nF; q++) v[q] = basis(j, f[q]);
    phi.push(projectOut(v, f, w));
  }
  const gamma: number[][] = [];
  for (let j = 0; j < N_BASIS; j++) {
    gamma.push([]);
    for (let l = 0; l < N_BASIS; l++) {
      let s = 0;
      for (let q = 0; q < nF; q++) s += w[q] * phi[j][q] * phi[l][q];
      gamma[j].push(0.5 * s);
    }
  }
  // Γ^{1/2} from its eigen-decomposition (tiny or negative rounding eigenvalues clipped to 0).
  const ge = symmetricEigen(gamma);
  const sqrtG: number[][] = gamma.map(() => new Array(N_BASIS).fill(0));
  for (let k = 0; k < N_BASIS; k++) {
    const mu = Math.sqrt(Math.max(0, ge.values[k]));
    for (let i = 0; i < N_BASIS; i++) for (let j = 0; j < N_BASIS; j++) sqrtG[i][j] += ge.vectors[i][k] * mu * ge.vectors[j][k];
  }
  // Samples over the region in (τ0, η).
  const a = new Float64Array(8);
  const b = new Float64Array(8);
  const coefficients = (mSolar: number, eta: number, out: Float64Array): void => {
    taylorF2PhaseCoefficientsInto(eta, pnOrder, a, b);
    const pm = Math.PI * mSolar * T_SUN;
    const lpm = Math.log(pm);
    const pre = 3 / (128 * eta);
    const cbrt = Math.cbrt(pm);
    const p = 1 / (pm * cbrt * cbrt); // (πM)^{−5/3}
    // k = 0, 2, 3, 4, 6, 7 powers: pre (πM)^{(k−5)/3} (a_k + (b_k/3) ln πM)
    out[0] = pre * p * (a[0] + (b[0] / 3) * lpm);
    const p2 = p * cbrt * cbrt;
    out[1] = pre * p2 * (a[2] + (b[2] / 3) * lpm);
    const p3 = p2 * cbrt;
    out[2] = pre * p3 * (a[3] + (b[3] / 3) * lpm);
    const p4 = p3 * cbrt;
    out[3] = pre * p4 * (a[4] + (b[4] / 3) * lpm);
    const p6 = p4 * cbrt * cbrt;
    out[4] = pre * p6 * (a[6] + (b[6] / 3) * lpm);
    const p7 = p6 * cbrt;
    out[5] = pre * p7 * (a[7] + (b[7] / 3) * lpm);
    // log terms: k = 5 (f^0 ln f) and k = 6 (f^{1/3} ln f)
    out[6] = (pre * b[5]) / 3;
    out[7] = (pre * p6 * b[6]) / 3;
  };
  const samples: Float64Array[] = [];
  const nT = 25;
  const nE = 9;
  for (let i = 0; i < nT; i++) {
    const t0 = region.tau0Min + ((region.tau0Max - region.tau0Min) * (i + 0.5)) / nT;
    const lo = region.etaLow(t0);
    if (!(lo <= 0.25)) continue;
    for (let j = 0; j < nE; j++) {
      const eta = lo + ((0.25 - lo) * j) / (nE - 1);
      const v = new Float64Array(N_BASIS);
      coefficients(totalMassFromTau0Eta(t0, eta, fMinHz), eta, v);
      samples.push(v);
    }
  }
  const mean = new Float64Array(N_BASIS);
  for (const s of samples) for (let k = 0; k < N_BASIS; k++) mean[k] += s[k] / samples.length;
  // Covariance of Γ^{1/2} (c − c̄).
  const cov: number[][] = gamma.map(() => new Array(N_BASIS).fill(0));
  const y = new Float64Array(N_BASIS);
  for (const s of samples) {
    for (let i = 0; i < N_BASIS; i++) {
      let t = 0;
      for (let j = 0; j < N_BASIS; j++) t += sqrtG[i][j] * (s[j] - mean[j]);
      y[i] = t;
    }
    for (let i = 0; i < N_BASIS; i++) for (let j = 0; j < N_BASIS; j++) cov[i][j] += (y[i] * y[j]) / samples.length;
  }
  const pe = symmetricEigen(cov);
  // β_k = Γ^{1/2} w_k for the two largest components; x_k = β_k · (c − c̄).
  const beta: Float64Array[] = [0, 1].map((k) => {
    const out = new Float64Array(N_BASIS);
    for (let i = 0; i < N_BASIS; i++) {
      let t = 0;
      for (let j = 0; j < N_BASIS; j++) t += sqrtG[i][j] * pe.vectors[j][k];
      out[i] = t;
    }
    return out;
  });
  const cx = new Float64Array(N_BASIS);
  const rawX = (tau0: number, tau3: number): [number, number] => {
    const { totalMassSolar, eta } = massEtaFromChirpTimes(tau0, tau3, fMinHz);
    coefficients(totalMassSolar, eta, cx);
    let x0 = 0;
    let x1 = 0;
    for (let i = 0; i < N_BASIS; i++) {
      const d = cx[i] - mean[i];
      x0 += beta[0][i] * d;
      x1 += beta[1][i] * d;
    }
    return [x0, x1];
  };
  // Orientation (deterministic): x0 grows with τ0, x1 grows with τ3.
  const t0c = 0.5 * (region.tau0Min + region.tau0Max);
  const t3c = region.tau3At(t0c, Math.min(0.25, 0.5 * (region.etaLow(t0c) + 0.25)));
  const j0 = jacobianOf(rawX, t0c, t3c);
  const s0 = j0[0][0] >= 0 ? 1 : -1;
  const s1 = j0[1][1] >= 0 ? 1 : -1;
  const toX = (tau0: number, tau3: number): [number, number] => {
    const [x0, x1] = rawX(tau0, tau3);
    return [s0 * x0, s1 * x1];
  };
  const jacobian = (tau0: number, tau3: number): [[number, number], [number, number]] => jacobianOf(toX, tau0, tau3);
  const toTau = (x0: number, x1: number, guess0: number, guess3: number): [number, number] | null => {
    let t0 = guess0;
    let t3 = guess3;
    for (let it = 0; it < 40; it++) {
      const [y0, y1] = toX(t0, t3);
      const r0 = x0 - y0;
      const r1 = x1 - y1;
      const J = jacobian(t0, t3);
      const det = J[0][0] * J[1][1] - J[0][1] * J[1][0];
      let d0 = (J[1][1] * r0 - J[0][1] * r1) / det;
      let d3 = (-J[1][0] * r0 + J[0][0] * r1) / det;
      // Keep the chirp times positive: shorten steps that would cross zero.
      let scale = 1;
      if (t0 + d0 <= 0.2 * t0) scale = Math.min(scale, (0.8 * t0) / Math.abs(d0));
      if (t3 + d3 <= 0.2 * t3) scale = Math.min(scale, (0.8 * t3) / Math.abs(d3));
      d0 *= scale;
      d3 *= scale;
      t0 += d0;
      t3 += d3;
      if (!(Number.isFinite(t0) && Number.isFinite(t3))) return null;
      if (Math.abs(d0) <= 1e-13 * t0 && Math.abs(d3) <= 1e-13 * t3) return [t0, t3];
      if (Math.hypot(r0, r1) < 1e-10 && it > 0) return [t0, t3];
    }
    const [y0, y1] = toX(t0, t3);
    return Math.hypot(x0 - y0, x1 - y1) < 1e-6 ? [t0, t3] : null;
  };
  const pullBack = (g: Metric2, tau0: number, tau3: number): Metric2 => {
    const J = jacobian(tau0, tau3);
    const det = J[0][0] * J[1][1] - J[0][1] * J[1][0];
    // K = J⁻¹ = ∂τ/∂x
    const k00 = J[1][1] / det;
    const k01 = -J[0][1] / det;
    const k10 = -J[1][0] / det;
    const k11 = J[0][0] / det;
    const quad = (pa0: number, pa3: number, pb0: number, pb3: number): number =>
      g.g00 * pa0 * pb0 + g.g01 * (pa0 * pb3 + pa3 * pb0) + g.g11 * pa3 * pb3;
    // Columns of K: ∂τ/∂x0 = (k00, k10), ∂τ/∂x1 = (k01, k11).
    return { g00: quad(k00, k10, k00, k10), g01: quad(k00, k10, k01, k11), g11: quad(k01, k11, k01, k11) };
  };
  return { toX, jacobian, toTau, pullBack };
}

function basis(j: number, f: number): number {
  switch (j) {
    case 0:
      return Math.pow(f, -5 / 3);
    case 1:
      return 1 / f;
    case 2:
      return Math.pow(f, -2 / 3);
    case 3:
      return Math.pow(f, -1 / 3);
    case 4:
      return Math.cbrt(f);
    case 5:
      return Math.pow(f, 2 / 3);
    case 6:
      return Math.log(f);
    default:
      return Math.cbrt(f) * Math.log(f);
  }
}

/** v minus its weighted least-squares fit by α + β f (the part the t_c, φ_c maximisation removes). */
function projectOut(v: Float64Array, f: Float64Array, w: Float64Array): Float64Array {
  let s1 = 0;
  let sf = 0;
  let sff = 0;
  let sv = 0;
  let sfv = 0;
  for (let q = 0; q < v.length; q++) {
    s1 += w[q];
    sf += w[q] * f[q];
    sff += w[q] * f[q] * f[q];
    sv += w[q] * v[q];
    sfv += w[q] * f[q] * v[q];
  }
  const det = s1 * sff - sf * sf;
  const alpha = (sv * sff - sf * sfv) / det;
  const beta = (s1 * sfv - sf * sv) / det;
  const out = new Float64Array(v.length);
  for (let q = 0; q < v.length; q++) out[q] = v[q] - alpha - beta * f[q];
  return out;
}

function jacobianOf(map: (t0: number, t3: number) => [number, number], t0: number, t3: number): [[number, number], [number, number]] {
  const h0 = 1e-6 * t0;
  const h3 = 1e-6 * t3;
  const a = map(t0 + h0, t3);
  const b = map(t0 - h0, t3);
  const c = map(t0, t3 + h3);
  const d = map(t0, t3 - h3);
  return [
    [(a[0] - b[0]) / (2 * h0), (c[0] - d[0]) / (2 * h3)],
    [(a[1] - b[1]) / (2 * h0), (c[1] - d[1]) / (2 * h3)],
  ];
}

/** Eigen-decomposition of a small symmetric matrix by cyclic Jacobi rotations; values sorted descending. */
export function symmetricEigen(matrix: number[][]): { values: number[]; vectors: number[][] } {
  const n = matrix.length;
  const A = matrix.map((r) => r.slice());
  const V: number[][] = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? 1 : 0)));
  for (let sweep = 0; sweep < 100; sweep++) {
    let off = 0;
    for (let p = 0; p < n; p++) for (let q = p + 1; q < n; q++) off += A[p][q] * A[p][q];
    if (off === 0) break;
    for (let p = 0; p < n; p++) {
      for (let q = p + 1; q < n; q++) {
        if (A[p][q] === 0) continue;
        const theta = 0.5 * Math.atan2(2 * A[p][q], A[q][q] - A[p][p]);
        const cs = Math.cos(theta);
        const sn = Math.sin(theta);
        for (let k = 0; k < n; k++) {
          const akp = A[k][p];
          const akq = A[k][q];
          A[k][p] = cs * akp - sn * akq;
          A[k][q] = sn * akp + cs * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = A[p][k];
          const aqk = A[q][k];
          A[p][k] = cs * apk - sn * aqk;
          A[q][k] = sn * apk + cs * aqk;
        }
        for (let k = 0; k < n; k++) {
          const vkp = V[k][p];
          const vkq = V[k][q];
          V[k][p] = cs * vkp - sn * vkq;
          V[k][q] = sn * vkp + cs * vkq;
        }
      }
    }
  }
  const order = A.map((r, i) => [r[i], i] as [number, number]).sort((x, y) => y[0] - x[0]);
  return {
    values: order.map(([v]) => v),
    vectors: V.map((row) => order.map(([, i]) => row[i])),
  };
}

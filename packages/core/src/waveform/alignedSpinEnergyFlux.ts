// Aligned-spin terms of the orbital energy and GW flux of circular orbits, and the TaylorT4
// coefficients they give by energy balance. Spins χ1, χ2 ∈ (−1, 1) along the orbital angular momentum.
import { spinSpinSigma } from "./alignedSpinPhase.js";

/** Spin-orbit parts of the energy and flux series, indexed by the power k of v (zero elsewhere). */
export interface SpinOrbitEnergyFlux {
  /** e_k in E = −(μ v²/2) [1 + Σ e_k v^k]: k = 3, 5, 7. */
  readonly energy: Float64Array;
  /** f_k in F = (32/5) η² v¹⁰ [1 + Σ f_k v^k]: k = 3, 5, 6, 7. */
  readonly flux: Float64Array;
}

/**
 * Spin-orbit terms of the energy and flux of a circular orbit, with S = Σᵢ (mᵢ/M)² χᵢ and
 * δΣ = δ (m2 χ2 − m1 χ1)/M (S_ℓ and Σ_ℓ in units of G M², δ = (m1 − m2)/M):
 *   e3 = (14/3) S + 2 δΣ,  e5 = (11 − 61η/9) S + (3 − 10η/3) δΣ,
 *   e7 = (135/4 − 367η/4 + 29η²/12) S + (27/4 − 39η + 5η²/4) δΣ;
 *   f3 = −4 S − (5/4) δΣ,  f5 = (−9/2 + 272η/9) S + (−13/16 + 43η/4) δΣ,  f6 = −16π S − (31π/6) δΣ,
 *   f7 = (476645/6804 + 6172η/189 − 2810η²/27) S + (9535/336 + 1849η/126 − 1501η²/36) δΣ.
 * Source: Blanchet, Living Rev. Relativ. 17, 2 (2014), spin-orbit energy and flux of circular orbits
 * (from Bohé, Marsat, Faye & Blanchet, Class. Quantum Grav. 30, 075017 (2013) and Bohé, Marsat &
 * Blanchet, Class. Quantum Grav. 30, 135009 (2013)).
 */
export function spinOrbitEnergyFlux(m1Solar: number, m2Solar: number, chi1: number, chi2: number): SpinOrbitEnergyFlux {
  const m = m1Solar + m2Solar;
  const x1 = m1Solar / m;
  const x2 = m2Solar / m;
  const eta = x1 * x2;
  const e2 = eta * eta;
  const s = x1 * x1 * chi1 + x2 * x2 * chi2;
  const ds = (x1 - x2) * (x2 * chi2 - x1 * chi1);
  const energy = new Float64Array(8);
  const flux = new Float64Array(8);
  energy[3] = (14 / 3) * s + 2 * ds;
  energy[5] = (11 - (61 / 9) * eta) * s + (3 - (10 / 3) * eta) * ds;
  energy[7] = (135 / 4 - (367 / 4) * eta + (29 / 12) * e2) * s + (27 / 4 - 39 * eta + (5 / 4) * e2) * ds;
  flux[3] = -4 * s - (5 / 4) * ds;
  flux[5] = (-9 / 2 + (272 / 9) * eta) * s + (-13 / 16 + (43 / 4) * eta) * ds;
  flux[6] = -16 * Math.PI * s - ((31 * Math.PI) / 6) * ds;
  flux[7] = (476645 / 6804 + (6172 / 189) * eta - (2810 / 27) * e2) * s + (9535 / 336 + (1849 / 126) * eta - (1501 / 36) * e2) * ds;
  return { energy, flux };
}

/** c = a·b truncated at v⁷ (series of length 8). */
function multiply(a: Float64Array, b: Float64Array): Float64Array {
  const c = new Float64Array(8);
  for (let i = 0; i < 8; i++) for (let j = 0; i + j < 8; j++) c[i + j] += a[i] * b[j];
  return c;
}

/** 1/a truncated at v⁷ (a[0] = 1). */
function reciprocal(a: Float64Array): Float64Array {
  const c = new Float64Array(8);
  c[0] = 1;
  for (let k = 1; k < 8; k++) {
    let s = 0;
    for (let j = 1; j <= k; j++) s += a[j] * c[k - j];
    c[k] = -s;
  }
  return c;
}

/**
 * Spin corrections δa_k (k = 0..7) to the TaylorT4 series dv/dt = (32η/5M) v⁹ Σ a_k v^k, where
 * Σ a_k v^k = F̂ / Ê′ is the energy-balance quotient re-expanded (Ê′ = Σ (k+2)/2 e_k v^k, F̂ = Σ f_k v^k):
 * the part linear in the spin-orbit terms of {@link spinOrbitEnergyFlux},
 *   δ(F̂/Ê′) = (δF̂ − (F̂₀/Ê′₀) δÊ′) / Ê′₀,
 * with the non-spinning 2PN e2 = −(3/4 + η/12), e4 = −(27/8 − 19η/8 + η²/24), f2 = −(1247/336 + 35η/12),
 * f3 = 4π, f4 = −44711/9072 + 9271η/504 + 65η²/18 (Blanchet, Living Rev. Relativ. 17, 2 (2014)), which
 * is all a v³-leading correction needs through v⁷; plus the 2PN spin-spin term δa4 = σ, since at 2PN
 * only the combination 3e4 − f4 = −σ of the energy and flux spin-spin terms enters the quotient
 * (σ of {@link spinSpinSigma}: Kidder, Will & Wiseman, Phys. Rev. D 47, R4183 (1993); Poisson,
 * Phys. Rev. D 57, 5287 (1998)). Products of spin terms (spin-squared beyond 2PN) are left out, as in
 * the TaylorF2 phase, so both approximants carry the same spin physics.
 */
export function taylorT4SpinCorrections(m1Solar: number, m2Solar: number, chi1: number, chi2: number): Float64Array {
  const m = m1Solar + m2Solar;
  const eta = (m1Solar * m2Solar) / (m * m);
  const { energy, flux } = spinOrbitEnergyFlux(m1Solar, m2Solar, chi1, chi2);
  const n0 = new Float64Array(8);
  const d0 = new Float64Array(8);
  n0[0] = 1;
  n0[2] = 2 * -(3 / 4 + eta / 12);
  n0[4] = 3 * -(27 / 8 - (19 / 8) * eta + (eta * eta) / 24);
  d0[0] = 1;
  d0[2] = -(1247 / 336 + (35 / 12) * eta);
  d0[3] = 4 * Math.PI;
  d0[4] = -44711 / 9072 + (9271 / 504) * eta + (65 / 18) * eta * eta;
  const dn = new Float64Array(8);
  for (let k = 0; k < 8; k++) dn[k] = ((k + 2) / 2) * energy[k];
  const invN0 = reciprocal(n0);
  const q0 = multiply(d0, invN0);
  const q0dn = multiply(q0, dn);
  const numerator = new Float64Array(8);
  for (let k = 0; k < 8; k++) numerator[k] = flux[k] - q0dn[k];
  const out = multiply(numerator, invN0);
  out[4] += spinSpinSigma(m1Solar, m2Solar, chi1, chi2);
  return out;
}

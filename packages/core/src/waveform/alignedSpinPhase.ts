// Aligned-spin terms of the TaylorF2 phase: component spins χ1, χ2 ∈ (−1, 1) along the orbital
// angular momentum, added to the non-spinning series of pnCoefficients.ts. With δ = (m1 − m2)/M,
// η = m1 m2 / M², χs = (χ1 + χ2)/2 and χa = (χ1 − χ2)/2, in Ψ = 3/(128 η v⁵) Σ (a_k + b_k ln v) v^k.
import { InputError } from "../errors.js";
import { V_LSO } from "./pnCoefficients.js";

/** Quadrupole parameter κ of a Kerr black hole (Q = −κ χ² m³): κ = 1 (Poisson, Phys. Rev. D 57, 5287 (1998)). */
export const BLACK_HOLE_QUADRUPOLE = 1;

/** Throws InputError unless both aligned spins are finite numbers in (−1, 1). */
export function requireAlignedSpins(where: string, chi1: number, chi2: number): void {
  for (const [name, value] of [["chi1", chi1], ["chi2", chi2]] as const) {
    if (typeof value !== "number" || !Number.isFinite(value) || !(Math.abs(value) < 1)) {
      throw new InputError(`${where}: ${name} must be a dimensionless aligned spin in (−1, 1) (got ${String(value)})`);
    }
  }
}

/**
 * 1.5PN spin-orbit parameter β = (1/12) Σᵢ χᵢ (113 mᵢ²/M² + 75 η), spins along the orbital angular
 * momentum; it enters the TaylorF2 phase as −(16π − 4β) v³.
 * Source: Kidder, Will & Wiseman, Phys. Rev. D 47, R4183 (1993); Poisson & Will, Phys. Rev. D 52, 848 (1995).
 */
export function spinOrbitBeta(m1Solar: number, m2Solar: number, chi1: number, chi2: number): number {
  const m = m1Solar + m2Solar;
  const x1 = m1Solar / m;
  const x2 = m2Solar / m;
  const eta = x1 * x2;
  return (chi1 * (113 * x1 * x1 + 75 * eta) + chi2 * (113 * x2 * x2 + 75 * eta)) / 12;
}

/**
 * 2PN spin-spin parameter σ of aligned spins (it enters the TaylorF2 phase as −10σ v⁴):
 *   σ = η (721/48 − 247/48) χ1χ2 + Σᵢ (mᵢ/M)² χᵢ² [(720κᵢ − 1) − (240κᵢ − 7)] / 96,
 * the interaction term of Kidder, Will & Wiseman, Phys. Rev. D 47, R4183 (1993) and Poisson & Will,
 * Phys. Rev. D 52, 848 (1995), with the self-spin terms: quadrupole–monopole (κ) of Poisson,
 * Phys. Rev. D 57, 5287 (1998) and spin-squared of Mikóczi, Vasúth & Gergely, Phys. Rev. D 71,
 * 124043 (2005); κ = 1 for black holes ({@link BLACK_HOLE_QUADRUPOLE}), so σ = (79/8) η χ1χ2 + (81/16) Σᵢ (mᵢ/M)² χᵢ².
 */
export function spinSpinSigma(m1Solar: number, m2Solar: number, chi1: number, chi2: number, kappa = BLACK_HOLE_QUADRUPOLE): number {
  const m = m1Solar + m2Solar;
  const x1 = m1Solar / m;
  const x2 = m2Solar / m;
  const self = (480 * kappa + 6) / 96;
  return x1 * x2 * (474 / 48) * chi1 * chi2 + self * (x1 * x1 * chi1 * chi1 + x2 * x2 * chi2 * chi2);
}

/**
 * Adds the aligned-spin terms through 3.5PN to the TaylorF2 phase coefficients `a`, `b` (length ≥ 8)
 * of {@link taylorF2PhaseCoefficientsInto}, keeping terms with k ≤ pnOrder. With X1 = m1/M:
 *   k = 3 (1.5PN spin-orbit): +4β = (113/3) δ χa + (113/3 − 76η/3) χs (see {@link spinOrbitBeta});
 *   k = 4 (2PN spin-spin, black holes): −10σ (see {@link spinSpinSigma});
 *   k = 5 (2.5PN spin-orbit): −γ (1 + 3 ln(v/v_lso)), γ = (732985/2268 − 24260η/81 − 340η²/9) χs
 *     + (732985/2268 + 140η/9) δ χa (Arun, Buonanno, Faye & Ochsner, Phys. Rev. D 79, 104023 (2009));
 *   k = 6 (3PN spin-orbit tail): π [(2270/3) δ χa + (2270/3 − 520η) χs];
 *   k = 7 (3.5PN spin-orbit): (−25150083775/3048192 + 10566655595η/762048 − 1042165η²/3024 + 5345η³/36) χs
 *     + (−25150083775/3048192 + 26804935η/6048 − 1985η²/48) δ χa
 *     (k = 6, 7: Bohé, Marsat & Blanchet, Class. Quantum Grav. 30, 135009 (2013)).
 * Spin-spin terms beyond 2PN are not included. The 2.5PN log is referred to v_lso like the
 * non-spinning one, so its constant only shifts φ_c. No checks, no allocation.
 */
export function addAlignedSpinPhaseTermsInto(
  m1Solar: number,
  m2Solar: number,
  chi1: number,
  chi2: number,
  pnOrder: number,
  a: Float64Array,
  b: Float64Array,
): void {
  const m = m1Solar + m2Solar;
  const x1 = m1Solar / m;
  const x2 = m2Solar / m;
  const eta = x1 * x2;
  const e2 = eta * eta;
  const delta = x1 - x2;
  const chiS = 0.5 * (chi1 + chi2);
  const chiA = 0.5 * (chi1 - chi2);
  if (pnOrder >= 3) a[3] += (113 / 3) * delta * chiA + (113 / 3 - (76 / 3) * eta) * chiS;
  if (pnOrder >= 4) a[4] -= 10 * spinSpinSigma(m1Solar, m2Solar, chi1, chi2);
  if (pnOrder >= 5) {
    const gamma =
      (732985 / 2268 - (24260 / 81) * eta - (340 / 9) * e2) * chiS + (732985 / 2268 + (140 / 9) * eta) * delta * chiA;
    a[5] -= gamma * (1 - 3 * Math.log(V_LSO));
    b[5] -= 3 * gamma;
  }
  if (pnOrder >= 6) a[6] += Math.PI * ((2270 / 3) * delta * chiA + (2270 / 3 - 520 * eta) * chiS);
  if (pnOrder >= 7) {
    a[7] +=
      (-25150083775 / 3048192 + (10566655595 / 762048) * eta - (1042165 / 3024) * e2 + (5345 / 36) * e2 * eta) * chiS +
      (-25150083775 / 3048192 + (26804935 / 6048) * eta - (1985 / 48) * e2) * delta * chiA;
  }
}

// Mass and spin of the black hole left by the merger of two black holes with spins aligned with the
// orbital angular momentum, from published fits to numerical relativity.
import { InputError } from "../errors.js";

/** The remnant of a binary black-hole merger, in units of the binary's total mass M = m1 + m2. */
export interface Remnant {
  /** Final mass M_f / M. */
  readonly massFraction: number;
  /** Final dimensionless spin a_f = c J_f / (G M_f²), along the orbital angular momentum. */
  readonly spin: number;
}

function checkBinary(where: string, m1Solar: number, m2Solar: number, chi1: number, chi2: number): void {
  for (const [name, value] of [["m1Solar", m1Solar], ["m2Solar", m2Solar]] as const) {
    if (typeof value !== "number" || !Number.isFinite(value) || !(value > 0)) {
      throw new InputError(`${where}: ${name} must be a positive finite number (got ${String(value)})`);
    }
  }
  for (const [name, value] of [["chi1", chi1], ["chi2", chi2]] as const) {
    if (typeof value !== "number" || !Number.isFinite(value) || !(Math.abs(value) < 1)) {
      throw new InputError(`${where}: ${name} must be a dimensionless aligned spin in (−1, 1) (got ${String(value)})`);
    }
  }
}

/**
 * Radius (units of G M / c²) of the innermost stable circular orbit of a Kerr black hole of spin a
 * (a < 0 retrograde): Z1 = 1 + (1 − a²)^{1/3} [(1 + a)^{1/3} + (1 − a)^{1/3}], Z2 = √(3a² + Z1²),
 * r = 3 + Z2 ∓ √((3 − Z1)(3 + Z1 + 2 Z2)). Source: Bardeen, Press & Teukolsky, ApJ 178, 347 (1972).
 */
export function kerrIscoRadius(spin: number): number {
  if (typeof spin !== "number" || !(Math.abs(spin) <= 1)) {
    throw new InputError(`kerrIscoRadius: spin must be in [−1, 1] (got ${String(spin)})`);
  }
  const z1 = 1 + Math.cbrt(1 - spin * spin) * (Math.cbrt(1 + spin) + Math.cbrt(1 - spin));
  const z2 = Math.sqrt(3 * spin * spin + z1 * z1);
  return 3 + z2 - Math.sign(spin) * Math.sqrt((3 - z1) * (3 + z1 + 2 * z2));
}

/** Specific energy at the Kerr ISCO, E = √(1 − 2/(3 r_isco)) (Bardeen, Press & Teukolsky, ApJ 178, 347 (1972)). */
export function kerrIscoEnergy(spin: number): number {
  return Math.sqrt(1 - 2 / (3 * kerrIscoRadius(spin)));
}

/**
 * Final spin of an aligned-spin black-hole merger, with q = m2/m1 ≤ 1 (bodies ordered heavier first),
 * ν = η, ã = (χ1 + χ2 q²)/(1 + q²):
 *   a_f = ã + s4 ã² ν + s5 ã ν² + t0 ã ν + 2√3 ν + t2 ν² + t3 ν³,
 *   s4 = −0.1229, s5 = 0.4537, t0 = −2.8904, t2 = −3.5171, t3 = 2.5763.
 * Source: Rezzolla et al., Phys. Rev. D 78, 044002 (2008) (aligned-spin case of their fit).
 */
function finalSpin(q: number, nu: number, chiHeavy: number, chiLight: number): number {
  const at = (chiHeavy + chiLight * q * q) / (1 + q * q);
  return at + at * nu * (-0.1229 * at + 0.4537 * nu - 2.8904) + nu * (2 * Math.sqrt(3) - 3.5171 * nu + 2.5763 * nu * nu);
}

/**
 * Final mass fraction of an aligned-spin black-hole merger, with ã = (χ1 + χ2 q²)/(1 + q)²:
 *   M_f / M = 1 − [1 − E_isco(ã)] ν − 4ν² [4 p0 + 16 p1 ã (ã + 1) + E_isco(ã) − 1],  p0 = 0.04827, p1 = 0.01707,
 * E_isco the Kerr ISCO energy ({@link kerrIscoEnergy}). Source: Barausse, Morozova & Rezzolla,
 * Astrophys. J. 758, 63 (2012).
 */
function finalMassFraction(q: number, nu: number, chiHeavy: number, chiLight: number): number {
  const at = (chiHeavy + chiLight * q * q) / ((1 + q) * (1 + q));
  const eIsco = kerrIscoEnergy(at);
  return 1 - (1 - eIsco) * nu - 4 * nu * nu * (4 * 0.04827 + 16 * 0.01707 * at * (at + 1) + eIsco - 1);
}

/**
 * Mass (as a fraction of m1 + m2) and spin of the remnant black hole of two black holes of masses
 * m1Solar, m2Solar and aligned spins chi1, chi2 ∈ (−1, 1), from the numerical-relativity fits of
 * Barausse, Morozova & Rezzolla, ApJ 758, 63 (2012) (mass) and Rezzolla et al., Phys. Rev. D 78, 044002
 * (2008) (spin); equal masses without spin give M_f ≈ 0.952 M and a_f ≈ 0.686. The spin is kept
 * within ±0.998 (beyond the fits' range it would be extrapolation). The order of the bodies does not matter.
 */
export function remnantOfMerger(m1Solar: number, m2Solar: number, chi1 = 0, chi2 = 0): Remnant {
  checkBinary("remnantOfMerger", m1Solar, m2Solar, chi1, chi2);
  const heavyFirst = m1Solar >= m2Solar;
  const q = heavyFirst ? m2Solar / m1Solar : m1Solar / m2Solar;
  const chiHeavy = heavyFirst ? chi1 : chi2;
  const chiLight = heavyFirst ? chi2 : chi1;
  const nu = q / ((1 + q) * (1 + q));
  const spin = Math.max(-0.998, Math.min(0.998, finalSpin(q, nu, chiHeavy, chiLight)));
  return { massFraction: finalMassFraction(q, nu, chiHeavy, chiLight), spin };
}

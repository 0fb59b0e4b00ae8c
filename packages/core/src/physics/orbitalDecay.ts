// Orbital decay by GW emission: separation shrink rate, coalescence time, orbital-period derivative.
// SI: masses in kg, separation in m, times in s; the period derivative is dimensionless (s/s).
import { C, G } from "./constants.js";
import { requireEccentricity, requirePositive } from "./validate.js";

/**
 * Orbit-averaged shrink rate of a circular orbit: da/dt = −(64/5) G³ m1 m2 (m1 + m2) / (c⁵ a³), in m/s
 * (negative). Source: Peters, Phys. Rev. 136, B1224 (1964), Sect. V, the e = 0 case.
 */
export function separationDecayRate(m1: number, m2: number, separation: number): number {
  requirePositive("separationDecayRate", "m1 (kg)", m1);
  requirePositive("separationDecayRate", "m2 (kg)", m2);
  requirePositive("separationDecayRate", "separation (m)", separation);
  return (-(64 / 5) * G ** 3 * m1 * m2 * (m1 + m2)) / (C ** 5 * separation ** 3);
}

/**
 * Time for a circular binary at separation a to coalesce by GW emission alone (point masses, leading
 * order): t = (5/256) c⁵ a⁴ / (G³ m1 m2 (m1 + m2)), in s.
 * Source: Peters, Phys. Rev. 136, B1224 (1964), Sect. V (T = a⁴ / (4β), β = (64/5) G³ m1 m2 M / c⁵).
 */
export function timeToCoalescenceFromSeparation(m1: number, m2: number, separation: number): number {
  requirePositive("timeToCoalescenceFromSeparation", "m1 (kg)", m1);
  requirePositive("timeToCoalescenceFromSeparation", "m2 (kg)", m2);
  requirePositive("timeToCoalescenceFromSeparation", "separation (m)", separation);
  return ((5 / 256) * C ** 5 * separation ** 4) / (G ** 3 * m1 * m2 * (m1 + m2));
}

/**
 * Eccentricity enhancement of the GW power and of the period decay:
 * f(e) = (1 + (73/24) e² + (37/96) e⁴) / (1 − e²)^{7/2}, f(0) = 1.
 * Source: Peters & Mathews, Phys. Rev. 131, 435 (1963).
 */
export function eccentricityEnhancement(eccentricity: number): number {
  requireEccentricity("eccentricityEnhancement", "eccentricity", eccentricity);
  const e2 = eccentricity * eccentricity;
  return (1 + (73 / 24) * e2 + (37 / 96) * e2 * e2) / Math.pow(1 - e2, 3.5);
}

/**
 * Orbital-period derivative from GW emission (dimensionless, negative):
 * Ṗb = −(192π G^{5/3} / (5 c⁵)) (Pb / 2π)^{−5/3} f(e) m1 m2 (m1 + m2)^{−1/3}.
 * Source: Peters & Mathews, Phys. Rev. 131, 435 (1963) (power and f(e)); the form used for binary
 * pulsars in Taylor & Weisberg, ApJ 253, 908 (1982).
 */
export function orbitalPeriodDerivative(orbitalPeriod: number, m1: number, m2: number, eccentricity = 0): number {
  requirePositive("orbitalPeriodDerivative", "orbitalPeriod (s)", orbitalPeriod);
  requirePositive("orbitalPeriodDerivative", "m1 (kg)", m1);
  requirePositive("orbitalPeriodDerivative", "m2 (kg)", m2);
  requireEccentricity("orbitalPeriodDerivative", "eccentricity", eccentricity);
  const f = eccentricityEnhancement(eccentricity);
  return (
    ((-192 * Math.PI * Math.pow(G, 5 / 3)) / (5 * C ** 5)) *
    Math.pow(orbitalPeriod / (2 * Math.PI), -5 / 3) *
    f *
    m1 *
    m2 *
    Math.pow(m1 + m2, -1 / 3)
  );
}

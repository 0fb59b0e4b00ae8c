// Quadrupole GW luminosity of a circular binary.
// SI: masses in kg, separation in m, luminosity in W.
import { C, G } from "./constants.js";
import { requirePositive } from "./validate.js";

/**
 * GW luminosity of a circular binary (quadrupole formula, orbit-averaged):
 * L = (32/5) (G⁴/c⁵) (m1 m2)² (m1 + m2) / a⁵.
 * Source: Peters & Mathews, Phys. Rev. 131, 435 (1963), the e = 0 case of their power.
 */
export function gwLuminosityCircular(m1: number, m2: number, separation: number): number {
  requirePositive("gwLuminosityCircular", "m1 (kg)", m1);
  requirePositive("gwLuminosityCircular", "m2 (kg)", m2);
  requirePositive("gwLuminosityCircular", "separation (m)", separation);
  const mu2 = m1 * m2 * (m1 * m2);
  return ((32 / 5) * G ** 4 * mu2 * (m1 + m2)) / (C ** 5 * separation ** 5);
}

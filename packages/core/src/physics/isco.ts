// Innermost stable circular orbit (test-mass Schwarzschild value) of the total mass.
// SI: mass in kg, separation in m, frequency in Hz.
import { C, G } from "./constants.js";
import { requirePositive } from "./validate.js";

/**
 * ISCO radius r = 6 G M / c² (Schwarzschild, test-particle limit), m. Source: the Schwarzschild
 * innermost stable circular orbit (e.g. Bardeen, Press & Teukolsky, ApJ 178, 347 (1972), a = 0 case).
 */
export function iscoSeparation(totalMassValue: number): number {
  requirePositive("iscoSeparation", "totalMass (kg)", totalMassValue);
  return (6 * G * totalMassValue) / (C * C);
}

/**
 * GW frequency at the ISCO, f = c³ / (6^{3/2} π G M), Hz (twice the Kepler orbital frequency at
 * r = 6GM/c²); the customary cut of a Newtonian/PN inspiral. Source: as `iscoSeparation`; common practice.
 */
export function iscoGwFrequency(totalMassValue: number): number {
  requirePositive("iscoGwFrequency", "totalMass (kg)", totalMassValue);
  return (C * C * C) / (Math.pow(6, 1.5) * Math.PI * G * totalMassValue);
}

// Kepler's third law for a two-body orbit and the quadrupole frequency doubling.
// SI: separations (semi-major axes) in m, masses in kg, periods in s, frequencies in Hz.
import { G } from "./constants.js";
import { requirePositive } from "./validate.js";

/**
 * Orbital period of a binary of total mass M with semi-major axis a: P = 2π √(a³ / (G M)).
 * Source: Kepler's third law in Newton's two-body form (Newtonian mechanics; common practice).
 */
export function orbitalPeriodFromSeparation(separation: number, totalMassValue: number): number {
  requirePositive("orbitalPeriodFromSeparation", "separation (m)", separation);
  requirePositive("orbitalPeriodFromSeparation", "totalMass (kg)", totalMassValue);
  return 2 * Math.PI * Math.sqrt((separation * separation * separation) / (G * totalMassValue));
}

/** Semi-major axis from orbital period: a = (G M P² / (4π²))^{1/3} (Kepler's third law, inverted). */
export function separationFromOrbitalPeriod(orbitalPeriod: number, totalMassValue: number): number {
  requirePositive("separationFromOrbitalPeriod", "orbitalPeriod (s)", orbitalPeriod);
  requirePositive("separationFromOrbitalPeriod", "totalMass (kg)", totalMassValue);
  return Math.cbrt((G * totalMassValue * orbitalPeriod * orbitalPeriod) / (4 * Math.PI * Math.PI));
}

/**
 * Dominant GW frequency of a circular binary: f_gw = 2 f_orb (the quadrupole moment repeats twice
 * per orbit). Source: Peters & Mathews, Phys. Rev. 131, 435 (1963); common practice.
 */
export function gwFrequencyFromOrbitalFrequency(orbitalFrequency: number): number {
  requirePositive("gwFrequencyFromOrbitalFrequency", "orbitalFrequency (Hz)", orbitalFrequency);
  return 2 * orbitalFrequency;
}

/** Orbital frequency of a circular binary from its dominant GW frequency: f_orb = f_gw / 2. */
export function orbitalFrequencyFromGwFrequency(gwFrequency: number): number {
  requirePositive("orbitalFrequencyFromGwFrequency", "gwFrequency (Hz)", gwFrequency);
  return gwFrequency / 2;
}

/** GW frequency of a circular binary at separation a: f_gw = 2 / P = (1/π) √(G M / a³). */
export function gwFrequencyFromSeparation(separation: number, totalMassValue: number): number {
  requirePositive("gwFrequencyFromSeparation", "separation (m)", separation);
  requirePositive("gwFrequencyFromSeparation", "totalMass (kg)", totalMassValue);
  return Math.sqrt((G * totalMassValue) / (separation * separation * separation)) / Math.PI;
}

/** Separation of a circular binary radiating at f_gw: a = (G M / (π f_gw)²)^{1/3}. */
export function separationFromGwFrequency(gwFrequency: number, totalMassValue: number): number {
  requirePositive("separationFromGwFrequency", "gwFrequency (Hz)", gwFrequency);
  requirePositive("separationFromGwFrequency", "totalMass (kg)", totalMassValue);
  const w = Math.PI * gwFrequency;
  return Math.cbrt((G * totalMassValue) / (w * w));
}

// Quadrupole (leading-order) GW strain amplitude of a circular binary at a distance.
// SI: chirp mass in kg, frequency in Hz, distance in m, inclination in radians; strain is dimensionless.
import { C, G } from "./constants.js";
import { requireFinite, requirePositive } from "./validate.js";

/** The two polarisation amplitudes seen at an inclination ι (angle between orbital axis and line of sight). */
export interface StrainPolarisations {
  plus: number;
  cross: number;
}

/**
 * Optimally oriented (face-on) strain amplitude of a circular binary radiating at f_gw, at distance D:
 * h0 = 4 (G Mc)^{5/3} (π f_gw)^{2/3} / (c⁴ D).
 * Source: quadrupole formula for a circular orbit, Peters & Mathews, Phys. Rev. 131, 435 (1963);
 * textbook form in Maggiore, Gravitational Waves Vol. 1 (Oxford UP, 2008), Ch. 4 (circular orbits).
 * For a source at cosmological distance use the redshifted chirp mass and the luminosity distance.
 */
export function strainAmplitude(chirpMassValue: number, gwFrequency: number, distance: number): number {
  requirePositive("strainAmplitude", "chirpMass (kg)", chirpMassValue);
  requirePositive("strainAmplitude", "gwFrequency (Hz)", gwFrequency);
  requirePositive("strainAmplitude", "distance (m)", distance);
  return (4 * Math.pow(G * chirpMassValue, 5 / 3) * Math.pow(Math.PI * gwFrequency, 2 / 3)) / (C ** 4 * distance);
}

/**
 * Polarisation amplitudes at inclination ι: h+ = h0 (1 + cos²ι)/2, h× = h0 cos ι.
 * Source: Maggiore, Gravitational Waves Vol. 1 (Oxford UP, 2008), Ch. 4 (circular orbits);
 * the angular factors of the quadrupole field of a circular binary.
 */
export function strainPolarisations(h0: number, inclination: number): StrainPolarisations {
  requirePositive("strainPolarisations", "h0", h0);
  requireFinite("strainPolarisations", "inclination (rad)", inclination);
  const c = Math.cos(inclination);
  return { plus: (h0 * (1 + c * c)) / 2, cross: h0 * c };
}

// The leading-order (Newtonian, quadrupole) chirp of a circular inspiral and what it tells about the source.
// SI: chirp mass in kg, frequencies in Hz, ḟ in Hz/s, distances in m, times in s.
import { C, G } from "./constants.js";
import { InputError } from "../errors.js";
import { requirePositive } from "./validate.js";

/** G Mc / c³, the chirp mass as a time, s. */
function chirpTime(chirpMassValue: number): number {
  return (G * chirpMassValue) / (C * C * C);
}

/**
 * GW frequency derivative at f (leading order): ḟ = (96/5) π^{8/3} (G Mc / c³)^{5/3} f^{11/3}, Hz/s.
 * Source: energy balance with the quadrupole luminosity of Peters & Mathews, Phys. Rev. 131, 435
 * (1963); e.g. Cutler & Flanagan, Phys. Rev. D 49, 2658 (1994); Maggiore, Gravitational Waves Vol. 1
 * (Oxford UP, 2008), Ch. 4.
 */
export function frequencyDerivative(chirpMassValue: number, gwFrequency: number): number {
  requirePositive("frequencyDerivative", "chirpMass (kg)", chirpMassValue);
  requirePositive("frequencyDerivative", "gwFrequency (Hz)", gwFrequency);
  return (96 / 5) * Math.pow(Math.PI, 8 / 3) * Math.pow(chirpTime(chirpMassValue), 5 / 3) * Math.pow(gwFrequency, 11 / 3);
}

/**
 * Chirp mass from a measured (f, ḟ), inverting `frequencyDerivative`:
 * Mc = (c³/G) [ (5/96) π^{−8/3} f^{−11/3} ḟ ]^{3/5}, kg. For a distant source this is the redshifted
 * (detector-frame) chirp mass. Source: as `frequencyDerivative`.
 */
export function chirpMassFromFrequencyDerivative(gwFrequency: number, frequencyDerivativeValue: number): number {
  requirePositive("chirpMassFromFrequencyDerivative", "gwFrequency (Hz)", gwFrequency);
  requirePositive("chirpMassFromFrequencyDerivative", "frequencyDerivative (Hz/s)", frequencyDerivativeValue);
  const k53 = ((5 / 96) * frequencyDerivativeValue) / (Math.pow(Math.PI, 8 / 3) * Math.pow(gwFrequency, 11 / 3));
  return (Math.pow(k53, 3 / 5) * C * C * C) / G;
}

/**
 * Luminosity distance from a measured (f, ḟ, h0) with h0 the optimally oriented amplitude:
 * D = 5 c ḟ / (24 π² f³ h0), m. Derived here by eliminating (G Mc / c³)^{5/3} between
 * h0 = 4 c (G Mc / c³)^{5/3} (π f)^{2/3} / D (`strainAmplitude`) and `frequencyDerivative`
 * (the idea of a self-calibrating distance is Schutz, Nature 323, 310 (1986)). A smaller or
 * orientation-averaged amplitude convention changes the numerical factor.
 */
export function luminosityDistanceFromChirp(gwFrequency: number, frequencyDerivativeValue: number, h0: number): number {
  requirePositive("luminosityDistanceFromChirp", "gwFrequency (Hz)", gwFrequency);
  requirePositive("luminosityDistanceFromChirp", "frequencyDerivative (Hz/s)", frequencyDerivativeValue);
  requirePositive("luminosityDistanceFromChirp", "h0", h0);
  return (5 * C * frequencyDerivativeValue) / (24 * Math.PI * Math.PI * gwFrequency ** 3 * h0);
}

/**
 * Time from GW frequency f to coalescence (leading order): τ = (5/256) (G Mc / c³)^{−5/3} (π f)^{−8/3}, s.
 * Source: integral of df/ḟ from f to infinity with `frequencyDerivative`; Peters, Phys. Rev. 136, B1224 (1964).
 */
export function timeToCoalescenceFromGwFrequency(chirpMassValue: number, gwFrequency: number): number {
  requirePositive("timeToCoalescenceFromGwFrequency", "chirpMass (kg)", chirpMassValue);
  requirePositive("timeToCoalescenceFromGwFrequency", "gwFrequency (Hz)", gwFrequency);
  return (5 / 256) * Math.pow(chirpTime(chirpMassValue), -5 / 3) * Math.pow(Math.PI * gwFrequency, -8 / 3);
}

/**
 * Number of GW cycles between f1 and f2 > f1 (leading order, ∫ f/ḟ df):
 * N = (G Mc / c³)^{−5/3} (f1^{−5/3} − f2^{−5/3}) / (32 π^{8/3}).
 * Source: Blanchet, Living Rev. Relativ. 17, 2 (2014), the Newtonian term of the cycle count.
 */
export function gwCycleCount(chirpMassValue: number, f1: number, f2: number): number {
  requirePositive("gwCycleCount", "chirpMass (kg)", chirpMassValue);
  requirePositive("gwCycleCount", "f1 (Hz)", f1);
  requirePositive("gwCycleCount", "f2 (Hz)", f2);
  if (f2 <= f1) throw new InputError(`gwCycleCount: f2 must exceed f1 (got f1 = ${f1}, f2 = ${f2})`);
  return (
    (Math.pow(chirpTime(chirpMassValue), -5 / 3) * (Math.pow(f1, -5 / 3) - Math.pow(f2, -5 / 3))) /
    (32 * Math.pow(Math.PI, 8 / 3))
  );
}

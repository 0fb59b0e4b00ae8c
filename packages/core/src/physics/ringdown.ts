// Frequency and quality factor of the dominant quasi-normal mode of a Kerr black hole.
import { InputError } from "../errors.js";
import { T_SUN } from "./constants.js";

/**
 * Dimensionless angular frequency M ω of the l = m = 2, n = 0 quasi-normal mode of a Kerr black hole
 * of spin a ∈ [0, 1): M ω ≈ 1.5251 − 1.1568 (1 − a)^{0.1292} (G = c = 1), with quality factor
 * Q ≈ 0.7000 + 1.4187 (1 − a)^{−0.4990}. Negative spins are taken by their magnitude (the
 * co-rotating mode of the same |a|). Source: Berti, Cardoso & Will, Phys. Rev. D 73, 064030 (2006), fit table.
 */
export function dominantModeFrequency(spin: number): { massTimesOmega: number; quality: number } {
  if (typeof spin !== "number" || !Number.isFinite(spin) || !(Math.abs(spin) < 1)) {
    throw new InputError(`dominantModeFrequency: spin must be in (−1, 1) (got ${String(spin)})`);
  }
  const x = 1 - Math.abs(spin);
  return { massTimesOmega: 1.5251 - 1.1568 * Math.pow(x, 0.1292), quality: 0.7 + 1.4187 * Math.pow(x, -0.499) };
}

/**
 * GW frequency (Hz) of the dominant (l = m = 2, n = 0) ringdown of a black hole of mass
 * massSolar and spin a: f = M ω / (2π G M / c³) with M ω of {@link dominantModeFrequency}
 * (Berti, Cardoso & Will, Phys. Rev. D 73, 064030 (2006)).
 */
export function ringdownFrequencyHz(massSolar: number, spin: number): number {
  if (typeof massSolar !== "number" || !Number.isFinite(massSolar) || !(massSolar > 0)) {
    throw new InputError(`ringdownFrequencyHz: massSolar must be a positive finite number (got ${String(massSolar)})`);
  }
  return dominantModeFrequency(spin).massTimesOmega / (2 * Math.PI * massSolar * T_SUN);
}

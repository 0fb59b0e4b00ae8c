// Chirp-time coordinates (τ0, τ3) of a non-spinning inspiral and their map to (total mass, η).
// Used inside the bank code, where the metric must also be evaluated a little beyond the physical
// region (η slightly above 1/4), so the maps here accept any positive values and do no validation.
import { T_SUN } from "../physics/constants.js";

/** Total mass (solar masses) and symmetric mass ratio of a point in the (τ0, τ3) plane. */
export interface MassEta {
  totalMassSolar: number;
  eta: number;
}

/** Chirp times in seconds. */
export interface ChirpTimePoint {
  tau0: number;
  tau3: number;
}

/**
 * Newtonian and 1.5PN chirp times of a binary of total mass M and symmetric mass ratio η seen from
 * the frequency f0:
 *   τ0 = 5 / (256 π f0 η) (π G M f0 / c³)^{−5/3},   τ3 = 1 / (8 f0 η) (π G M f0 / c³)^{−2/3}.
 * Source: Sathyaprakash, Phys. Rev. D 50, R7111 (1994); Owen & Sathyaprakash, Phys. Rev. D 60,
 * 022002 (1999), Sec. III. No validation (η > 1/4 is allowed here).
 */
export function chirpTimesFromMassEta(totalMassSolar: number, eta: number, f0Hz: number): ChirpTimePoint {
  const x = Math.PI * totalMassSolar * T_SUN * f0Hz;
  return {
    tau0: (5 / (256 * Math.PI * f0Hz * eta)) * Math.pow(x, -5 / 3),
    tau3: (1 / (8 * f0Hz * eta)) * Math.pow(x, -2 / 3),
  };
}

/**
 * Inverse of {@link chirpTimesFromMassEta}: π G M f0 / c³ = 5 τ3 / (32 π τ0), and then
 * η = 1 / (8 f0 τ3) (π G M f0 / c³)^{−2/3}. Same sources. No validation: any positive (τ0, τ3) maps
 * to a positive (M, η); the point is physical only when η ≤ 1/4.
 */
export function massEtaFromChirpTimes(tau0: number, tau3: number, f0Hz: number): MassEta {
  const x = (5 * tau3) / (32 * Math.PI * tau0);
  const totalMassSolar = x / (Math.PI * f0Hz * T_SUN);
  const eta = (1 / (8 * f0Hz * tau3)) * Math.pow(x, -2 / 3);
  return { totalMassSolar, eta };
}

/** Component masses (m1 ≥ m2, solar masses) from total mass and η ≤ 1/4: m1,2 = M (1 ± √(1 − 4η)) / 2. */
export function componentsFromMassEta(totalMassSolar: number, eta: number): { m1: number; m2: number } {
  const root = Math.sqrt(Math.max(0, 1 - 4 * eta));
  return { m1: (totalMassSolar * (1 + root)) / 2, m2: (totalMassSolar * (1 - root)) / 2 };
}

/** Chirp times of the component masses m1, m2 (solar masses) from f0; see {@link chirpTimesFromMassEta}. */
export function chirpTimesFromComponents(m1Solar: number, m2Solar: number, f0Hz: number): ChirpTimePoint {
  const m = m1Solar + m2Solar;
  return chirpTimesFromMassEta(m, (m1Solar * m2Solar) / (m * m), f0Hz);
}

/** Chirp mass Mc = η^{3/5} M (solar masses); common practice, e.g. Cutler & Flanagan, Phys. Rev. D 49, 2658 (1994). */
export function chirpMassFromMassEta(totalMassSolar: number, eta: number): number {
  return Math.pow(eta, 0.6) * totalMassSolar;
}

/** GW frequency (Hz) at the Schwarzschild ISCO of total mass M: f = c³ / (6^{3/2} π G M); common practice. */
export function iscoFrequencyHz(totalMassSolar: number): number {
  return 1 / (Math.pow(6, 1.5) * Math.PI * totalMassSolar * T_SUN);
}

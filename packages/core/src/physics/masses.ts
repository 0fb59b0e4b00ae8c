// Mass combinations of a binary: total mass, symmetric mass ratio, chirp mass, and back.
// All masses in kg (any consistent mass unit works, since these relations are homogeneous).
import { InputError } from "../errors.js";
import { requirePositive } from "./validate.js";

/** The two component masses of a binary, heavier first (m1 ≥ m2), in the caller's mass unit. */
export interface ComponentMasses {
  m1: number;
  m2: number;
}

/** Total mass M = m1 + m2. */
export function totalMass(m1: number, m2: number): number {
  requirePositive("totalMass", "m1", m1);
  requirePositive("totalMass", "m2", m2);
  return m1 + m2;
}

/**
 * Symmetric mass ratio η = m1 m2 / (m1 + m2)², in (0, 1/4], 1/4 for equal masses.
 * Source: Blanchet, Living Rev. Relativ. 17, 2 (2014), notation of the PN two-body problem.
 */
export function symmetricMassRatio(m1: number, m2: number): number {
  requirePositive("symmetricMassRatio", "m1", m1);
  requirePositive("symmetricMassRatio", "m2", m2);
  const m = m1 + m2;
  return (m1 * m2) / (m * m);
}

/** Mass ratio q = m_lighter / m_heavier, in (0, 1] (the order of the arguments does not matter). */
export function massRatio(m1: number, m2: number): number {
  requirePositive("massRatio", "m1", m1);
  requirePositive("massRatio", "m2", m2);
  return Math.min(m1, m2) / Math.max(m1, m2);
}

/**
 * Chirp mass Mc = (m1 m2)^{3/5} / (m1 + m2)^{1/5} = η^{3/5} M, the mass combination that sets the
 * leading-order (quadrupole) inspiral.
 * Source: Peters & Mathews, Phys. Rev. 131, 435 (1963) (the combination in the luminosity);
 * named "chirp mass" in Cutler & Flanagan, Phys. Rev. D 49, 2658 (1994).
 */
export function chirpMass(m1: number, m2: number): number {
  requirePositive("chirpMass", "m1", m1);
  requirePositive("chirpMass", "m2", m2);
  return Math.pow(m1 * m2, 0.6) / Math.pow(m1 + m2, 0.2);
}

/**
 * Component masses from chirp mass and mass ratio q = m2/m1 ≤ 1:
 * η = q/(1+q)², M = Mc η^{−3/5}, m1 = M/(1+q), m2 = q M/(1+q) (inverting the definitions above).
 */
export function componentMassesFromChirpMassAndMassRatio(chirpMassValue: number, q: number): ComponentMasses {
  requirePositive("componentMassesFromChirpMassAndMassRatio", "chirpMass", chirpMassValue);
  if (typeof q !== "number" || !Number.isFinite(q) || q <= 0 || q > 1) {
    throw new InputError(
      `componentMassesFromChirpMassAndMassRatio: q must be in (0, 1] (q = m2/m1 with m1 ≥ m2; got ${String(q)})`,
    );
  }
  const eta = q / ((1 + q) * (1 + q));
  const m = chirpMassValue * Math.pow(eta, -0.6);
  return { m1: m / (1 + q), m2: (q * m) / (1 + q) };
}

/**
 * Component masses from chirp mass and symmetric mass ratio η ∈ (0, 1/4]:
 * M = Mc η^{−3/5}, m1,2 = M (1 ± √(1 − 4η)) / 2 (inverting the definitions above).
 * An η exceeding 1/4 by rounding only (≤ 1e-12 relative) is taken as 1/4.
 */
export function componentMassesFromChirpMassAndSymmetricMassRatio(chirpMassValue: number, eta: number): ComponentMasses {
  requirePositive("componentMassesFromChirpMassAndSymmetricMassRatio", "chirpMass", chirpMassValue);
  if (typeof eta !== "number" || !Number.isFinite(eta) || eta <= 0 || eta > 0.25 * (1 + 1e-12)) {
    throw new InputError(
      `componentMassesFromChirpMassAndSymmetricMassRatio: eta must be in (0, 0.25] (got ${String(eta)})`,
    );
  }
  const e = Math.min(eta, 0.25);
  const m = chirpMassValue * Math.pow(e, -0.6);
  const root = Math.sqrt(1 - 4 * e);
  return { m1: (m * (1 + root)) / 2, m2: (m * (1 - root)) / 2 };
}

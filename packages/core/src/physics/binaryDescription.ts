// One-call description of a binary source: every leading-order quantity the physics files compute,
// from two masses and one of separation / GW frequency / orbital period. SI throughout.
import { InputError } from "../errors.js";
import { chirpMass, massRatio, symmetricMassRatio } from "./masses.js";
import { gwFrequencyFromSeparation, orbitalPeriodFromSeparation, separationFromGwFrequency, separationFromOrbitalPeriod } from "./kepler.js";
import { strainAmplitude, strainPolarisations } from "./quadrupole.js";
import { gwLuminosityCircular } from "./luminosity.js";
import {
  eccentricityEnhancement,
  orbitalPeriodDerivative,
  separationDecayRate,
  timeToCoalescenceFromSeparation,
} from "./orbitalDecay.js";
import { chirpMassFromFrequencyDerivative, frequencyDerivative, luminosityDistanceFromChirp, timeToCoalescenceFromGwFrequency } from "./chirp.js";
import { iscoGwFrequency, iscoSeparation } from "./isco.js";
import { requireEccentricity, requireFinite, requirePositive } from "./validate.js";

/** Input of `describeBinary`: kg, m, s, Hz, rad. Give exactly one of separation, gwFrequency, orbitalPeriod. */
export interface BinaryInput {
  m1: number;
  m2: number;
  /** Semi-major axis (separation of a circular orbit), m. */
  separation?: number;
  /** Dominant GW frequency (twice the orbital frequency), Hz. */
  gwFrequency?: number;
  /** Orbital period, s. */
  orbitalPeriod?: number;
  /** Distance to the source, m (enables the strain amplitude). */
  distance?: number;
  /** Orbital eccentricity in [0, 1); enters only `orbitalPeriodDerivative` (via f(e)). */
  eccentricity?: number;
  /** Inclination of the orbital axis to the line of sight, rad (needs a distance; gives h+ and h×). */
  inclination?: number;
}

/**
 * Leading-order description of a binary. Masses are sorted so m1 ≥ m2. The orbit is taken circular
 * except in `orbitalPeriodDerivative`, which carries the eccentricity enhancement f(e).
 * When the separation is inside the ISCO of the total mass (`insideIsco`), the inspiral quantities
 * (ḟ, coalescence time, luminosity, decay rates, strain) are null: the point-mass quadrupole
 * inspiral does not describe such an orbit.
 */
export interface BinaryDescription {
  m1: number;
  m2: number;
  totalMass: number;
  chirpMass: number;
  symmetricMassRatio: number;
  /** m2 / m1 ≤ 1. */
  massRatio: number;
  separation: number;
  orbitalPeriod: number;
  orbitalFrequency: number;
  gwFrequency: number;
  gwPeriod: number;
  iscoSeparation: number;
  iscoGwFrequency: number;
  insideIsco: boolean;
  eccentricity: number;
  eccentricityEnhancement: number;
  frequencyDerivative: number | null;
  timeToCoalescence: number | null;
  luminosity: number | null;
  separationDecayRate: number | null;
  orbitalPeriodDerivative: number | null;
  distance: number | null;
  strainAmplitude: number | null;
  inclination: number | null;
  strainPlus: number | null;
  strainCross: number | null;
}

/**
 * Describes a binary from its masses and one orbital quantity (Kepler's third law, quadrupole
 * amplitude, luminosity and decay; sources in the files of each formula). Throws InputError naming
 * the parameter on bad input, or when not exactly one orbital quantity is given.
 */
export function describeBinary(input: BinaryInput): BinaryDescription {
  const where = "describeBinary";
  requirePositive(where, "m1 (kg)", input.m1);
  requirePositive(where, "m2 (kg)", input.m2);
  const given = (["separation", "gwFrequency", "orbitalPeriod"] as const).filter((k) => input[k] !== undefined);
  if (given.length !== 1) {
    throw new InputError(
      `${where}: give exactly one of separation, gwFrequency, orbitalPeriod (got ${given.length ? given.join(", ") : "none"})`,
    );
  }
  const m1 = Math.max(input.m1, input.m2);
  const m2 = Math.min(input.m1, input.m2);
  const mTot = m1 + m2;

  let separation: number;
  if (input.separation !== undefined) {
    requirePositive(where, "separation (m)", input.separation);
    separation = input.separation;
  } else if (input.gwFrequency !== undefined) {
    requirePositive(where, "gwFrequency (Hz)", input.gwFrequency);
    separation = separationFromGwFrequency(input.gwFrequency, mTot);
  } else {
    requirePositive(where, "orbitalPeriod (s)", input.orbitalPeriod as number);
    separation = separationFromOrbitalPeriod(input.orbitalPeriod as number, mTot);
  }
  // Echo the given quantity exactly; derive the others from the separation.
  const orbitalPeriod = input.orbitalPeriod ?? (input.gwFrequency !== undefined ? 2 / input.gwFrequency : orbitalPeriodFromSeparation(separation, mTot));
  const gwFrequency = input.gwFrequency ?? (input.orbitalPeriod !== undefined ? 2 / input.orbitalPeriod : gwFrequencyFromSeparation(separation, mTot));

  const eccentricity = input.eccentricity ?? 0;
  requireEccentricity(where, "eccentricity", eccentricity);
  if (input.distance !== undefined) requirePositive(where, "distance (m)", input.distance);
  if (input.inclination !== undefined) {
    requireFinite(where, "inclination (rad)", input.inclination);
    if (input.distance === undefined) throw new InputError(`${where}: inclination needs a distance`);
  }

  const mc = chirpMass(m1, m2);
  const rIsco = iscoSeparation(mTot);
  const insideIsco = separation < rIsco * (1 - 1e-12);
  const inspiral = !insideIsco;
  const h0 = inspiral && input.distance !== undefined ? strainAmplitude(mc, gwFrequency, input.distance) : null;
  const pol = h0 !== null && input.inclination !== undefined ? strainPolarisations(h0, input.inclination) : null;

  return {
    m1,
    m2,
    totalMass: mTot,
    chirpMass: mc,
    symmetricMassRatio: symmetricMassRatio(m1, m2),
    massRatio: massRatio(m1, m2),
    separation,
    orbitalPeriod,
    orbitalFrequency: 1 / orbitalPeriod,
    gwFrequency,
    gwPeriod: 1 / gwFrequency,
    iscoSeparation: rIsco,
    iscoGwFrequency: iscoGwFrequency(mTot),
    insideIsco,
    eccentricity,
    eccentricityEnhancement: eccentricityEnhancement(eccentricity),
    frequencyDerivative: inspiral ? frequencyDerivative(mc, gwFrequency) : null,
    timeToCoalescence: inspiral ? timeToCoalescenceFromSeparation(m1, m2, separation) : null,
    luminosity: inspiral ? gwLuminosityCircular(m1, m2, separation) : null,
    separationDecayRate: inspiral ? separationDecayRate(m1, m2, separation) : null,
    orbitalPeriodDerivative: inspiral ? orbitalPeriodDerivative(orbitalPeriod, m1, m2, eccentricity) : null,
    distance: input.distance ?? null,
    strainAmplitude: h0,
    inclination: input.inclination ?? null,
    strainPlus: pol ? pol.plus : null,
    strainCross: pol ? pol.cross : null,
  };
}

/** Input of `describeChirp`: a measured GW frequency (Hz), its derivative (Hz/s), optionally the amplitude. */
export interface ChirpInput {
  gwFrequency: number;
  frequencyDerivative: number;
  /** Optimally oriented strain amplitude h0 (dimensionless); enables the distance. */
  strain?: number;
}

/** What a leading-order chirp (f, ḟ[, h0]) says about its source. SI. */
export interface ChirpDescription {
  gwFrequency: number;
  frequencyDerivative: number;
  /** Detector-frame (redshifted) chirp mass, kg. */
  chirpMass: number;
  timeToCoalescence: number;
  strain: number | null;
  luminosityDistance: number | null;
  /**
   * The highest ISCO GW frequency any binary of this chirp mass has (equal masses, M = 4^{3/5} Mc).
   * When gwFrequency exceeds it, no circular inspiral of this chirp mass is still before its ISCO.
   */
  maxIscoGwFrequency: number;
  beyondIsco: boolean;
}

/**
 * Inverts the leading-order chirp: chirp mass from (f, ḟ), coalescence time, and with h0 the
 * luminosity distance (formulas and sources in chirp.ts).
 */
export function describeChirp(input: ChirpInput): ChirpDescription {
  const where = "describeChirp";
  requirePositive(where, "gwFrequency (Hz)", input.gwFrequency);
  requirePositive(where, "frequencyDerivative (Hz/s)", input.frequencyDerivative);
  if (input.strain !== undefined) requirePositive(where, "strain", input.strain);
  const mc = chirpMassFromFrequencyDerivative(input.gwFrequency, input.frequencyDerivative);
  const maxIsco = iscoGwFrequency(mc * Math.pow(4, 0.6));
  return {
    gwFrequency: input.gwFrequency,
    frequencyDerivative: input.frequencyDerivative,
    chirpMass: mc,
    timeToCoalescence: timeToCoalescenceFromGwFrequency(mc, input.gwFrequency),
    strain: input.strain ?? null,
    luminosityDistance:
      input.strain !== undefined ? luminosityDistanceFromChirp(input.gwFrequency, input.frequencyDerivative, input.strain) : null,
    maxIscoGwFrequency: maxIsco,
    beyondIsco: input.gwFrequency > maxIsco * (1 + 1e-12),
  };
}

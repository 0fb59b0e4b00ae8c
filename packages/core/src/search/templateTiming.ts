import { M_SUN } from "../physics/constants.js";
import { iscoGwFrequency } from "../physics/isco.js";
import { chirpMass } from "../physics/masses.js";
import { timeToCoalescenceFromGwFrequency } from "../physics/chirp.js";
import { taylorF2Phase } from "../waveform/taylorf2.js";

/**
 * Stationary-phase time of frequency f for a TaylorF2 template with t_c = 0:
 * t(f) = (1/2π) dΨ/df (the stationary point of the Fourier integral; e.g. Sathyaprakash &
 * Schutz, Living Rev. Relativ. 12, 2 (2009), Sec. 7.3), by a central difference.
 */
export function taylorF2TimeOfFrequency(fHz: number, m1Solar: number, m2Solar: number): number {
  const h = 1e-4 * fHz;
  return (taylorF2Phase(fHz + h, m1Solar, m2Solar) - taylorF2Phase(fHz - h, m1Solar, m2Solar)) / (2 * h) / (2 * Math.PI);
}

/**
 * Duration (s) of a template from fMinHz to its ISCO: the larger of the 3.5PN stationary-phase
 * time and the Newtonian chirp time (Peters 1964), so that segment padding is never too short.
 */
export function templateDurationSeconds(m1Solar: number, m2Solar: number, fMinHz: number): number {
  const mc = chirpMass(m1Solar * M_SUN, m2Solar * M_SUN);
  const newtonian = timeToCoalescenceFromGwFrequency(mc, fMinHz);
  const fIsco = iscoGwFrequency((m1Solar + m2Solar) * M_SUN);
  if (fMinHz >= fIsco) return 0;
  const pn = taylorF2TimeOfFrequency(fIsco, m1Solar, m2Solar) - taylorF2TimeOfFrequency(fMinHz, m1Solar, m2Solar);
  return Math.max(newtonian, pn);
}

/**
 * Offset (s) from the template's formal coalescence time (t_c = 0 of its phase) to the moment it
 * reaches its ISCO frequency, t(f_isco) = (1/2π) dΨ/df at f_isco. Adding it to the time of an
 * SNR peak gives the ISCO-crossing time that injections use as their coalescence time.
 */
export function templateIscoTimeOffset(m1Solar: number, m2Solar: number, _fMinHz: number): number {
  const fIsco = iscoGwFrequency((m1Solar + m2Solar) * M_SUN);
  return taylorF2TimeOfFrequency(fIsco, m1Solar, m2Solar);
}

// Seeded synthetic trigger streams standing in for single-site searches of independent Gaussian noise.
import seedrandom from "seedrandom";
import type { Detector } from "@chirpsieve/core";
import { type CoincidenceCandidate, type SiteTriggers } from "../../packages/core/src/coinc/analyseCoincidences.js";

export interface StreamOptions {
  seed: string;
  /** Triggers per second, all templates together. */
  rate: number;
  /** Number of templates; template m has chirp mass 1.2 · 1.1^m M_sun (10 % apart). */
  templates: number;
  /** SNR threshold of the stream. */
  threshold: number;
  startTime: number;
  seconds: number;
}

/** Chirp mass of synthetic template m. */
export const templateChirpMass = (m: number): number => 1.2 * 1.1 ** m;

/**
 * A Poisson stream of triggers (exponential gaps) on [startTime, startTime + seconds) with a
 * uniformly drawn template and an SNR from the tail of |z|² ~ χ²₂ above the threshold:
 * P(ρ > x | ρ > ρ₀) = exp(−(x² − ρ₀²)/2), i.e. ρ = √(ρ₀² − 2 ln U) (standard detection theory,
 * e.g. Allen et al., Phys. Rev. D 85, 122006 (2012)). Reweighted SNR = SNR (no chi-squared).
 */
export function poissonTriggers(o: StreamOptions): CoincidenceCandidate[] {
  const rng = seedrandom(o.seed);
  const out: CoincidenceCandidate[] = [];
  let t = o.startTime;
  for (;;) {
    t += -Math.log(1 - rng()) / o.rate;
    if (t >= o.startTime + o.seconds) break;
    const m = Math.floor(rng() * o.templates);
    const rho = Math.sqrt(o.threshold * o.threshold - 2 * Math.log(1 - rng()));
    out.push({
      coalescenceTime: t,
      snr: rho,
      reweightedSnr: rho,
      chi2: 0,
      chi2Dof: 0,
      effectiveDistanceMpc: 100 / rho,
      templateIndex: m,
      chirpMassSolar: templateChirpMass(m),
    });
  }
  return out;
}

/** A site's triggers wrapped for analyseCoincidences (the whole span counted as analysed). */
export function siteStream(detector: Detector, candidates: CoincidenceCandidate[], startTime: number, seconds: number): SiteTriggers<CoincidenceCandidate> {
  return { detector, candidates, analysedSeconds: seconds, startTime, endTime: startTime + seconds };
}

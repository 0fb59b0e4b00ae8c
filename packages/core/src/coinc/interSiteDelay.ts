import { C } from "../physics/constants.js";
import type { Detector } from "../waveform/antenna.js";

/**
 * Light-travel time between two detector vertices, s: |r₁ − r₂| / c, the largest arrival-time
 * difference a plane wave from any sky position can produce between them (plane-wave geometry;
 * common practice, no source).
 */
export function interSiteDelay(a: Detector, b: Detector): number {
  const dx = a.vertex[0] - b.vertex[0];
  const dy = a.vertex[1] - b.vertex[1];
  const dz = a.vertex[2] - b.vertex[2];
  return Math.hypot(dx, dy, dz) / C;
}

/** The light-travel time of one pair of sites. */
export interface SitePairDelay {
  /** Names of the two sites, in list order. */
  sites: [string, string];
  /** Light-travel time between their vertices, s. */
  seconds: number;
}

/** {@link interSiteDelay} for every pair (i < j) of `detectors`, in list order. */
export function interSiteDelays(detectors: readonly Detector[]): SitePairDelay[] {
  const out: SitePairDelay[] = [];
  for (let i = 0; i < detectors.length; i++) {
    for (let j = i + 1; j < detectors.length; j++) {
      out.push({ sites: [detectors[i].name, detectors[j].name], seconds: interSiteDelay(detectors[i], detectors[j]) });
    }
  }
  return out;
}

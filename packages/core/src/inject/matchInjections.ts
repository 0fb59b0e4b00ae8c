import { InputError } from "../errors.js";
import type { Candidate } from "../search/types.js";
import { type Detector, geocentreDelay, siderealAngle } from "../waveform/antenna.js";
import type { Injection } from "./injection.js";

/** When an injection reaches its ISCO at `detector`: Earth-centre time plus the plane-wave delay. */
export function arrivalTimeAt(injection: Injection, detector: Detector): number {
  const t = injection.coalescenceTime;
  return t + geocentreDelay(detector, injection, siderealAngle(t));
}

/** The result of matching one batch's candidates to its injections. */
export interface InjectionMatch {
  /** For each injection (same order), the index of its matched candidate, or −1 when missed. */
  matched: number[];
  /** Indices of candidates matched to no injection. */
  unmatched: number[];
}

/**
 * Matches candidates to injections by time: a candidate belongs to the injection whose arrival
 * time at the detector ({@link arrivalTimeAt}) is nearest to its coalescence time, if that is
 * within ±windowSeconds; an injection keeps the loudest (highest SNR) of its candidates and is
 * "found"; other candidates near it are dropped (neither found nor false); candidates near no
 * injection are false candidates. Common practice, no source.
 */
export function matchInjections(
  injections: readonly Injection[],
  candidates: readonly Candidate[],
  detector: Detector,
  windowSeconds: number,
): InjectionMatch {
  if (!(windowSeconds > 0) || !Number.isFinite(windowSeconds)) throw new InputError(`match window must be a positive number of seconds (got ${windowSeconds})`);
  const arrivals = injections.map((inj) => arrivalTimeAt(inj, detector));
  const matched = new Array<number>(injections.length).fill(-1);
  const unmatched: number[] = [];
  candidates.forEach((c, ci) => {
    let best = -1;
    let bestDt = Infinity;
    for (let k = 0; k < arrivals.length; k++) {
      const dt = Math.abs(c.coalescenceTime - arrivals[k]);
      if (dt <= windowSeconds && dt < bestDt) {
        best = k;
        bestDt = dt;
      }
    }
    if (best < 0) unmatched.push(ci);
    else if (matched[best] < 0 || candidates[matched[best]].snr < c.snr) matched[best] = ci;
  });
  return { matched, unmatched };
}

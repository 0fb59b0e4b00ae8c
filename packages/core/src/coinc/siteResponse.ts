import { type Injection, checkInjection } from "../inject/injection.js";
import { type Detector, geocentreDelay, plusCrossResponse, siderealAngle } from "../waveform/antenna.js";

/** How one site sees an injection: its antenna factors and when the signal arrives there. */
export interface SiteResponse {
  site: string;
  /** Arrival at the site minus arrival at the Earth's centre, s. */
  delaySeconds: number;
  /** Time the signal reaches its ISCO frequency at the site, s (file time base). */
  arrivalTime: number;
  /** Antenna factors F+ and F×. */
  plus: number;
  cross: number;
  /**
   * Amplitude response relative to an optimally oriented site,
   * √(F+² (1 + cos² ι)² / 4 + F×² cos² ι), from the quadrupole-order polarisation amplitudes
   * h+ ∝ (1 + cos² ι) / 2 and h× ∝ cos ι (common practice, no source). The optimal SNR at the
   * site, and the inverse of its effective distance, scale with it.
   */
  relativeAmplitude: number;
}

/**
 * Per-site delay and antenna factors of one injection, with the same convention as
 * {@link projectInjection} (factors and delay evaluated once, at the Earth-centre coalescence time,
 * sidereal angle from {@link siderealAngle}; both from the antenna module, not recomputed here).
 */
export function injectionAtSites(injection: Injection, detectors: readonly Detector[]): SiteResponse[] {
  const inj = checkInjection(injection, "injection");
  const gmst = siderealAngle(inj.coalescenceTime);
  const ci = Math.cos(inj.inclination);
  const ap = (1 + ci * ci) / 2;
  return detectors.map((d) => {
    const { plus, cross } = plusCrossResponse(d, inj, inj.polarisation, gmst);
    const delaySeconds = geocentreDelay(d, inj, gmst);
    return {
      site: d.name,
      delaySeconds,
      arrivalTime: inj.coalescenceTime + delaySeconds,
      plus,
      cross,
      relativeAmplitude: Math.sqrt(plus * plus * ap * ap + cross * cross * ci * ci),
    };
  });
}

import type { PsdModel } from "../noise/psdModel.js";
import { canonicalHash } from "../run/canonicalJson.js";
import type { Detector } from "../waveform/antenna.js";
import type { Injection } from "./injection.js";
import { optimalSnr } from "./optimalSnr.js";
import { synthesizeStrain } from "./synthesizeStrain.js";

/** What a simulation writes for every site alike. */
export interface SimulationSettings {
  psd: PsdModel;
  sampleRate: number;
  startTime: number;
  duration: number;
  fMinHz: number;
  seed: string | number;
  /** Add coloured Gaussian noise (false: the injected signals alone). */
  noise: boolean;
}

/** One site of a simulation: its noise seed and its injections with their SNRs at that site. */
export interface SimulationSite {
  detector: Detector;
  /** Seed of the site's noise: `SEED:noise` for one site, `SEED:noise:NAME` for each of several (independent noise). */
  noiseSeed: string;
  /** The injections, each with `optimalSnr` at this site and, with several sites, `networkOptimalSnr`. */
  injections: (Injection & { networkOptimalSnr?: number })[];
}

/**
 * The reproducibility contract of a simulation: per site, the noise seed and the injections with
 * their optimal SNR there; with several sites also the network SNR, the quadrature sum of the
 * sites' SNRs (independent detectors; common practice, no source) — or, when `networkSnrDrawn`, the value each injection carries, which the draw scaled
 * the shared distance to. With one site an injection's given `optimalSnr` is kept.
 */
export function planSimulationSites(
  settings: SimulationSettings,
  detectors: readonly Detector[],
  injections: readonly Injection[],
  networkSnrDrawn = false,
): SimulationSite[] {
  const multi = detectors.length > 1;
  const perSite = detectors.map((d) =>
    injections.map((inj) => (multi || inj.optimalSnr === undefined ? optimalSnr(inj, settings.psd, settings.sampleRate, settings.fMinHz, d) : inj.optimalSnr)),
  );
  const network = injections.map((inj, k) =>
    networkSnrDrawn && inj.optimalSnr !== undefined ? inj.optimalSnr : Math.sqrt(perSite.reduce((a, site) => a + site[k] ** 2, 0)),
  );
  return detectors.map((detector, i) => ({
    detector,
    noiseSeed: multi ? `${settings.seed}:noise:${detector.name}` : `${settings.seed}:noise`,
    injections: injections.map((inj, k) => ({ ...inj, optimalSnr: perSite[i][k], ...(multi ? { networkOptimalSnr: network[k] } : {}) })),
  }));
}

/**
 * The identity of a simulation run: equal settings, sites and injections give an equal id (and
 * equal bytes), so files of one run can be told from files of two (canonical-JSON SHA-256).
 */
export function simulationRunId(settings: SimulationSettings, sites: readonly string[], injections: readonly Injection[], extra: Record<string, unknown> = {}): string {
  return canonicalHash({
    tool: "chirpsieve simulate",
    noiseCurve: settings.psd.name,
    noise: settings.noise,
    sampleRate: settings.sampleRate,
    startTime: settings.startTime,
    duration: settings.duration,
    fMinHz: settings.fMinHz,
    seed: settings.seed,
    detectors: sites,
    injections,
    ...extra,
  });
}

/**
 * One site's strain: its seeded noise (unless `noise` is false) plus its injections, generated in
 * chunks (synthesizeStrain.ts) into one array, float32 when `single` (half the memory of a float32
 * file's data).
 */
export function simulateSiteStrain(settings: SimulationSettings, site: SimulationSite, single: boolean): Float32Array | Float64Array {
  const samples = Math.round(settings.duration * settings.sampleRate);
  const data = single ? new Float32Array(samples) : new Float64Array(samples);
  let offset = 0;
  for (const chunk of synthesizeStrain({
    psd: settings.psd,
    sampleRate: settings.sampleRate,
    startTime: settings.startTime,
    duration: settings.duration,
    seed: site.noiseSeed,
    fMinHz: settings.fMinHz,
    injections: site.injections,
    detector: site.detector,
    noise: settings.noise,
  })) {
    data.set(chunk, offset);
    offset += chunk.length;
  }
  return data;
}

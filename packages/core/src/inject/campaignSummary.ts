import type { CampaignPopulation, FalseCandidate, InjectionOutcome } from "./campaign.js";
import {
  EFFICIENCY_INTERVAL,
  type EfficiencyBin,
  type ErrorSpread,
  binnedEfficiency,
  errorSpread,
  fiftyPercentCrossing,
  integerBinEdges,
  linearBinEdges,
  sensitiveVolume,
  wilsonInterval,
} from "./efficiency.js";

/** One bin of efficiency against optimal SNR. */
export interface SnrEfficiencyBin {
  snrLow: number;
  snrHigh: number;
  found: number;
  total: number;
  efficiency: number | null;
  lower: number | null;
  upper: number | null;
}

/** One bin of efficiency against distance (Mpc). */
export interface DistanceEfficiencyBin {
  distanceLowMpc: number;
  distanceHighMpc: number;
  found: number;
  total: number;
  efficiency: number | null;
  lower: number | null;
  upper: number | null;
}

/** The campaign's figures of merit (fixed key order, no wall times: two runs can be diffed). */
export interface CampaignSummary {
  injections: number;
  found: number;
  missed: number;
  efficiency: number | null;
  efficiencyLower: number | null;
  efficiencyUpper: number | null;
  /** The interval used for every lower/upper pair. */
  interval: string;
  efficiencyBySnr: SnrEfficiencyBin[];
  /** Optimal SNR where efficiency first rises through 50% (interpolated between bin centres). */
  snr50: number | null;
  efficiencyByDistance: DistanceEfficiencyBin[];
  /** Distance where efficiency first falls through 50% (null for an SNR-drawn population). */
  distance50Mpc: number | null;
  /** Monte Carlo sensitive volume (null for an SNR-drawn population). */
  sensitiveVolumeMpc3: number | null;
  sensitiveVolumeErrorMpc3: number | null;
  volumeMethod: string;
  /** Relative chirp-mass error of found injections. */
  chirpMassError: ErrorSpread | null;
  /** Coalescence-time error of found injections, s. */
  timeErrorSeconds: ErrorSpread | null;
  /** Recovered SNR / optimal SNR of found injections. */
  snrRatio: ErrorSpread | null;
  falseCandidates: number;
  analysedSeconds: number;
}

const DISTANCE_BINS = 10;
const MAX_SNR_BINS = 20;

function snrEdges(outcomes: readonly InjectionOutcome[], population: CampaignPopulation): number[] {
  if (population.snrRange) return integerBinEdges(population.snrRange[0], population.snrRange[1], MAX_SNR_BINS);
  const snrs = outcomes.map((o) => o.optimalSnr).filter(Number.isFinite);
  if (snrs.length === 0) return [0, 1];
  const lo = snrs.reduce((m, x) => Math.min(m, x), Infinity);
  const hi = snrs.reduce((m, x) => Math.max(m, x), -Infinity);
  // Unit bins up to 20 above the lowest (where the curve rises), then one bin for the rest.
  const edges = integerBinEdges(lo, Math.min(hi, Math.floor(lo) + MAX_SNR_BINS), MAX_SNR_BINS);
  if (hi > edges[edges.length - 1]) edges.push(Math.ceil(hi));
  return edges;
}

function distanceRange(outcomes: readonly InjectionOutcome[], population: CampaignPopulation): [number, number] {
  if (population.distanceMpc) return population.distanceMpc[1] > population.distanceMpc[0] ? population.distanceMpc : [population.distanceMpc[0], population.distanceMpc[0] * 1.000001];
  const d = outcomes.map((o) => o.distanceMpc);
  const lo = d.reduce((m, x) => Math.min(m, x), Infinity);
  const hi = d.reduce((m, x) => Math.max(m, x), -Infinity);
  return hi > lo ? [lo, hi] : [lo, lo * 1.000001];
}

/**
 * Summarises a campaign's outcomes: found fraction overall and binned in optimal SNR (whole-number
 * bins) and in distance (10 equal bins over the drawn range), each with its Wilson interval; the
 * 50% crossings; the Monte Carlo sensitive volume ({@link sensitiveVolume}) for distance-drawn
 * populations; median and 5–95% spread of the chirp-mass, time and SNR-ratio errors of the found
 * injections; the number of candidates that matched no injection.
 */
export function summariseCampaign(
  outcomes: readonly InjectionOutcome[],
  falseCandidates: readonly FalseCandidate[],
  population: CampaignPopulation,
  analysedSeconds: number,
): CampaignSummary {
  const n = outcomes.length;
  const found = outcomes.filter((o) => o.found);
  const overall = wilsonInterval(found.length, n);
  const foundFlags = outcomes.map((o) => o.found);
  const bySnr: EfficiencyBin[] = n ? binnedEfficiency(outcomes.map((o) => o.optimalSnr), foundFlags, snrEdges(outcomes, population)) : [];
  const dRange = n ? distanceRange(outcomes, population) : ([1, 2] as [number, number]);
  const byDistance: EfficiencyBin[] = n ? binnedEfficiency(outcomes.map((o) => o.distanceMpc), foundFlags, linearBinEdges(dRange[0], dRange[1], DISTANCE_BINS)) : [];
  const drawnInDistance = population.distanceMpc !== undefined;
  const volume = drawnInDistance
    ? sensitiveVolume(outcomes.map((o) => o.distanceMpc), foundFlags, population.distanceMpc!, population.distanceDistribution ?? "volume")
    : null;
  const nums = (f: (o: InjectionOutcome) => number | null) => found.map(f).filter((x): x is number => x !== null && Number.isFinite(x));
  return {
    injections: n,
    found: found.length,
    missed: n - found.length,
    efficiency: overall.efficiency,
    efficiencyLower: overall.lower,
    efficiencyUpper: overall.upper,
    interval: EFFICIENCY_INTERVAL,
    efficiencyBySnr: bySnr.map((b) => ({ snrLow: b.low, snrHigh: b.high, found: b.found, total: b.total, efficiency: b.efficiency, lower: b.lower, upper: b.upper })),
    snr50: fiftyPercentCrossing(bySnr, "rising"),
    efficiencyByDistance: byDistance.map((b) => ({
      distanceLowMpc: b.low,
      distanceHighMpc: b.high,
      found: b.found,
      total: b.total,
      efficiency: b.efficiency,
      lower: b.lower,
      upper: b.upper,
    })),
    distance50Mpc: drawnInDistance ? fiftyPercentCrossing(byDistance, "falling") : null,
    sensitiveVolumeMpc3: volume ? volume.volumeMpc3 : null,
    sensitiveVolumeErrorMpc3: volume ? volume.errorMpc3 : null,
    volumeMethod: drawnInDistance
      ? "Monte Carlo: mean over injections of found × 4πD²/p(D) for the drawn distance density p, plus the ball inside the nearest distance counted as fully efficient"
      : "not computed: distances follow from target SNRs, not from a distance distribution",
    chirpMassError: errorSpread(nums((o) => o.chirpMassError)),
    timeErrorSeconds: errorSpread(nums((o) => o.timeError)),
    snrRatio: errorSpread(nums((o) => (o.recoveredSnr === null ? null : o.recoveredSnr / o.optimalSnr))),
    falseCandidates: falseCandidates.length,
    analysedSeconds,
  };
}

import { describeSearch } from "../run/shardManifest.js";
import type { CampaignOptions } from "./campaign.js";

/**
 * What determines a campaign's results, as a plain record: the population, the data (simulated:
 * the noise curve and rate; recorded: each input's name, rate, start and length), the detector,
 * the search settings as a scan run describes them (describeSearch: every result-shaping setting and
 * a hash of the bank's masses and spins), the matching window and the batching. `bank` says how
 * the bank came about (for a person reading the state file).
 * Its {@link campaignFingerprint} keys the state a resume continues from: equal records, equal
 * results. Thread counts and progress callbacks are left out: they do not change the results.
 */
export function campaignIdentity(o: CampaignOptions, bank: string): Record<string, unknown> {
  const s = o.search;
  const p = o.population;
  return {
    noise: o.data.kind,
    noiseCurve: o.data.kind === "simulated" ? o.data.psd.name : s.psd.kind === "model" ? s.psd.model.name : null,
    strain: o.data.kind === "strain" ? o.data.sources.map((x) => ({ file: x.file, sampleRate: x.sampleRate, startTime: x.startTime, samples: x.length })) : [],
    sampleRate: o.data.kind === "simulated" ? o.data.sampleRate : (o.data.sources[0]?.sampleRate ?? null),
    count: p.count,
    massRangeSolar: p.massRangeSolar,
    spinRange: p.spinRange ?? null,
    snrRange: p.snrRange ?? null,
    distanceRangeMpc: p.distanceMpc ?? null,
    distanceDistribution: p.distanceMpc ? (p.distanceDistribution ?? "volume") : null,
    seed: p.seed,
    detector: o.detector?.name ?? null,
    bank,
    // Every result-shaping search setting and a hash of the bank (masses and spins), as a scan run's id has them.
    search: describeSearch(s),
    matchWindowSeconds: o.matchWindowSeconds ?? null,
    perBatch: o.injectionsPerBatch ?? null,
    gapSeconds: o.gapSeconds ?? null,
  };
}


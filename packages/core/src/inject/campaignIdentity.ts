import { resolveFftBackend } from "../fft/backends.js";
import { canonicalHash } from "../run/canonicalJson.js";
import { psdLabel } from "../search/psdLabel.js";
import type { CampaignOptions } from "./campaign.js";

/**
 * What determines a campaign's results, as a plain record: the population, the data (simulated:
 * the noise curve and rate; recorded: each input's name, rate, start and length), the detector,
 * the search settings with a fingerprint of every template (masses and spins), the matching window
 * and the batching. `bank` says how the bank came about (for a person reading the state file).
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
    templates: s.templates.length,
    templatesFingerprint: canonicalHash(s.templates.map((t) => [t.primaryMass, t.secondaryMass, spinOf(t, "primarySpin"), spinOf(t, "secondarySpin")])),
    fMinHz: s.fMinHz,
    fMaxHz: s.fMaxHz ?? null,
    minSnr: s.snrThreshold,
    chi2Bands: s.chi2Bands,
    chi2Allowance: s.chi2Allowance ?? 0,
    loudestWithinSeconds: s.loudestWithinSeconds,
    psd: psdLabel(s.psd),
    segmentSeconds: s.segmentSeconds ?? null,
    fftBackend: resolveFftBackend(s.fftBackend ?? "auto"),
    gating: s.gating === undefined ? "default" : s.gating,
    matchWindowSeconds: o.matchWindowSeconds ?? null,
    perBatch: o.injectionsPerBatch ?? null,
    gapSeconds: o.gapSeconds ?? null,
  };
}

/** A template's aligned spin, 0 when it has none. */
function spinOf(t: object, key: "primarySpin" | "secondarySpin"): number {
  return (t as Partial<Record<typeof key, number>>)[key] ?? 0;
}

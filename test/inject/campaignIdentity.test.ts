// What keys a campaign's state: everything that changes its results, and nothing that does not.
import { describe, expect, it } from "vitest";
import { ajith2011, campaignFingerprint, campaignIdentity, type CampaignOptions } from "@chirpsieve/core";

const base: CampaignOptions = {
  population: { count: 10, massRangeSolar: [8, 12], snrRange: [6, 20], seed: "id" },
  data: { kind: "simulated", psd: ajith2011, sampleRate: 1024 },
  search: {
    templates: [{ primaryMassSolar: 10, secondaryMassSolar: 9 }],
    fMinHz: 30,
    snrThreshold: 6,
    chi2Bands: 16,
    loudestWithinSeconds: 1,
    psd: { kind: "estimate", segmentSeconds: 4, average: "median" },
    fftBackend: "fftjs",
  },
};
const fp = (o: CampaignOptions) => campaignFingerprint(campaignIdentity(o, "test bank"));

describe("campaignIdentity", () => {
  it("changes with the seed, the population, the bank's masses or spins, the search and the batching", () => {
    const id = fp(base);
    expect(fp({ ...base })).toBe(id);
    const changed: CampaignOptions[] = [
      { ...base, population: { ...base.population, seed: "other" } },
      { ...base, population: { ...base.population, spinRange: [0, 0.5] } },
      { ...base, search: { ...base.search, templates: [{ primaryMassSolar: 10, secondaryMassSolar: 8.9 }] } },
      { ...base, search: { ...base.search, templates: [{ primaryMassSolar: 10, secondaryMassSolar: 9, primarySpin: 0.3 } as never] } },
      { ...base, search: { ...base.search, snrThreshold: 7 } },
      { ...base, search: { ...base.search, gating: null } },
      { ...base, injectionsPerBatch: 3 },
    ];
    for (const o of changed) expect(fp(o)).not.toBe(id);
  });

  it("does not change with the thread count or a progress callback", () => {
    expect(fp({ ...base, search: { ...base.search, threads: 2, onProgress: () => {} } })).toBe(fp(base));
  });
});

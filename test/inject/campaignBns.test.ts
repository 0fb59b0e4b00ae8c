import { beforeAll, describe, expect, it } from "vitest";
import { loadFftBackends, planCampaign, runCampaign, summariseCampaign } from "@chirpsieve/core";
import { runCampaignBatch } from "../../packages/core/src/inject/campaign.js";
import { bnsCampaign } from "./campaignFixtures.js";

beforeAll(async () => {
  await loadFftBackends();
});

describe("a seeded campaign of 100 BNS injections at optimal SNR 10–20 in ajith2011 noise", () => {
  it("finds ≥ 95% with median chirp-mass error ≤ 0.5% and median time error ≤ 1 ms; each batch is reproducible alone", async () => {
    const options = bnsCampaign(100, [10, 20], "bns-10-20");
    const layout = planCampaign(options);
    // 1.35+1.35 M_sun lasts ~26 s from 40 Hz: 16 chirps per 512 s stretch (one 2^20-sample segment).
    expect(layout).toMatchObject({ batches: 7, injectionsPerBatch: 16, batchSamples: 2 ** 20 });
    const result = await runCampaign(options);
    const outcomes = result.batches.flatMap((b) => b.injections);
    expect(outcomes.map((o) => o.index)).toEqual(Array.from({ length: 100 }, (_, i) => i));
    const falseCandidates = result.batches.flatMap((b) => b.falseCandidates);
    const s = summariseCampaign(outcomes, falseCandidates, options.population, 0);
    expect(s.efficiency!).toBeGreaterThanOrEqual(0.95);
    expect(s.chirpMassError!.medianAbsolute).toBeLessThanOrEqual(0.005);
    expect(s.timeErrorSeconds!.medianAbsolute).toBeLessThanOrEqual(0.001);
    // Gaussian noise at threshold 7 over ~3500 s and 82 templates: a false candidate is rare.
    expect(s.falseCandidates).toBeLessThanOrEqual(2);
    // Resume rests on this: a batch depends only on the options and its index.
    const again = await runCampaignBatch(options, result.layout, 3);
    expect(again).toEqual(result.batches[3]);
  });
});

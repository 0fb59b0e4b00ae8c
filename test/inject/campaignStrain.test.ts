import { beforeAll, describe, expect, it } from "vitest";
import {
  ajith2011,
  arrayInput,
  colouredNoise,
  loadFftBackends,
  planCampaign,
  runCampaign,
  type CampaignOptions,
} from "@chirpsieve/core";
import { chirpMassGrid, standardSearch } from "../search/fixtures.js";

beforeAll(async () => {
  await loadFftBackends();
});

const FS = 2048;

/** Injections into a user's strain (here: seeded noise held in memory, as a file would be). */
function strainCampaign(count: number, seconds: number, distribution?: "uniform"): CampaignOptions {
  const noise = colouredNoise(ajith2011, seconds * FS, FS, "user-strain");
  return {
    population: distribution
      ? { count, massRangeSolar: [8, 12], distanceMpc: [200, 600], distanceDistribution: distribution, seed: "strain" }
      : { count, massRangeSolar: [8, 12], snrRange: [12, 20], seed: "strain" },
    data: { kind: "strain", sources: [arrayInput(noise, FS, 1000, "user.f64")] },
    search: standardSearch(chirpMassGrid(6.5, 10.6, 0.01, [1, 0.75]), 30, 7),
    injectionsPerBatch: 4,
  };
}

describe("campaigns in the user's strain", () => {
  it("cuts the file into consecutive stretches in its own time base and finds loud injections", async () => {
    const options = strainCampaign(8, 200);
    const layout = planCampaign(options);
    expect(layout.stretches.map((s) => s.startTime)).toEqual([1000, 1000 + layout.batchSeconds]);
    const r = await runCampaign(options);
    const outs = r.batches.flatMap((b) => b.injections);
    expect(outs).toHaveLength(8);
    for (const o of outs) {
      // Optimal SNRs are computed with a Welch estimate of the stretch's own noise; the target is hit exactly.
      expect(o.optimalSnr).toBeGreaterThanOrEqual(12);
      expect(o.optimalSnr).toBeLessThanOrEqual(20);
      expect(o.coalescenceTime).toBeGreaterThan(1000);
      expect(o.found).toBe(true);
      expect(Math.abs(o.timeError!)).toBeLessThan(0.01);
    }
  });

  it("draws distances uniformly in distance when asked, rescaling optimal SNR as 1/D", async () => {
    const r = await runCampaign(strainCampaign(4, 200, "uniform"));
    for (const o of r.batches.flatMap((b) => b.injections)) {
      expect(o.distanceMpc).toBeGreaterThanOrEqual(200);
      expect(o.distanceMpc).toBeLessThanOrEqual(600);
      expect(o.optimalSnr).toBeGreaterThan(0);
    }
  });

  it("refuses more injections than the strain has room for", () => {
    expect(() => planCampaign(strainCampaign(40, 200))).toThrow(/room for 12 injection\(s\), fewer than the 40 asked for/);
  });
});

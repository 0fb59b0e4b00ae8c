// A small seeded campaign (stellar-mass binaries, short chirps: a few seconds to run) turned into
// the `recover` JSON document, for the report tests.
import {
  ajith2011,
  evaluateRequirements,
  loadFftBackends,
  parseRequirement,
  runCampaign,
  summariseCampaign,
  type CampaignOptions,
} from "@chirpsieve/core";
import { campaignDocument, type CampaignDocument } from "../../packages/cli/src/reportData.js";
import { chirpMassGrid, standardSearch } from "../search/fixtures.js";

export async function smallCampaignDocument(): Promise<CampaignDocument> {
  await loadFftBackends();
  const options: CampaignOptions = {
    population: { count: 24, massRangeSolar: [8, 12], distanceMpc: [100, 1500], seed: "report" },
    data: { kind: "simulated", psd: ajith2011, sampleRate: 2048 },
    search: standardSearch(chirpMassGrid(6.5, 10.6, 0.01, [1, 0.75]), 30, 7),
  };
  const result = await runCampaign(options);
  const outcomes = result.batches.flatMap((b) => b.injections);
  const falseCandidates = result.batches.flatMap((b) => b.falseCandidates);
  const summary = summariseCampaign(outcomes, falseCandidates, options.population, 0);
  const requirements = evaluateRequirements([parseRequirement("efficiency>=0.9@snr>=10"), parseRequirement("time-error<=0")], outcomes, summary);
  return campaignDocument({
    version: "test",
    args: { minSnr: 7, templates: options.search.templates.length, bank: "test grid", psd: "welch-median-4s" },
    population: {
      count: 24,
      massRangeSolar: [8, 12],
      snrRange: null,
      distanceRangeMpc: [100, 1500],
      distanceDistribution: "volume",
      seed: "report",
      detector: "site-a",
      fMinHz: 30,
      noise: "simulated Gaussian noise, ajith2011 (synthetic)",
      synthetic: true,
    },
    layout: result.layout,
    summary,
    outcomes,
    falseCandidates,
    requirements,
    run: { wallSeconds: 1, resumedBatches: 0, stateFile: null },
  });
}

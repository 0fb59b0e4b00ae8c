// The reproducibility contract of `simulate`, in core: per-site seeds and SNRs, network SNR, run id.
import { describe, expect, it } from "vitest";
import { ajith2011, optimalSnr, planSimulationSites, simulateSiteStrain, simulationRunId, type SimulationSettings } from "@chirpsieve/core";
import { SITE_A, SITE_B } from "../../packages/core/src/waveform/antenna.js";
import { injectionAt } from "../search/fixtures.js";

const settings: SimulationSettings = { psd: ajith2011, sampleRate: 1024, startTime: 0, duration: 8, fMinHz: 30, seed: "plan", noise: true };
const inj = injectionAt(10, 8, 5.5, { distanceMpc: 200 });

describe("planSimulationSites", () => {
  it("gives one site the seed SEED:noise and keeps its injection's stated SNR", () => {
    const [site] = planSimulationSites(settings, [SITE_A], [{ ...inj, optimalSnr: 12.5 }]);
    expect(site.noiseSeed).toBe("plan:noise");
    expect(site.injections[0].optimalSnr).toBe(12.5);
    expect(site.injections[0].networkOptimalSnr).toBeUndefined();
  });

  it("gives each of several sites its own seed and SNR, and the network SNR as their quadrature sum", () => {
    const sites = planSimulationSites(settings, [SITE_A, SITE_B], [inj]);
    expect(sites.map((s) => s.noiseSeed)).toEqual(["plan:noise:site-a", "plan:noise:site-b"]);
    const a = optimalSnr(inj, ajith2011, 1024, 30, SITE_A);
    const b = optimalSnr(inj, ajith2011, 1024, 30, SITE_B);
    expect(sites[0].injections[0].optimalSnr).toBe(a);
    expect(sites[1].injections[0].optimalSnr).toBe(b);
    // Independent detectors: network SNR² is the sum of the sites' SNR² (common practice, no source).
    expect(sites[0].injections[0].networkOptimalSnr).toBeCloseTo(Math.hypot(a, b), 12);
    // A drawn network SNR is kept as drawn.
    expect(planSimulationSites(settings, [SITE_A, SITE_B], [{ ...inj, optimalSnr: 15 }], true)[1].injections[0].networkOptimalSnr).toBe(15);
  });

  it("makes the same bytes for the same plan, and a run id that changes with any setting", () => {
    const [site] = planSimulationSites(settings, [SITE_A], [inj]);
    const x = simulateSiteStrain(settings, site, false);
    const y = simulateSiteStrain(settings, site, false);
    expect(x.length).toBe(8 * 1024);
    expect(Array.from(x)).toEqual(Array.from(y));
    const single = simulateSiteStrain(settings, site, true);
    expect(single).toBeInstanceOf(Float32Array);
    expect(single[100]).toBe(Math.fround(x[100]));
    const id = simulationRunId(settings, ["site-a"], [inj]);
    expect(simulationRunId({ ...settings }, ["site-a"], [inj])).toBe(id);
    expect(simulationRunId({ ...settings, seed: "other" }, ["site-a"], [inj])).not.toBe(id);
    expect(simulationRunId(settings, ["site-a", "site-b"], [inj])).not.toBe(id);
  });
});

import { describe, expect, it } from "vitest";
import { ajith2011 } from "@chirpsieve/core";
import { createMassRegion } from "../../../packages/core/src/bank/massRegion.js";
import { createChirpTimeMetric, type ChirpTimeMetric } from "../../../packages/core/src/bank/metric.js";
import { createPhaseChart } from "../../../packages/core/src/bank/phaseChart.js";
import { placementMetric } from "../../../packages/core/src/bank/placementMetric.js";
import { createMetricSampler } from "../../../packages/core/src/bank/metricSampler.js";

describe("createMetricSampler (8–12 M_sun from 40 Hz, ajith2011)", () => {
  const region = createMassRegion({ minMassSolar: 8, maxMassSolar: 12 }, 40);
  const base = createChirpTimeMetric({ psd: ajith2011, fMinHz: 40, pointsPerEFold: 60 });
  let calls = 0;
  const metric: ChirpTimeMetric = { ...base, tangent: (t0, t3) => (calls++, base.tangent(t0, t3)) };
  const chart = createPhaseChart({ psd: ajith2011, fMinHz: 40, region });
  const sampleAt = createMetricSampler({ region, metric, chart, minimalMatch: 0.97 });

  it("gives the placement metric pulled back into the chart, computed once per point", () => {
    const [t0, eta] = [1.0, 0.247];
    const t3 = region.tau3At(t0, eta);
    const s = sampleAt(t0, eta);
    expect(s.g).toEqual(chart.pullBack(placementMetric(base.tangent(t0, t3), t0, t3, 0.97), t0, t3));
    const before = calls;
    expect(sampleAt(t0, eta)).toBe(s);
    expect(calls).toBe(before);
    sampleAt(t0, 0.248);
    expect(calls).toBe(before + 1);
  });

  it("gives the proper-area density per dτ0 dη: sqrt(det g) |∂τ3/∂η| with ∂τ3/∂η = −0.6 τ3/η", () => {
    // τ3 ∝ τ0^{2/5} η^{−3/5} at fixed τ0 (chirp times: Sathyaprakash, Phys. Rev. D 50, R7111 (1994));
    // checked here against a central difference of the region's own τ3(τ0, η).
    for (const [t0, eta] of [
      [0.8, 0.2495],
      [1.2, 0.248],
    ]) {
      const t3 = region.tau3At(t0, eta);
      const g = placementMetric(base.tangent(t0, t3), t0, t3, 0.97);
      const h = 1e-6;
      const dTau3dEta = (region.tau3At(t0, eta + h) - region.tau3At(t0, eta - h)) / (2 * h);
      const want = Math.sqrt(g.g00 * g.g11 - g.g01 * g.g01) * Math.abs(dTau3dEta);
      expect(sampleAt(t0, eta).density / want).toBeCloseTo(1, 7);
    }
  });
});

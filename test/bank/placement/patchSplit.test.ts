import { describe, expect, it } from "vitest";
import { meetsRegion, splitGains, splitIntoPatches } from "../../../packages/core/src/bank/patchSplit.js";
import { metricRatioRange } from "../../../packages/core/src/bank/metricRatio.js";
import type { MetricSampler } from "../../../packages/core/src/bank/metricSampler.js";
import { constantSampler, G, identityChart, r, region } from "./flatFixture.js";

describe("splitGains (the cost model of a cut)", () => {
  it("weighs the templates a tighter metric saves against the seam (worked by hand)", () => {
    // λmax/λmin = 4 along τ0: the lattice holds (√4 − 1) = 1 × count extra; halving leaves
    // exp(ln 4 / 4) − 1 = √2 − 1. A seam 10 spacings long costs 2 × 0.36 × √3 × 10 templates.
    const { gainT, gainE } = splitGains({ count: 1000, lenT: 50, lenE: 10, logVar: Math.log(4), logVarT: Math.log(4), logVarE: 0 });
    expect(gainT).toBeCloseTo(1000 * (2 - Math.SQRT2) - 2 * 0.36 * Math.sqrt(3) * 10, 9);
    expect(gainE).toBeCloseTo(-2 * 0.36 * Math.sqrt(3) * 50, 9);
  });

  it("never cuts across a direction 4 spacings long or less", () => {
    const g = splitGains({ count: 1e6, lenT: 4, lenE: 4.01, logVar: 1, logVarT: 1, logVarE: 1 });
    expect(g.gainT).toBe(-Infinity);
    expect(g.gainE).toBeGreaterThan(0);
  });
});

describe("splitIntoPatches", () => {
  it("leaves a region of constant metric in one patch anchored at its middle sample", () => {
    const { patches, anchors } = splitIntoPatches({ region, chart: identityChart, sampleAt: constantSampler, radius: r, tolerance: 0.05 });
    expect(patches).toHaveLength(1);
    expect(patches[0]).toMatchObject({ tau0Lo: region.tau0Min, tau0Hi: region.tau0Max, etaLo: 0, etaHi: 0.25, metric: G });
    expect(region.contains(anchors[0][0], anchors[0][1])).toBe(true);
  });

  it("cuts where the metric varies, into patches that tile the region, each metric at least every sample's", () => {
    // g ∝ τ0⁴: a factor of (1.36/0.69)⁴ ≈ 15 along the region.
    const sampleAt: MetricSampler = (t0, eta) => {
      const s = t0 ** 4;
      return { g: { g00: G.g00 * s, g01: 0, g11: G.g11 * s }, density: constantSampler(t0, eta).density * s };
    };
    const { patches } = splitIntoPatches({ region, chart: identityChart, sampleAt, radius: r, tolerance: 0.05 });
    expect(patches.length).toBeGreaterThan(2);
    // Tiling: at a few τ0, the η-ranges of the patches holding it cover [0, 1/4] once.
    for (const t0 of [0.7, 0.9, 1.1, 1.3]) {
      const here = patches.filter((p) => p.tau0Lo <= t0 && t0 < p.tau0Hi).sort((p, q) => p.etaLo - q.etaLo);
      expect(here[0].etaLo).toBe(0);
      expect(here[here.length - 1].etaHi).toBe(0.25);
      for (let k = 1; k < here.length; k++) expect(here[k].etaLo).toBe(here[k - 1].etaHi);
    }
    for (const p of patches) {
      for (const row of p.samples) for (const g of row ?? []) expect(metricRatioRange(g, p.metric)[1]).toBeLessThanOrEqual(1 + 1e-12);
    }
  });

  it("meetsRegion: a box above the equal-mass line or below η_low everywhere misses it", () => {
    expect(meetsRegion(region, { tau0Lo: region.tau0Min, tau0Hi: region.tau0Max, etaLo: 0, etaHi: 0.25 })).toBe(true);
    expect(meetsRegion(region, { tau0Lo: region.tau0Min, tau0Hi: region.tau0Max, etaLo: 0, etaHi: 0.2 })).toBe(false);
  });
});

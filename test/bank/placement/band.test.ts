import { describe, expect, it } from "vitest";
import { type Metric2 } from "../../../packages/core/src/bank/metric.js";
import { bandProfile, type BandProfile } from "../../../packages/core/src/bank/bandProfile.js";
import { bandMetricAt } from "../../../packages/core/src/bank/bandMetric.js";
import { ACROSS, createBandGeometry, crossSectionGrid, fractionAtDistance, type BandGeometry } from "../../../packages/core/src/bank/bandGeometry.js";
import type { LatticePatch } from "../../../packages/core/src/bank/patch.js";
import { constantPatch, G, identityChart, region, wholeBox } from "./flatFixture.js";

describe("bandProfile", () => {
  it("spans the run where it meets the region, its lower edge η_low (exact at the grid's nodes)", () => {
    const profile = bandProfile(region, [constantPatch()]) as BandProfile;
    expect(profile.kind).toBe("band");
    expect([profile.aa, profile.bb]).toEqual([region.tau0Min, region.tau0Max]);
    for (const t of [region.tau0Min, ...region.chainTau0, region.tau0Max]) expect(profile.low(t)).toBe(Math.min(0.25, region.etaLow(t)));
    // Between nodes, linear: close to the exact edge (the grid has 256 intervals here).
    for (let k = 1; k < 20; k++) {
      const t = region.tau0Min + ((region.tau0Max - region.tau0Min) * (k + 0.37)) / 20;
      expect(profile.low(t)).toBeCloseTo(region.etaLow(t), 6);
    }
  });

  it("starts where the run first meets the region (bisection) and is empty where it never does", () => {
    // η ≤ 0.249: the region's tips near τ0Min and τ0Max (η_low → 1/4) are outside.
    const run = [constantPatch({ ...wholeBox(), etaHi: 0.249 })];
    const profile = bandProfile(region, run) as BandProfile;
    expect(profile.aa).toBeGreaterThan(region.tau0Min);
    expect(region.etaLow(profile.aa)).toBeCloseTo(0.249, 10);
    expect(region.etaLow(profile.bb)).toBeCloseTo(0.249, 10);
    expect(bandProfile(region, [constantPatch({ ...wholeBox(), etaHi: 0.2 })])).toBe("empty");
  });
});

describe("bandMetricAt", () => {
  // Samples bilinear in (τ0, band fraction): interpolation must give them back exactly.
  const f = (t: number, frac: number): Metric2 => ({ g00: 1 + 2 * t + 3 * frac + t * frac, g01: 0.5 * t, g11: 7 - frac });
  const patch = (lo: number, hi: number): LatticePatch => {
    const sampleTau0 = Array.from({ length: 9 }, (_, i) => lo + ((hi - lo) * i) / 8);
    return { tau0Lo: lo, tau0Hi: hi, etaLo: 0, etaHi: 0.25, metric: { g00: 99, g01: 0, g11: 99 }, sampleTau0, samples: sampleTau0.map((t) => [0, 1, 2, 3, 4].map((j) => f(t, j / 4))) };
  };
  const run = [patch(0, 1), patch(1, 3)];

  it("reproduces a bilinear metric anywhere in the run, from the patch holding τ0", () => {
    for (const [t, frac] of [
      [0.1, 0.3],
      [0.99, 0.9],
      [1.5, 0.05],
      [2.999, 1],
    ]) {
      const g = bandMetricAt(run, t, frac);
      const want = f(t, frac);
      expect(g.g00).toBeCloseTo(want.g00, 12);
      expect(g.g01).toBeCloseTo(want.g01, 12);
      expect(g.g11).toBeCloseTo(want.g11, 12);
    }
  });

  it("falls back to the patch's own metric where a sample row is missing", () => {
    const gap = patch(0, 1);
    gap.samples[3] = null;
    expect(bandMetricAt([gap], 0.4, 0.5)).toEqual(gap.metric);
    expect(bandMetricAt([gap], 0.6, 0.5)).not.toEqual(gap.metric);
  });
});

describe("band geometry (constant metric, identity chart)", () => {
  const profile = bandProfile(region, [constantPatch()]) as BandProfile;
  const geometry = createBandGeometry(region, identityChart, [constantPatch()], profile);

  it("puts a normal's points orthogonal to the middle curve in the metric", () => {
    // Two Newton steps that take the curves as parallel: measured here |cos| ≤ 0.018 (1°), largest
    // near the chain's kink at τ0 ≈ 0.98 where the band's edge turns. A normal taken in the Euclidean
    // chart instead of the metric would be off by tens of degrees under this anisotropic G.
    for (const sigma of [0.8, 1.0, 1.2]) {
      expect(geometry.onNormal(sigma, 0.5)).toBe(sigma);
      const mid = geometry.toX(sigma, geometry.etaAtFraction(sigma, 0.5));
      const h = 1e-6;
      const ahead = geometry.toX(sigma + h, geometry.etaAtFraction(sigma + h, 0.5));
      const T = [ahead[0] - mid[0], ahead[1] - mid[1]];
      for (const f of [0, 1]) {
        const s = geometry.onNormal(sigma, f);
        const p = geometry.toX(s, geometry.etaAtFraction(s, f));
        const d = [p[0] - mid[0], p[1] - mid[1]];
        const cos = (G.g00 * d[0] * T[0] + G.g11 * d[1] * T[1]) / Math.sqrt((G.g00 * d[0] ** 2 + G.g11 * d[1] ** 2) * (G.g00 * T[0] ** 2 + G.g11 * T[1] ** 2));
        expect(Math.abs(cos)).toBeLessThan(0.03);
      }
    }
  });

  it("measures a cross-section as the sum of its segments' metric lengths, rising across the band", () => {
    const cum = geometry.across(1.0);
    expect(cum[0]).toBe(0);
    for (let j = 1; j <= ACROSS; j++) expect(cum[j]).toBeGreaterThan(cum[j - 1]);
    // Under a constant metric the sum is at least the straight distance between the ends.
    const s0 = geometry.onNormal(1.0, 0);
    const s1 = geometry.onNormal(1.0, 1);
    const p = geometry.toX(s0, geometry.etaAtFraction(s0, 0));
    const q = geometry.toX(s1, geometry.etaAtFraction(s1, 1));
    const chord = Math.sqrt(G.g00 * (q[0] - p[0]) ** 2 + G.g11 * (q[1] - p[1]) ** 2);
    expect(cum[ACROSS]).toBeGreaterThanOrEqual(chord * (1 - 1e-12));
    expect(cum[ACROSS]).toBeLessThan(chord * 1.01);
  });

  it("fractionAtDistance inverts a cumulative length, linearly within a segment", () => {
    const cum = Float64Array.from({ length: ACROSS + 1 }, (_, j) => j * j);
    expect(fractionAtDistance(cum, 0)).toBe(0);
    expect(fractionAtDistance(cum, 4)).toBe(2 / ACROSS);
    expect(fractionAtDistance(cum, 6.5)).toBe(2.5 / ACROSS);
    expect(fractionAtDistance(cum, 1e9)).toBe(1);
  });

  it("crossSectionGrid computes each node once and interpolates linearly between them", () => {
    let calls = 0;
    const fake = { across: (s: number) => (calls++, Float64Array.from({ length: ACROSS + 1 }, (_, j) => j * s)) } as unknown as BandGeometry;
    const crossAt = crossSectionGrid(fake, 0, 1, 4);
    expect(crossAt(0.375)[ACROSS]).toBeCloseTo(0.375 * ACROSS, 12);
    expect(crossAt(0.3)[2]).toBeCloseTo(0.6, 12);
    expect(calls).toBe(2);
  });
});

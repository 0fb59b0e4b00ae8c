import { describe, expect, it } from "vitest";
import { type Metric2 } from "../../../packages/core/src/bank/metric.js";
import { patchVariation, sampleRows, samplePatch, PATCH_SAMPLES_ETA, PATCH_SAMPLES_TAU0 } from "../../../packages/core/src/bank/patchSamples.js";
import type { MetricSampler } from "../../../packages/core/src/bank/metricSampler.js";
import { G, region } from "./flatFixture.js";

const scaled = (s: number): Metric2 => ({ g00: G.g00 * s, g01: G.g01 * s, g11: G.g11 * s });

describe("samplePatch", () => {
  it("integrates a constant density exactly over a box inside the region (trapezoid rule)", () => {
    // Where η_low ≤ etaLo across the box, patch ∩ region is the box itself: area = density × Δτ0 × Δη.
    const box = { tau0Lo: 0.9, tau0Hi: 1.1, etaLo: 0.246, etaHi: 0.249 };
    for (let k = 0; k <= 8; k++) expect(region.etaLow(0.9 + 0.025 * k)).toBeLessThan(box.etaLo);
    const sampler: MetricSampler = () => ({ g: G, density: 3 });
    const { grid, area } = samplePatch(region, sampler, box);
    expect(grid).toHaveLength(PATCH_SAMPLES_TAU0 * PATCH_SAMPLES_ETA);
    expect(area).toBeCloseTo(3 * 0.2 * 0.003, 14);
    // Samples run over the box's sides: first and last τ0, lowest and highest η.
    expect(grid[0]).toMatchObject({ tau0: 0.9, eta: 0.246, i: 0, j: 0 });
    expect(grid[grid.length - 1]).toMatchObject({ tau0: 1.1, eta: 0.249, i: 8, j: 4 });
  });

  it("skips τ0 columns where the box misses the region, and starts each column at η_low", () => {
    // Near τ0Min the region narrows to the equal-mass line (η_low → 1/4).
    const box = { tau0Lo: region.tau0Min, tau0Hi: region.tau0Min * 1.05, etaLo: 0.2, etaHi: 0.2499 };
    const { grid } = samplePatch(region, () => ({ g: G, density: 1 }), box);
    const columns = new Set(grid.map((s) => s.i));
    expect(columns.has(0)).toBe(false); // η_low(τ0Min) = 1/4 > etaHi
    for (const s of grid) if (s.j === 0) expect(s.eta).toBeCloseTo(Math.max(box.etaLo, region.etaLow(s.tau0)), 15);
    const rows = sampleRows(box, grid);
    expect(rows.samples[0]).toBeNull();
    expect(rows.samples[8]).toHaveLength(PATCH_SAMPLES_ETA);
  });
});

describe("patchVariation", () => {
  it("is zero for a constant metric and follows a metric that grows along τ0 only", () => {
    const box = { tau0Lo: 1.0, tau0Hi: 1.2, etaLo: 0.247, etaHi: 0.249 };
    const flat = patchVariation(samplePatch(region, () => ({ g: G, density: 1 }), box).grid);
    expect(flat.logVar).toBe(0);
    expect([flat.lamMin, flat.lamMax]).toEqual([1, 1]);
    // g ∝ τ0: against the middle sample (τ0 = 1.1) the ratio runs from 1/1.1 to 1.2/1.1.
    const growing = patchVariation(samplePatch(region, (t0) => ({ g: scaled(t0), density: 1 }), box).grid);
    expect(growing.mid).toMatchObject({ i: 4, j: 2 });
    expect(growing.lamMax).toBeCloseTo(1.2 / 1.1, 12);
    expect(growing.lamMin).toBeCloseTo(1.0 / 1.1, 12);
    expect(growing.logVarT).toBeCloseTo(Math.log(1.2), 12);
    expect(growing.logVarE).toBeCloseTo(0, 12);
  });
});

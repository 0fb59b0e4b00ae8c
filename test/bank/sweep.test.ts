import { describe, expect, it } from "vitest";
import { ajith2011, parseMatchFloorRange, sweepMatchFloors } from "@chirpsieve/core";
import { estimateSearchCost } from "../../packages/core/src/search/searchCost.js";
import { chooseSegmentLayout } from "../../packages/core/src/search/scan.js";

describe("match-floor sweep", () => {
  it("parses MIN:MAX:STEP ranges inclusively, without rounding drift", () => {
    expect(parseMatchFloorRange("0.90:0.99:0.01")).toEqual([0.9, 0.91, 0.92, 0.93, 0.94, 0.95, 0.96, 0.97, 0.98, 0.99]);
    expect(parseMatchFloorRange("0.97")).toEqual([0.97]);
    expect(() => parseMatchFloorRange("0.9:1.1:0.1")).toThrow(/strictly between 0 and 1/);
    expect(() => parseMatchFloorRange("0.99:0.9:0.01")).toThrow(/minimum/);
    expect(() => parseMatchFloorRange("a:b")).toThrow(/MIN:MAX:STEP/);
  });

  it("trades templates against rate loss: more templates and less loss at higher match floors", () => {
    const r = sweepMatchFloors({ massRangeSolar: [8, 20], fMinHz: 20, psd: ajith2011, matchFloors: [0.9, 0.95, 0.97], draws: 60, seed: "sweep" });
    expect(r.rows.map((x) => x.matchFloor)).toEqual([0.9, 0.95, 0.97]);
    for (let i = 1; i < r.rows.length; i++) {
      expect(r.rows[i].templateCount).toBeGreaterThan(r.rows[i - 1].templateCount);
      expect(r.rows[i].rateLoss).toBeLessThan(r.rows[i - 1].rateLoss);
    }
    for (const row of r.rows) {
      expect(row.rateLoss).toBeCloseTo(1 - row.meanCube, 12);
      // Owen 1996: a bank meeting its minimal match loses at most 1 − MM³ of the rate.
      expect(row.rateLoss).toBeLessThanOrEqual(1 - row.matchFloor ** 3);
      expect(row.cpuSecondsPerHour).toBeGreaterThan(0);
    }
    expect(r.cost?.method).toMatch(/the search's own kernel timed on this machine/);
    const c = r.cost!;
    expect(r.rows[0].cpuSecondsPerHour).toBeCloseTo(c.segmentsPerHour * (c.perSegmentSeconds + r.rows[0].templateCount * c.perTemplateSegmentSeconds), 9);
  });

  it("uses the search's own segment layout and scales the timed work by templates and segments per hour", () => {
    const templates = [
      { primaryMassSolar: 10, secondaryMassSolar: 9 },
      { primaryMassSolar: 12, secondaryMassSolar: 8 },
      { primaryMassSolar: 14, secondaryMassSolar: 10 },
    ];
    const cost = estimateSearchCost({ templates, fMinHz: 30, sampleRate: 1024, psd: ajith2011, backend: "fftjs" });
    const layout = chooseSegmentLayout({ templates, fMinHz: 30, snrThreshold: 6, chi2Bands: 0, loudestWithinSeconds: 1, psd: { kind: "estimate", segmentSeconds: 4, average: "median" } }, 1024, 3600 * 1024);
    expect(cost.segmentSamples).toBe(layout.size);
    expect(cost.segmentsPerHour).toBeCloseTo((3600 * 1024) / (layout.size - layout.invalidStart - layout.invalidEnd), 9);
    expect(cost.templatesTimed).toBe(3);
    expect(cost.perSegmentSeconds).toBeGreaterThan(0);
    expect(cost.perTemplateSegmentSeconds).toBeGreaterThan(0);
    expect(cost.cpuSecondsPerHour).toBeCloseTo(cost.segmentsPerHour * (cost.perSegmentSeconds + 3 * cost.perTemplateSegmentSeconds), 9);
  });
});

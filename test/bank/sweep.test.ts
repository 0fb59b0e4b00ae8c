import { describe, expect, it } from "vitest";
import { ajith2011, parseMatchFloorRange, sweepMatchFloors } from "@chirpsieve/core";
import { measureTemplateCost, scanCpuSecondsPerHour } from "../../packages/core/src/bank/scanCost.js";

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
    expect(r.cost?.method).toMatch(/timed runs on this machine/);
  });

  it("scales the measured per-template cost by templates × segments per hour", () => {
    const cost = measureTemplateCost({ longestTemplateSeconds: 3, highestFrequencyHz: 400, fMinHz: 20, repeats: 3 });
    expect(cost.segmentSeconds).toBe(8);
    expect(cost.sampleRate).toBe(1024);
    expect(cost.segmentsPerHour).toBe(900);
    expect(scanCpuSecondsPerHour(100, cost)).toBeCloseTo(100 * 900 * cost.secondsPerTemplateSegment, 12);
  });
});

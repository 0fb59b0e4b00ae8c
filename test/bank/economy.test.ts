import { describe, expect, it } from "vitest";
import { ajith2011, buildBankWithReport, verifyBank } from "@chirpsieve/core";

describe("economy of the placement", () => {
  it("a region many cells wide (1–10 M_sun from 10 Hz, MM 0.97) holds at most 1.3× its metric-volume estimate, and is covered", () => {
    // Metric-volume estimate: proper area ∫ sqrt(det g) dτ0 dτ3 over the hexagonal cell (3√3/2)(1 − MM)
    // (Owen, Phys. Rev. D 53, 6749 (1996)). Measured: 41 824 templates, 0.73× that estimate (57 020),
    // because the lattice follows the minimal-match contour of the linearised-phase match (placementMetric.ts),
    // which from 10 Hz reaches up to ~2 metric radii along the nearly degenerate direction. Against the
    // area under those contours (31 937 cells) the count is 1.31×, and 1.08× that area plus its boundary
    // layer (≈ 0.368 × perimeter / sqrt(1 − MM); metricVolume.ts).
    const { bank, report } = buildBankWithReport({ massRangeSolar: [1, 10], matchFloor: 0.97, fminHz: 10, psd: ajith2011 });
    expect(report.templateCount / report.volumeEstimate).toBeLessThanOrEqual(1.3);
    expect(report.templateCount).toBeGreaterThan(report.effectiveVolumeEstimate);
    expect(report.templateCount / report.effectiveVolumeEstimate).toBeLessThanOrEqual(1.4);
    expect(report.templateCount / report.boundaryAwareEstimate).toBeLessThanOrEqual(1.15);
    // The wider spacing is safe: every one of 300 seeded TaylorF2 draws reaches the minimal match.
    const coverage = verifyBank(bank, { draws: 300, seed: "economy-coverage", psd: ajith2011 });
    expect(coverage.fractionAboveMinimalMatch).toBe(1);
    expect(coverage.meanCube).toBeGreaterThanOrEqual(0.97 ** 3);
  });
});

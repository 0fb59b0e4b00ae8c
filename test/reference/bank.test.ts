// Outside-world checks of the template bank: the metric against directly computed matches, coverage,
// the event-rate bound and two-dimensional scaling (Owen, Phys. Rev. D 53, 6749 (1996)).
import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { ajith2011, buildBank, buildBankWithReport, verifyBank } from "@chirpsieve/core";
import { chirpTimesFromComponents, componentsFromMassEta, iscoFrequencyHz, massEtaFromChirpTimes } from "../../packages/core/src/bank/chirpTimeCoordinates.js";
import { chooseMatchGrid, createMatchComputer } from "../../packages/core/src/bank/match.js";
import { createChirpTimeMetric, metricDistanceSquared } from "../../packages/core/src/bank/metric.js";
import { createTaylorF2Generator } from "../../packages/core/src/waveform/taylorf2.js";

/** Pairs (template, template + Δ) along seeded random directions, at predicted mismatches `levels`. */
function metricVersusDirect(points: [number, number, number][], levels: number[], seed: string) {
  const rng = seedrandom(seed);
  const rows: { predicted: number; tangent: number; direct: number }[] = [];
  for (const [m1, m2, fLow] of points) {
    const metric = createChirpTimeMetric({ psd: ajith2011, fMinHz: fLow });
    const t = chirpTimesFromComponents(m1, m2, fLow);
    const g = metric.at(t.tau0, t.tau3);
    const tangent = metric.tangent(t.tau0, t.tau3);
    const grid = chooseMatchGrid({ fMaxHz: iscoFrequencyHz((m1 + m2) * 0.7), lagSpanS: 1 });
    const mc = createMatchComputer({ ...grid, psd: ajith2011, fMinHz: fLow });
    const gen = createTaylorF2Generator(grid.nBins, grid.dfHz);
    const a = new Float64Array(2 * grid.nBins);
    const b = new Float64Array(2 * grid.nBins);
    gen.generate(a, fLow, m1, m2);
    const l00 = Math.sqrt(g.g00);
    const l10 = g.g01 / l00;
    const l11 = Math.sqrt(g.g11 - l10 * l10);
    for (let k = 0; k < 16; k++) {
      const th = 2 * Math.PI * rng();
      // A unit step in metric distance: Δ = L⁻ᵀ (cos θ, sin θ) with g = L Lᵀ.
      const d3 = Math.sin(th) / l11;
      const d0 = (Math.cos(th) - l10 * d3) / l00;
      for (const level of levels) {
        const s = Math.sqrt(level);
        const p = massEtaFromChirpTimes(t.tau0 + s * d0, t.tau3 + s * d3, fLow);
        if (!(p.eta <= 0.25)) continue; // unphysical side of the equal-mass line
        const c = componentsFromMassEta(p.totalMassSolar, p.eta);
        gen.generate(b, fLow, c.m1, c.m2);
        const direct = 1 - mc.match(a, b, iscoFrequencyHz(m1 + m2), iscoFrequencyHz(p.totalMassSolar)).match;
        rows.push({ predicted: metricDistanceSquared(g, s * d0, s * d3), tangent: tangent.mismatch(s * d0, s * d3), direct });
      }
    }
  }
  return rows;
}

describe("template metric against directly computed matches (Owen 1996)", () => {
  // Owen, Phys. Rev. D 53, 6749 (1996): 1 − match ≈ g_ij Δθ^i Δθ^j for nearby templates. Light binaries,
  // where the ISCO cutoff lies far above the sensitive band (the cutoff term of placementMetric.ts is < 0.2 %).
  const rows = metricVersusDirect(
    [
      [1.6, 1.3, 40],
      [2.5, 1.2, 30],
      [1.5, 1.1, 30],
      [3, 2, 20],
    ],
    [0.005, 0.01, 0.015, 0.03, 0.05],
    "metric-vs-direct",
  );

  it("in its quadratic form agrees within 0.005 for predicted mismatches up to 0.015 in every sampled direction", () => {
    const small = rows.filter((r) => r.predicted <= 0.0151);
    expect(small.length).toBeGreaterThan(100);
    for (const r of small) expect(Math.abs(r.direct - r.predicted)).toBeLessThan(0.005);
  });

  it("in its all-orders form (the match of the linearised phase) agrees within 0.005 up to 0.05 in every direction", () => {
    // tangentMatch.ts: A(Δ) = max_t |J[exp(i(Δ·∂Ψ/∂θ + 2πf t))]|, whose second-order expansion is the
    // metric (Owen 1996, Sec. II). Measured here: largest |error| 0.0001 at 0.01, 0.0006 at 0.03, 0.0011 at 0.05.
    expect(rows.filter((r) => r.predicted > 0.04).length).toBeGreaterThan(40);
    for (const r of rows) expect(Math.abs(r.direct - r.tangent)).toBeLessThan(0.005);
  });

  it("in its quadratic form never underestimates the mismatch up to 0.05; at 0.03 the median error is below 0.005", () => {
    // Measured here (64 directions over 4 binaries): predicted 0.03 → median error 0.0033, 74 % of
    // directions within 0.005, largest 0.011; predicted 0.05 → median 0.0083, largest 0.022 (true
    // mismatch ≈ 0.03). The match falls more slowly than a parabola along the nearly degenerate
    // direction, so the quadratic metric is conservative: it never predicts too little mismatch.
    const large = rows.filter((r) => r.predicted > 0.0151);
    for (const r of large) {
      expect(r.direct).toBeLessThanOrEqual(r.predicted + 0.001);
      expect(r.direct).toBeGreaterThan(0.5 * r.predicted);
    }
    const errs = rows
      .filter((r) => Math.abs(r.predicted - 0.03) < 1e-9)
      .map((r) => Math.abs(r.direct - r.predicted))
      .sort((x, y) => x - y);
    expect(errs.length).toBeGreaterThan(30);
    expect(errs[Math.floor(errs.length / 2)]).toBeLessThan(0.005);
  });
});

describe("coverage of TaylorF2 signals (minimal match 0.97, ajith2011)", () => {
  it("1.2–2 M_sun from 40 Hz: at least 99% of 500 draws reach 0.97, and ⟨FF³⟩ ≥ MM³ (Owen 1996)", () => {
    const bank = buildBank({ massRangeSolar: [1.2, 2], matchFloor: 0.97, fMinHz: 40, psd: ajith2011 });
    const r = verifyBank(bank, { draws: 500, seed: "coverage-bns", psd: ajith2011 });
    expect(r.fractionAboveMinimalMatch).toBeGreaterThanOrEqual(0.99);
    // Event-rate loss of a bank with minimal match MM is at most 1 − MM³ (Owen 1996).
    expect(r.meanCube).toBeGreaterThanOrEqual(0.97 ** 3);
  });

  it("5–30 M_sun from 20 Hz: at least 99% of 500 draws reach 0.97, and ⟨FF³⟩ ≥ MM³", () => {
    const bank = buildBank({ massRangeSolar: [5, 30], matchFloor: 0.97, fMinHz: 20, psd: ajith2011 });
    const r = verifyBank(bank, { draws: 500, seed: "coverage-bbh", psd: ajith2011 });
    expect(r.fractionAboveMinimalMatch).toBeGreaterThanOrEqual(0.99);
    expect(r.meanCube).toBeGreaterThanOrEqual(0.97 ** 3);
  });

  it("draws uniform in chirp times are covered as well (1–3 M_sun from 40 Hz)", () => {
    const bank = buildBank({ massRangeSolar: [1, 3], matchFloor: 0.97, fMinHz: 40, psd: ajith2011 });
    const r = verifyBank(bank, { draws: 300, seed: "coverage-tau", drawSpace: "chirp-times", psd: ajith2011 });
    expect(r.fractionAboveMinimalMatch).toBeGreaterThanOrEqual(0.99);
  });
});

describe("two-dimensional scaling of the template count (Owen 1996)", () => {
  it("halving 1 − MM nearly doubles the count (between the 1-D √2 and the 2-D 2)", () => {
    // Owen 1996: N ∝ (1 − MM)^{−D/2} for a D-dimensional parameter space; D = 2 here, less the
    // boundary layer, which scales as (1 − MM)^{−1/2}.
    const a = buildBankWithReport({ massRangeSolar: [3, 10], matchFloor: 0.97, fMinHz: 20, psd: ajith2011 }).report;
    const b = buildBankWithReport({ massRangeSolar: [3, 10], matchFloor: 0.985, fMinHz: 20, psd: ajith2011 }).report;
    // Measured: 976 → 1878 templates, ×1.92.
    const ratio = b.templateCount / a.templateCount;
    expect(ratio).toBeGreaterThan(1.75);
    expect(ratio).toBeLessThan(2.1);
    // The metric-volume estimate itself doubles exactly.
    expect(b.volumeEstimate / a.volumeEstimate).toBeCloseTo(2, 6);
  });
});

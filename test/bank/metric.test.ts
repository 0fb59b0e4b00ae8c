import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { ajith2011 } from "@chirpsieve/core";
import { chirpTimesFromComponents, chirpTimesFromMassEta, componentsFromMassEta, iscoFrequencyHz, massEtaFromChirpTimes } from "../../packages/core/src/bank/chirpTimeCoordinates.js";
import { metricRatioRange } from "../../packages/core/src/bank/lattice.js";
import { createMassRegion } from "../../packages/core/src/bank/massRegion.js";
import { chooseMatchGrid, createMatchComputer } from "../../packages/core/src/bank/match.js";
import { createChirpTimeMetric, metricDistanceSquared } from "../../packages/core/src/bank/metric.js";
import { createPhaseChart } from "../../packages/core/src/bank/phaseChart.js";
import { placementMetric } from "../../packages/core/src/bank/placementMetric.js";
import { chirpTimes, massesFromChirpTimes } from "../../packages/core/src/waveform/chirpTimes.js";
import { createTaylorF2Generator, taylorF2Phase } from "../../packages/core/src/waveform/taylorf2.js";

describe("chirp-time coordinates", () => {
  it("agree with the waveform module's chirpTimes and massesFromChirpTimes", () => {
    for (const [m1, m2, f0] of [
      [1.4, 1.4, 40],
      [10, 1.4, 20],
      [30, 5, 15],
    ]) {
      const a = chirpTimesFromComponents(m1, m2, f0);
      const b = chirpTimes(m1, m2, f0);
      expect(a.tau0).toBeCloseTo(b.tau0, 10);
      expect(a.tau3).toBeCloseTo(b.tau3, 10);
      const back = massesFromChirpTimes(a.tau0, a.tau3, f0)!;
      const me = massEtaFromChirpTimes(a.tau0, a.tau3, f0);
      const c = componentsFromMassEta(me.totalMassSolar, me.eta);
      expect(c.m1).toBeCloseTo(back.m1Solar, 8);
      expect(c.m2).toBeCloseTo(back.m2Solar, 8);
    }
  });

  it("extend past the equal-mass line (η > 1/4) without failing", () => {
    const t = chirpTimesFromMassEta(3, 0.26, 30);
    const me = massEtaFromChirpTimes(t.tau0, t.tau3, 30);
    expect(me.eta).toBeCloseTo(0.26, 12);
    expect(me.totalMassSolar).toBeCloseTo(3, 12);
  });
});

describe("chirp-time metric", () => {
  it("matches an independent computation from finite differences of taylorF2Phase (1 %)", () => {
    // Independent path: ψ_i by central differences of the waveform module's phase, mapped through
    // massesFromChirpTimes, moments on a fine linear grid, then the same projection (Owen 1996, Eq. 2.27).
    const fLow = 40;
    const [m1, m2] = [1.6, 1.3];
    const t = chirpTimes(m1, m2, fLow);
    const g = createChirpTimeMetric({ psd: ajith2011, fMinHz: fLow }).at(t.tau0, t.tau3);
    const fUp = iscoFrequencyHz(m1 + m2);
    const n = 6000;
    const h0 = 1e-5 * t.tau0;
    const h3 = 1e-5 * t.tau3;
    const phase = (a: number, b: number, f: number): number => {
      const m = massesFromChirpTimes(a, b, fLow)!;
      return taylorF2Phase(f, m.m1Solar, m.m2Solar);
    };
    const cols: number[][] = [[], [], []];
    const w: number[] = [];
    for (let i = 0; i < n; i++) {
      const f = fLow + ((i + 0.5) * (fUp - fLow)) / n;
      w.push(Math.pow(f, -7 / 3) / ajith2011.evaluate(f));
      cols[0].push(2 * Math.PI * f);
      cols[1].push((phase(t.tau0 + h0, t.tau3, f) - phase(t.tau0 - h0, t.tau3, f)) / (2 * h0));
      cols[2].push((phase(t.tau0, t.tau3 + h3, f) - phase(t.tau0, t.tau3 - h3, f)) / (2 * h3));
    }
    const sw = w.reduce((s, x) => s + x, 0);
    const mean = cols.map((c) => c.reduce((s, x, i) => s + x * w[i], 0) / sw);
    const cov = (a: number, b: number): number =>
      (0.5 * cols[a].reduce((s, x, i) => s + (x - mean[a]) * (cols[b][i] - mean[b]) * w[i], 0)) / sw;
    const G00 = cov(1, 1) - cov(0, 1) ** 2 / cov(0, 0);
    const G01 = cov(1, 2) - (cov(0, 1) * cov(0, 2)) / cov(0, 0);
    const G11 = cov(2, 2) - cov(0, 2) ** 2 / cov(0, 0);
    const [lo, hi] = metricRatioRange(g, { g00: G00, g01: G01, g11: G11 });
    expect(lo).toBeGreaterThan(0.99);
    expect(hi).toBeLessThan(1.01);
  });

  it("is positive definite across the mass ranges used by the banks", () => {
    for (const [mMin, mMax, f] of [
      [1, 3, 30],
      [5, 30, 20],
      [1, 10, 10],
    ]) {
      const metric = createChirpTimeMetric({ psd: ajith2011, fMinHz: f });
      for (const [a, b] of [
        [mMin, mMin],
        [mMax, mMin],
        [mMax, mMax],
        [(mMin + mMax) / 2, mMin],
      ]) {
        const t = chirpTimesFromComponents(a, b, f);
        const g = metric.at(t.tau0, t.tau3);
        expect(g.g00).toBeGreaterThan(0);
        expect(g.g00 * g.g11 - g.g01 * g.g01).toBeGreaterThan(0);
      }
    }
  });

  it("predicts the direct match to 2 % of the mismatch at 0.002 (the quadratic limit)", () => {
    const fLow = 30;
    const [m1, m2] = [2.5, 1.2];
    const t = chirpTimes(m1, m2, fLow);
    const g = createChirpTimeMetric({ psd: ajith2011, fMinHz: fLow }).at(t.tau0, t.tau3);
    const grid = chooseMatchGrid({ fMaxHz: 1500, lagSpanS: 1 });
    const mc = createMatchComputer({ ...grid, psd: ajith2011, fMinHz: fLow });
    const gen = createTaylorF2Generator(grid.nBins, grid.dfHz);
    const a = new Float64Array(2 * grid.nBins);
    const b = new Float64Array(2 * grid.nBins);
    gen.generate(a, fLow, m1, m2);
    for (const [d0, d3] of [
      [1, 0],
      [0, 1],
      [1, 1],
      [1, -1],
    ]) {
      const u0 = d0 / Math.sqrt(g.g00);
      const u3 = d3 / Math.sqrt(g.g11);
      const s = Math.sqrt(0.002 / metricDistanceSquared(g, u0, u3));
      const p = massEtaFromChirpTimes(t.tau0 + s * u0, t.tau3 + s * u3, fLow);
      const c = componentsFromMassEta(p.totalMassSolar, Math.min(p.eta, 0.25));
      gen.generate(b, fLow, c.m1, c.m2);
      const mismatch = 1 - mc.match(a, b, iscoFrequencyHz(m1 + m2), iscoFrequencyHz(c.m1 + c.m2)).match;
      expect(Math.abs(mismatch - 0.002)).toBeLessThan(0.02 * 0.002);
    }
  });
});

describe("placement metric (tangent match and ISCO cutoff term)", () => {
  it("keeps the directly computed match ≥ MM on the boundary of its ball (light and heavy binaries)", () => {
    // placementMetric.ts: the largest centred ellipse inside {(1 − A(Δ)) + ½ D |∇ln M · Δ| ≤ 1 − MM},
    // shrunk by 1 %. Checked against matches of TaylorF2 waveforms (match.ts) at 24 seeded points of the
    // ellipse's boundary; the model itself must stay within the contour there too.
    const rng = seedrandom("placement-ellipse");
    for (const [m1, m2, fLow, mm] of [
      [1.4, 1.3, 40, 0.97],
      [5, 2, 10, 0.97],
      [25, 20, 20, 0.97],
      [12, 10, 40, 0.97],
      [2, 1.1, 30, 0.9],
    ]) {
      const metric = createChirpTimeMetric({ psd: ajith2011, fMinHz: fLow, pointsPerEFold: 60 });
      const t = chirpTimes(m1, m2, fLow);
      const tangent = metric.tangent(t.tau0, t.tau3);
      const G = placementMetric(tangent, t.tau0, t.tau3, mm);
      const D = tangent.sample.cutoffSensitivity;
      const grid = chooseMatchGrid({ fMaxHz: iscoFrequencyHz((m1 + m2) * 0.6), lagSpanS: fLow < 20 ? 16 : 2 });
      const mc = createMatchComputer({ ...grid, psd: ajith2011, fMinHz: fLow });
      const gen = createTaylorF2Generator(grid.nBins, grid.dfHz);
      const a = new Float64Array(2 * grid.nBins);
      const b = new Float64Array(2 * grid.nBins);
      gen.generate(a, fLow, m1, m2);
      const r = Math.sqrt(1 - mm);
      let worstModel = 0;
      let worstDirect = 0;
      for (let k = 0; k < 24; k++) {
        const th = 2 * Math.PI * rng();
        const u0 = Math.cos(th);
        const u3 = Math.sin(th);
        const s = r / Math.sqrt(metricDistanceSquared(G, u0, u3));
        const [d0, d3] = [s * u0, s * u3];
        const model = tangent.mismatch(d0, d3) + 0.5 * D * Math.abs(-d0 / t.tau0 + d3 / t.tau3);
        worstModel = Math.max(worstModel, model / (1 - mm));
        const p = massEtaFromChirpTimes(t.tau0 + d0, t.tau3 + d3, fLow);
        if (!(p.eta <= 0.25)) continue;
        const c = componentsFromMassEta(p.totalMassSolar, p.eta);
        gen.generate(b, fLow, c.m1, c.m2);
        const direct = 1 - mc.match(a, b, iscoFrequencyHz(m1 + m2), iscoFrequencyHz(p.totalMassSolar)).match;
        worstDirect = Math.max(worstDirect, direct / (1 - mm));
      }
      expect(worstModel).toBeLessThan(1.002);
      expect(worstDirect).toBeLessThan(1.0);
    }
  });

  it("reaches well beyond the quadratic metric along the nearly degenerate direction from 10 Hz", () => {
    // The ball of radius 0.173 (MM 0.97) for 5+2 M_sun from 10 Hz: measured 2.1× the metric's area.
    const metric = createChirpTimeMetric({ psd: ajith2011, fMinHz: 10, pointsPerEFold: 60 });
    const t = chirpTimes(5, 2, 10);
    const tangent = metric.tangent(t.tau0, t.tau3);
    const G = placementMetric(tangent, t.tau0, t.tau3, 0.97);
    const g = tangent.sample.g;
    const areaRatio = Math.sqrt((g.g00 * g.g11 - g.g01 ** 2) / (G.g00 * G.g11 - G.g01 ** 2));
    expect(areaRatio).toBeGreaterThan(1.5);
  });

  it("models heavy binaries' mismatch as d² + ½ D |Δ ln M| to within 15 % (and never below the truth by more)", () => {
    // The ISCO of 25+20 M_sun (98 Hz) lies in band from 20 Hz: the cutoff loss is linear in |Δ ln M|.
    const fLow = 20;
    for (const [m1, m2] of [
      [25, 20],
      [30, 6],
      [10, 5],
    ]) {
      const metric = createChirpTimeMetric({ psd: ajith2011, fMinHz: fLow });
      const t = chirpTimes(m1, m2, fLow);
      const s = metric.sample(t.tau0, t.tau3);
      const g = s.g;
      const grid = chooseMatchGrid({ fMaxHz: iscoFrequencyHz((m1 + m2) * 0.7), lagSpanS: 1 });
      const mc = createMatchComputer({ ...grid, psd: ajith2011, fMinHz: fLow });
      const gen = createTaylorF2Generator(grid.nBins, grid.dfHz);
      const a = new Float64Array(2 * grid.nBins);
      const b = new Float64Array(2 * grid.nBins);
      for (const ang of [0, 60, 120]) {
        const th = (ang * Math.PI) / 180;
        const d0 = Math.cos(th) / Math.sqrt(g.g00);
        const d3 = Math.sin(th) / Math.sqrt(g.g11);
        const sc = Math.sqrt(0.005 / metricDistanceSquared(g, d0, d3));
        const pa = massEtaFromChirpTimes(t.tau0 - (sc * d0) / 2, t.tau3 - (sc * d3) / 2, fLow);
        const pb = massEtaFromChirpTimes(t.tau0 + (sc * d0) / 2, t.tau3 + (sc * d3) / 2, fLow);
        if (pa.eta > 0.25 || pb.eta > 0.25) continue;
        const ca = componentsFromMassEta(pa.totalMassSolar, pa.eta);
        const cb = componentsFromMassEta(pb.totalMassSolar, pb.eta);
        gen.generate(a, fLow, ca.m1, ca.m2);
        gen.generate(b, fLow, cb.m1, cb.m2);
        const direct = 1 - mc.match(a, b, iscoFrequencyHz(ca.m1 + ca.m2), iscoFrequencyHz(cb.m1 + cb.m2)).match;
        const model = 0.005 + 0.5 * s.cutoffSensitivity * Math.abs(Math.log(pb.totalMassSolar / pa.totalMassSolar));
        expect(direct).toBeLessThan(model * 1.02);
        expect(direct).toBeGreaterThan(model * 0.85);
      }
    }
  });

});

describe("phase chart", () => {
  it("is nearly flat: the pulled-back metric varies by less than 30 % over 1–3 M_sun from 30 Hz", () => {
    // In (τ0, τ3) the same metric varies by a factor ≈ 2.7 (0.64–1.72 about the centre).
    const region = createMassRegion({ minMassSolar: 1, maxMassSolar: 3 }, 30);
    const metric = createChirpTimeMetric({ psd: ajith2011, fMinHz: 30 });
    const chart = createPhaseChart({ psd: ajith2011, fMinHz: 30, region });
    const t0c = 0.5 * (region.tau0Min + region.tau0Max);
    const t3c = region.tau3At(t0c, 0.24);
    const ref = chart.pullBack(metric.at(t0c, t3c), t0c, t3c);
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = 0; i <= 10; i++) {
      const t0 = region.tau0Min + ((region.tau0Max - region.tau0Min) * i) / 10;
      const el = region.etaLow(t0);
      for (const f of [0, 0.5, 1]) {
        const eta = el + (0.25 - el) * f;
        const t3 = region.tau3At(t0, eta);
        const [a, b] = metricRatioRange(chart.pullBack(metric.at(t0, t3), t0, t3), ref);
        lo = Math.min(lo, a);
        hi = Math.max(hi, b);
      }
    }
    expect(hi / lo).toBeLessThan(1.6);
    expect(lo).toBeGreaterThan(0.7);
    expect(hi).toBeLessThan(1.3);
  });

  it("inverts itself: toTau(toX(τ)) = τ", () => {
    const region = createMassRegion({ minMassSolar: 5, maxMassSolar: 30 }, 20);
    const chart = createPhaseChart({ psd: ajith2011, fMinHz: 20, region });
    for (const [m1, m2] of [
      [5, 5],
      [30, 5],
      [20, 18],
    ]) {
      const t = chirpTimesFromComponents(m1, m2, 20);
      const [x0, x1] = chart.toX(t.tau0, t.tau3);
      const back = chart.toTau(x0, x1, t.tau0 * 1.05, t.tau3 * 0.97)!;
      expect(back[0]).toBeCloseTo(t.tau0, 8);
      expect(back[1]).toBeCloseTo(t.tau3, 8);
    }
  });
});

import { beforeAll, describe, expect, it } from "vitest";
import kstest from "@stdlib/stats-kstest";
import { analyseCoincidences } from "@chirpsieve/core";
import { type CoincidenceCandidate } from "../../packages/core/src/coinc/analyseCoincidences.js";
import { interSiteDelay } from "../../packages/core/src/coinc/interSiteDelay.js";
import { BUILTIN_SITES } from "../../packages/core/src/coinc/sites.js";
import { poissonTriggers, siteStream } from "./syntheticTriggers.js";

// Synthetic single-site trigger streams stand in for independent Gaussian noise at two sites:
// Poisson arrival times, uniformly drawn templates, SNRs from the χ²₂ tail above threshold
// (what clustered matched-filter output of Gaussian noise gives; see syntheticTriggers.ts).
const [A, B, C3] = BUILTIN_SITES.map((s) => s.detector);
const TOLERANCE = 0.005;
const WINDOW = interSiteDelay(A, B) + TOLERANCE;
const TEMPLATES = 40;

/** Per-template counts of the triggers above `x`. */
function perTemplate(triggers: CoincidenceCandidate[], x: number): number[] {
  const n = new Array<number>(TEMPLATES).fill(0);
  for (const t of triggers) if (t.reweightedSnr > x) n[t.templateIndex]++;
  return n;
}

/**
 * Expected coincidences per slide between two independent Poisson streams, same template only:
 * Σ_m R1m R2m · 2τ · T = Σ_m n1m n2m · 2τ / T, with τ the coincidence window (light-travel time +
 * timing tolerance) — the standard accidental-coincidence rate of two Poisson streams (common
 * practice, no source).
 */
function expectedPerSlide(a: CoincidenceCandidate[], b: CoincidenceCandidate[], x: number, seconds: number): number {
  const na = perTemplate(a, x);
  const nb = perTemplate(b, x);
  let s = 0;
  for (let m = 0; m < TEMPLATES; m++) s += na[m] * nb[m];
  return (s * 2 * WINDOW) / seconds;
}

describe("time-slide background of two independent noise streams", () => {
  const seconds = 20_000;
  const opts = { rate: 1, templates: TEMPLATES, threshold: 5.5, startTime: 5e5, seconds };
  const a = poissonTriggers({ ...opts, seed: "bg-site-a" });
  const b = poissonTriggers({ ...opts, seed: "bg-site-b" });
  // Same template only; 40 templates and a short loudest-within span keep the share of coincidences
  // that clustering merges (two sharing a trigger, or two within 0.1 s) below ≈ 0.5 %.
  const r = analyseCoincidences([siteStream(A, a, 5e5, seconds), siteStream(B, b, 5e5, seconds)], {
    chirpMassTolerance: 0,
    loudestWithinSeconds: 0.1,
    timingToleranceSeconds: TOLERANCE,
  });

  it("has background livetime = slides × coincident analysed time", () => {
    expect(r.summary.slidesPerSide).toBe(100);
    expect(r.summary.slides).toBe(200);
    expect(r.summary.foregroundSeconds).toBe(seconds);
    expect(r.summary.backgroundSeconds).toBe(200 * seconds);
  });

  it("finds as many foreground coincidences as R1 · R2 · 2τ · T predicts (Poisson, 4σ)", () => {
    const expected = expectedPerSlide(a, b, 5.5, seconds);
    const observed = r.coincidences.length;
    expect(Math.abs(observed - expected)).toBeLessThan(4 * Math.sqrt(expected));
  });

  it("finds as many background coincidences above thresholds as 2K · R1(ρ) · R2(ρ) · 2τ · T predicts (4σ)", () => {
    for (const x of [5.5, 5.8, 6]) {
      const expected = r.summary.slides * expectedPerSlide(a, b, x, seconds);
      // Background coincidences whose members are both above x: the same analysis on the streams cut at x.
      const cut = (s: CoincidenceCandidate[]) => s.filter((t) => t.reweightedSnr > x);
      const observed = analyseCoincidences([siteStream(A, cut(a), 5e5, seconds), siteStream(B, cut(b), 5e5, seconds)], {
        chirpMassTolerance: 0,
        loudestWithinSeconds: 0.1,
        timingToleranceSeconds: TOLERANCE,
      }).summary.backgroundCoincidences;
      // Slides pair different triggers, so their counts are close to independent Poisson draws.
      expect(Math.abs(observed - expected)).toBeLessThan(4 * Math.sqrt(expected) + 1);
    }
  });
});

describe("time-slide background of three independent noise streams", () => {
  it("sums the pairs' accidental rates over 2K slides, each pair offset in every slide (4σ + 1 %)", () => {
    const seconds = 5000;
    const dets = [A, B, C3];
    const opts = { rate: 1, templates: TEMPLATES, threshold: 5.5, startTime: 0, seconds };
    const streams = dets.map((d) => poissonTriggers({ ...opts, seed: `three-${d.name}` }));
    const r = analyseCoincidences(
      dets.map((d, i) => siteStream(d, streams[i], 0, seconds)),
      { chirpMassTolerance: 0, loudestWithinSeconds: 0.1, timingToleranceSeconds: TOLERANCE },
    );
    let perSlide = 0;
    for (let i = 0; i < 3; i++) {
      for (let j = i + 1; j < 3; j++) {
        const ni = perTemplate(streams[i], 0);
        const nj = perTemplate(streams[j], 0);
        let s = 0;
        for (let m = 0; m < TEMPLATES; m++) s += ni[m] * nj[m];
        perSlide += (s * 2 * (interSiteDelay(dets[i], dets[j]) + TOLERANCE)) / seconds;
      }
    }
    // Triple coincidences are ~R · 2τ / M ≈ 0.2 % of the pairs (and then replace pairs): ignored.
    const expected = r.summary.slides * perSlide;
    const observed = r.summary.backgroundCoincidences;
    expect(r.summary.slides).toBe(200);
    expect(Math.abs(observed - expected)).toBeLessThan(4 * Math.sqrt(expected) + 0.01 * expected);
    expect(Math.abs(r.coincidences.length - perSlide)).toBeLessThan(4 * Math.sqrt(perSlide));
  });
});

describe("false-alarm probabilities under the noise-only hypothesis", () => {
  // In noise alone, the FAP of the loudest foreground coincidence of a realisation is uniform on
  // (0, 1) (FAP = P(at least one noise coincidence this loud in T_fg)); quieter ones are not, by
  // construction. Over all foreground coincidences, the fraction of background at least as loud
  // is uniform instead. 200 seeded realisations of 400 s, 10 templates, ≈ 13 coincidences each,
  // 50 slides per side.
  const loudestFaps: number[] = [];
  const fractions: number[] = [];
  let empty = 0;
  beforeAll(() => {
    for (let trial = 0; trial < 200; trial++) {
      const opts = { rate: 2, templates: 10, threshold: 5.5, startTime: 0, seconds: 400 };
      const a = poissonTriggers({ ...opts, seed: `fap-a-${trial}` });
      const b = poissonTriggers({ ...opts, seed: `fap-b-${trial}` });
      const r = analyseCoincidences([siteStream(A, a, 0, 400), siteStream(B, b, 0, 400)], {
        chirpMassTolerance: 0,
        loudestWithinSeconds: 0.1,
        slideStepSeconds: 2,
        slidesPerSide: 50,
      });
      if (r.coincidences.length === 0) {
        empty++;
        continue;
      }
      let loudest = r.coincidences[0];
      for (const c of r.coincidences) {
        if (c.rankingStatistic > loudest.rankingStatistic) loudest = c;
        fractions.push(c.backgroundLouder / r.summary.backgroundCoincidences);
      }
      loudestFaps.push(loudest.falseAlarmProbability);
    }
  });

  it("the loudest foreground coincidence's FAP is uniform on (0, 1) (KS test, @stdlib/stats-kstest)", () => {
    expect(empty).toBe(0);
    const ks = kstest(loudestFaps, "uniform", 0, 1);
    const mean = loudestFaps.reduce((s, x) => s + x, 0) / loudestFaps.length;
    expect(ks.pValue).toBeGreaterThan(0.01);
    // Mean of U(0,1) is 1/2 with standard error 1/√(12 n).
    expect(Math.abs(mean - 0.5)).toBeLessThan(4 / Math.sqrt(12 * loudestFaps.length));
  });

  it("the share of background at least as loud is uniform over all foreground coincidences (KS test)", () => {
    const ks = kstest(fractions, "uniform", 0, 1);
    expect(ks.pValue).toBeGreaterThan(0.01);
  });
});

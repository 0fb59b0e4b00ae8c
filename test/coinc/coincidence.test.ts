import { describe, expect, it } from "vitest";
import { InputError, JULIAN_YEAR, analyseCoincidences } from "@chirpsieve/core";
import { type CoincidenceCandidate } from "../../packages/core/src/coinc/analyseCoincidences.js";
import { interSiteDelay } from "../../packages/core/src/coinc/interSiteDelay.js";
import { BUILTIN_SITES } from "../../packages/core/src/coinc/sites.js";
import { poissonTriggers, siteStream, templateChirpMass } from "./syntheticTriggers.js";

const [A, B, C3] = BUILTIN_SITES.map((s) => s.detector);
const SPAN = 1000;

function trig(t: number, rho: number, template = 3, chirpMassSolar = templateChirpMass(template)): CoincidenceCandidate {
  return { coalescenceTime: t, snr: rho + 0.5, reweightedSnr: rho, chi2: 1, chi2Dof: 2, effectiveDistanceMpc: 80, templateIndex: template, chirpMassSolar };
}

describe("forming coincidences", () => {
  it("pairs triggers within light-travel time + tolerance and the same template, ranked by the quadrature sum", () => {
    const ltt = interSiteDelay(A, B);
    const r = analyseCoincidences([
      siteStream(A, [trig(100, 8), trig(300, 7), trig(500, 9)], 0, SPAN),
      siteStream(B, [trig(100 + ltt + 0.004, 6), trig(300 + ltt + 0.006, 7), trig(500.01, 9, 4)], 0, SPAN),
    ]);
    expect(r.coincidences.length).toBe(1);
    const c = r.coincidences[0];
    expect(c.coalescenceTime).toBe(100);
    expect(c.referenceSite).toBe("site-a");
    // Network reweighted SNR: sqrt(8² + 6²) = 10 (quadrature sum; common practice, no source).
    expect(c.rankingStatistic).toBeCloseTo(10, 12);
    expect(Object.keys(c.sites)).toEqual(["site-a", "site-b"]);
    expect(c.sites["site-b"]).toEqual({
      snr: 6.5, reweightedSnr: 6, coalescenceTime: 100 + ltt + 0.004, chi2: 1, chi2Dof: 2, effectiveDistanceMpc: 80, templateIndex: 3, chirpMassSolar: templateChirpMass(3),
    });
    expect(c.falseAlarmRateSource).toBe("time-slides");
    // The 300 s pair is 1 ms outside the window; the 500 s pair has templates 10 % apart in chirp mass.
    expect(r.singles.map((s) => `${s.site}@${s.coalescenceTime.toFixed(0)}`)).toEqual([
      "site-a@300", "site-a@500", "site-b@300", "site-b@500",
    ]);
  });

  it("matches different templates within the chirp-mass tolerance", () => {
    const net = (tol: number) =>
      analyseCoincidences(
        [siteStream(A, [trig(100, 8, 3, 2.0)], 0, SPAN), siteStream(B, [trig(100.01, 8, 4, 2.08)], 0, SPAN)],
        { chirpMassTolerance: tol },
      ).coincidences.length;
    expect(net(0.05)).toBe(1); // |ΔM| = 0.08 ≤ 0.05 × 2.04
    expect(net(0.03)).toBe(0);
    expect(net(0)).toBe(0);
  });

  it("builds three-site coincidences with one trigger per site and keeps the loudest combination", () => {
    const r = analyseCoincidences(
      [
        siteStream(A, [trig(200, 7)], 0, SPAN),
        siteStream(B, [trig(200.01, 6), trig(200.02, 6.5)], 0, SPAN),
        siteStream(C3, [trig(199.99, 5.5), trig(600, 7)], 0, SPAN),
        // (no site-b or site-a partner for site-c at 600 s)
      ],
      { loudestWithinSeconds: 0.5 },
    );
    expect(r.coincidences.length).toBe(1);
    const c = r.coincidences[0];
    expect(Object.keys(c.sites)).toEqual(["site-a", "site-b", "site-c"]);
    expect(c.sites["site-b"].reweightedSnr).toBe(6.5);
    expect(c.rankingStatistic).toBeCloseTo(Math.hypot(7, 6.5, 5.5), 12);
    // The other site-b trigger and the lone site-c one are singles.
    expect(r.singles.map((s) => s.site)).toEqual(["site-b", "site-c"]);
    expect(r.summary.interSiteDelays.length).toBe(3);
    expect(r.summary.slidesPerSide).toBe(Math.min(100, Math.floor((SPAN - 7) / (4 * 7))));
  });

  it("reports a pair of non-reference sites against the first of them", () => {
    const r = analyseCoincidences([
      siteStream(A, [trig(50, 6)], 0, SPAN),
      siteStream(B, [trig(400, 7)], 0, SPAN),
      siteStream(C3, [trig(400.01, 7)], 0, SPAN),
    ]);
    expect(r.coincidences.length).toBe(1);
    expect(r.coincidences[0].referenceSite).toBe("site-b");
    expect(r.coincidences[0].coalescenceTime).toBe(400);
  });

  it("gives singles a rate from their own site's triggers, labelled as such", () => {
    const r = analyseCoincidences([
      siteStream(A, [trig(10, 6), trig(20, 9), trig(30, 7)], 0, SPAN),
      siteStream(B, [trig(700, 5)], 0, SPAN),
    ]);
    const a = r.singles.filter((s) => s.site === "site-a");
    expect(a.map((s) => s.louderAtSite)).toEqual([2, 0, 1]);
    expect(a[0].falseAlarmRatePerYear).toBeCloseTo((2 / SPAN) * JULIAN_YEAR, 6);
    expect(a[0].falseAlarmProbability).toBeCloseTo(1 - Math.exp(-2), 12);
    expect(a[1].falseAlarmRateIsUpperLimit).toBe(true);
    expect(a[1].falseAlarmRatePerYear).toBeCloseTo((1 / SPAN) * JULIAN_YEAR, 6);
    expect(a.every((s) => s.falseAlarmRateSource === "single-site-trigger-rate")).toBe(true);
  });

  it("gives a loud injected coincidence a FAR upper limit, flagged, and a tiny FAP", () => {
    const seconds = 4000;
    const opts = { rate: 0.5, templates: 10, threshold: 5.5, startTime: 1000, seconds };
    const a = poissonTriggers({ ...opts, seed: "loud-a" });
    const b = poissonTriggers({ ...opts, seed: "loud-b" });
    a.push(trig(3000, 20, 2));
    b.push(trig(3000.012, 18, 2));
    const r = analyseCoincidences([siteStream(A, a, 1000, seconds), siteStream(B, b, 1000, seconds)]);
    const loud = r.coincidences.find((c) => c.coalescenceTime === 3000);
    expect(loud).toBeDefined();
    expect(r.summary.slides).toBe(200);
    expect(r.summary.backgroundSeconds).toBe(200 * seconds);
    expect(loud!.backgroundLouder).toBe(0);
    expect(loud!.falseAlarmRateIsUpperLimit).toBe(true);
    expect(loud!.falseAlarmRatePerYear).toBeCloseTo((JULIAN_YEAR / (200 * seconds)), 6);
    expect(loud!.falseAlarmRatePerYear).toBe(r.summary.falseAlarmRateLimitPerYear);
    // FAP < 1 − exp(−T_fg / T_bg) = 1 − exp(−1/200) ≈ 0.005: the statistical limit of 200 slides.
    expect(loud!.falseAlarmProbability).toBeCloseTo(-Math.expm1(-1 / 200), 12);
    expect(loud!.falseAlarmProbability).toBeLessThan(0.01);
    // The quieter noise coincidences have background louder than them and FAPs in (0, 1].
    for (const c of r.coincidences) {
      expect(c.falseAlarmProbability).toBeGreaterThan(0);
      expect(c.falseAlarmProbability).toBeLessThanOrEqual(1);
      if (c !== loud) expect(c.rankingStatistic).toBeLessThan(loud!.rankingStatistic);
    }
  });

  it("rejects networks it cannot analyse with one-line InputErrors", () => {
    const s = siteStream(A, [trig(1, 6)], 0, SPAN);
    expect(() => analyseCoincidences([s])).toThrow(/coincidence needs at least two sites \(got 1\)/);
    expect(() => analyseCoincidences([s, s])).toThrow(/site "site-a" is listed twice/);
    expect(() => analyseCoincidences([s, siteStream(B, [], 2000, 100)])).toThrow(InputError);
    expect(() => analyseCoincidences([siteStream(A, [], 0, 10), siteStream(B, [], 0, 10)])).toThrow(
      /shared span of 10\.0 s is too short for time slides of 7 s/,
    );
    expect(() => analyseCoincidences([s, siteStream(B, [], 0, SPAN)], { slideStepSeconds: 0.05 })).toThrow(
      /slide step 0\.05 s must exceed twice the widest coincidence window/,
    );
    expect(() => analyseCoincidences([s, siteStream(B, [], 0, SPAN)], { slidesPerSide: 2.5 })).toThrow(/^slidesPerSide: must be a whole number/);
    expect(() => analyseCoincidences([s, siteStream(B, [{ ...trig(3, 6), templateIndex: -1 }], 0, SPAN)])).toThrow(
      /site "site-b": candidate 0: templateIndex must be/,
    );
  });
});

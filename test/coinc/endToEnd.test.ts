import { describe, expect, it } from "vitest";
import { ajith2011, analyseCoincidences, arrayInput, chirpMass, colouredNoise, loadFftBackends, searchStrain, type SearchOptions, type SearchTemplate } from "@chirpsieve/core";
import { interSiteDelay } from "../../packages/core/src/coinc/interSiteDelay.js";
import { BUILTIN_SITES } from "../../packages/core/src/coinc/sites.js";

// End to end on real search triggers: the single-site search runs on two independent seeded
// Gaussian noise series (one per invented site, same span), then coincidence and time slides.
describe("coincidence of two single-site searches of independent Gaussian noise", () => {
  it("gives FAPs in (0, 1], coincidences within the window and the right background livetime", async () => {
    await loadFftBackends();
    const fs = 2048;
    const seconds = 128;
    const start = 1000;
    // 20 equal-mass templates, chirp masses 3–9 M_sun in steps of ≈ 6 % (a stand-in bank).
    const templates: SearchTemplate[] = [];
    for (let i = 0; i < 20; i++) {
      const m = (3 * 1.06 ** i) / 0.25 ** 0.6 / 2;
      templates.push({ primaryMassSolar: m, secondaryMassSolar: m });
    }
    const options: SearchOptions = {
      templates,
      fMinHz: 30,
      snrThreshold: 4,
      chi2Bands: 4,
      loudestWithinSeconds: 0.1,
      psd: { kind: "model", model: ajith2011 },
      fftBackend: "pffft",
    };
    const [A, B] = BUILTIN_SITES.map((s) => s.detector);
    const scans = [];
    for (const [det, seed] of [[A, "e2e-site-a"], [B, "e2e-site-b"]] as const) {
      const data = colouredNoise(ajith2011, seconds * fs, fs, seed);
      const { candidates, summary } = await searchStrain(arrayInput(data, fs, start, `${det.name}.synthetic`), options);
      scans.push({ detector: det, candidates, analysedSeconds: summary.analysedSeconds, startTime: start, endTime: start + seconds });
    }
    const r = analyseCoincidences(scans, { slideStepSeconds: 1 });
    const fg = Math.min(scans[0].analysedSeconds, scans[1].analysedSeconds);
    expect(scans[0].candidates.length).toBeGreaterThan(20);
    expect(r.summary.slidesPerSide).toBe(63); // ⌊(128 − 1) / 2⌋
    expect(r.summary.foregroundSeconds).toBe(fg);
    expect(r.summary.backgroundSeconds).toBeCloseTo(126 * fg, 9);
    expect(r.summary.backgroundCoincidences).toBeGreaterThan(0);
    // Noise only: the foreground count is a Poisson draw with the background's mean per slide (4σ).
    const perSlide = r.summary.backgroundCoincidences / r.summary.slides;
    expect(Math.abs(r.coincidences.length - perSlide)).toBeLessThan(4 * Math.sqrt(perSlide) + 1);
    const window = interSiteDelay(A, B) + 0.005;
    for (const c of r.coincidences) {
      expect(c.falseAlarmProbability).toBeGreaterThan(0);
      expect(c.falseAlarmProbability).toBeLessThanOrEqual(1);
      const a = c.sites["site-a"];
      const b = c.sites["site-b"];
      expect(Math.abs(a.coalescenceTime - b.coalescenceTime)).toBeLessThanOrEqual(window);
      const m = (x: typeof a) => x.chirpMassSolar;
      expect(Math.abs(m(a) - m(b))).toBeLessThanOrEqual(0.05 * 0.5 * (m(a) + m(b)) + 1e-12);
      expect(c.rankingStatistic).toBeCloseTo(Math.hypot(a.reweightedSnr, b.reweightedSnr), 12);
    }
    expect(r.singles.length + 2 * r.coincidences.length).toBe(scans[0].candidates.length + scans[1].candidates.length);
    expect(chirpMass(templates[0].primaryMassSolar, templates[0].secondaryMassSolar)).toBeCloseTo(3, 9);
  });
});

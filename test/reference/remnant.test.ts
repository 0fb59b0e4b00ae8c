// Remnant of a black-hole merger, its ringdown frequency, and the inspiral's share of the SNR.
import { describe, expect, it } from "vitest";
import { inspiralEdgeOfBank } from "@chirpsieve/core";
import { InputError, M_SUN, ajith2011 } from "@chirpsieve/core";
import { flatPsd } from "../../packages/core/src/noise/psdModel.js";
import { iscoGwFrequency } from "../../packages/core/src/physics/isco.js";
import { kerrIscoRadius, remnantOfMerger } from "../../packages/core/src/physics/remnant.js";
import { dominantModeFrequency, ringdownFrequencyHz } from "../../packages/core/src/physics/ringdown.js";
import { inspiralSnrShare } from "../../packages/core/src/waveform/inspiralShare.js";

describe("remnant of an aligned-spin black-hole merger", () => {
  it("equal masses without spin: spin ≈ 0.69 and mass ≈ 0.95 M (numerical relativity, e.g. Buonanno, Cook & Pretorius, Phys. Rev. D 75, 124018 (2007); from memory, ±0.01)", () => {
    const r = remnantOfMerger(30, 30);
    expect(Math.abs(r.spin - 0.69)).toBeLessThan(0.01);
    expect(Math.abs(r.massFraction - 0.95)).toBeLessThan(0.01);
  });
  it("tends to the larger hole unchanged in the test-mass limit (m2/m1 → 0: a_f → χ1, M_f → M; common practice, no source)", () => {
    for (const chi of [-0.5, 0, 0.7]) {
      const r = remnantOfMerger(1e4, 1, chi, 0.3);
      expect(Math.abs(r.spin - chi)).toBeLessThan(2e-3);
      expect(Math.abs(r.massFraction - 1)).toBeLessThan(1e-3);
    }
  });
  it("spins up with aligned and down with anti-aligned component spins, and does not depend on the order of the bodies", () => {
    const spins = [-0.8, -0.4, 0, 0.4, 0.8].map((chi) => remnantOfMerger(20, 12, chi, chi).spin);
    for (let i = 1; i < spins.length; i++) expect(spins[i]).toBeGreaterThan(spins[i - 1]);
    expect(remnantOfMerger(12, 20, 0.1, 0.6)).toEqual(remnantOfMerger(20, 12, 0.6, 0.1));
  });
  it("radiates more for aligned spins (mass fraction falls with χ1 = χ2)", () => {
    const masses = [-0.8, 0, 0.8].map((chi) => remnantOfMerger(20, 20, chi, chi).massFraction);
    expect(masses[0]).toBeGreaterThan(masses[1]);
    expect(masses[1]).toBeGreaterThan(masses[2]);
  });
  it("Kerr ISCO radius is 6, 1 and 9 G M/c² for a = 0, 1, −1 (Bardeen, Press & Teukolsky, ApJ 178, 347 (1972))", () => {
    expect(kerrIscoRadius(0)).toBeCloseTo(6, 12);
    expect(kerrIscoRadius(1)).toBeCloseTo(1, 6);
    expect(kerrIscoRadius(-1)).toBeCloseTo(9, 12);
  });
  it("rejects masses and spins out of range with InputError naming the parameter", () => {
    expect(() => remnantOfMerger(-1, 2)).toThrow(/m1Solar/);
    expect(() => remnantOfMerger(1, 2, 0, 1)).toThrow(InputError);
    expect(() => ringdownFrequencyHz(0, 0.5)).toThrow(/massSolar/);
    expect(() => dominantModeFrequency(1)).toThrow(/spin/);
  });
});

describe("dominant ringdown mode (Berti, Cardoso & Will, Phys. Rev. D 73, 064030 (2006), fit evaluated)", () => {
  it("a 62 M_sun remnant of spin 0.69 rings at ≈ 277 Hz (from memory, ±3%)", () => {
    expect(Math.abs(ringdownFrequencyHz(62, 0.69) / 277 - 1)).toBeLessThan(0.03);
  });
  it("a non-spinning remnant is within 2% of the exact Schwarzschild value M ω ≈ 0.3737 (from memory)", () => {
    expect(Math.abs(dominantModeFrequency(0).massTimesOmega / 0.3737 - 1)).toBeLessThan(0.02);
  });
  it("the frequency and quality factor rise with spin", () => {
    const a = dominantModeFrequency(0.2), b = dominantModeFrequency(0.9);
    expect(b.massTimesOmega).toBeGreaterThan(a.massTimesOmega);
    expect(b.quality).toBeGreaterThan(a.quality);
  });
});

describe("inspiral share of the SNR when the signal continues to the ringdown frequency", () => {
  it("in white noise equals √((fL^{−4/3} − f_isco^{−4/3}) / (fL^{−4/3} − f_ring^{−4/3})) (the integral of f^{−7/3} in closed form)", () => {
    for (const [m1, m2, chi] of [[10, 10, 0], [30, 25, 0.5], [5, 2, -0.4]]) {
      const r = inspiralSnrShare(m1, m2, flatPsd(), 20, { chi1: chi, chi2: chi });
      const g = (f: number) => Math.pow(f, -4 / 3);
      const expected = Math.sqrt((g(20) - g(r.fIscoHz)) / (g(20) - g(r.fRingdownHz)));
      expect(r.share).toBeCloseTo(expected, 8);
      expect(r.fIscoHz).toBeCloseTo(iscoGwFrequency((m1 + m2) * M_SUN), 9);
      const rem = remnantOfMerger(m1, m2, chi, chi);
      expect(r.fRingdownHz).toBeCloseTo(ringdownFrequencyHz(rem.massFraction * (m1 + m2), rem.spin), 9);
    }
  });
  it("is ≈ 1 for neutron-star masses and falls with mass in ajith2011 from 30 Hz (values measured here)", () => {
    const shares = [2.8, 10, 20, 40, 55, 110].map((m) => inspiralSnrShare(m / 2, m / 2, ajith2011, 30).share);
    expect(shares[0]).toBeGreaterThan(0.9999);
    for (let i = 1; i < shares.length; i++) expect(shares[i]).toBeLessThan(shares[i - 1]);
    // measured here: 10+10 0.9165, 30+25 0.5376, 60+50 0.2140
    expect(inspiralSnrShare(10, 10, ajith2011, 30).share).toBeCloseTo(0.9165, 3);
    expect(inspiralSnrShare(30, 25, ajith2011, 30).share).toBeCloseTo(0.5376, 3);
    expect(inspiralSnrShare(60, 50, ajith2011, 30).share).toBeCloseTo(0.214, 3);
  });
  it("is 1 when an upper cut lies below the ISCO, and 0 when fLow is above the ISCO", () => {
    expect(inspiralSnrShare(10, 10, ajith2011, 30, { fMaxHz: 150 }).share).toBe(1);
    expect(inspiralSnrShare(60, 50, ajith2011, 50).share).toBe(0);
  });
});

describe("inspiral edge of a whole bank (tabulated integral)", () => {
  it("gives each template the share of inspiralSnrShare to 1e-3, and counts and bounds the templates below the threshold", async () => {
    const templates = [[1.4, 1.3], [5, 5], [9, 8], [12, 11], [30, 25, 0.5, 0.5], [20, 5, -0.5, 0]].map(([a, b, c, d]) => ({
      primaryMassSolar: a, secondaryMassSolar: b, primarySpin: c, secondarySpin: d,
    }));
    const shares = templates.map((t) => inspiralSnrShare(t.primaryMassSolar, t.secondaryMassSolar, ajith2011, 30, { chi1: t.primarySpin ?? 0, chi2: t.secondarySpin ?? 0 }).share);
    for (let i = 0; i < templates.length; i++) {
      const one = inspiralEdgeOfBank([templates[i]], ajith2011, 30, { threshold: 1 });
      expect(Math.abs(one.lowestShare - shares[i])).toBeLessThan(1e-3);
    }
    const edge = inspiralEdgeOfBank(templates, ajith2011, 30, { threshold: 0.9 });
    const below = templates.filter((_, i) => shares[i] < 0.9);
    expect(edge.below).toBe(below.length);
    const totals = below.map((t) => t.primaryMassSolar + t.secondaryMassSolar);
    expect(edge.totalMassRangeSolar).toEqual([Math.min(...totals), Math.max(...totals)]);
    expect(edge.lowestShare).toBeCloseTo(Math.min(...shares), 3);
  });
});

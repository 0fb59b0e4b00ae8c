// Aligned-spin banks: the A3* lattice, the metric in (τ0, τ3, τs), bank files with spins, the guards,
// and coverage of spinning signals by a spinning bank against what a non-spinning bank loses.
import seedrandom from "seedrandom";
import { describe, expect, it } from "vitest";
import { BandError, TemplateLimitError, ajith2011, buildBank, buildSpinBank, createTaylorF2Generator, verifyBank, verifyBankWithSpins } from "@chirpsieve/core";
import { formatBankFile, parseBankFile } from "../../packages/core/src/bank/bankFile.js";
import { BCC_COVERING_THICKNESS, CUBIC_COVERING_THICKNESS, bccCellVolume, forEachBccPoint } from "../../packages/core/src/bank/bccLattice.js";
import { componentsFromMassEta, iscoFrequencyHz } from "../../packages/core/src/bank/chirpTimeCoordinates.js";
import { chooseMatchGrid, createMatchComputer } from "../../packages/core/src/bank/match.js";
import { createSpinMetric, equalSpinPhaseInto, massEtaSpinFromCoordinates, metricDistance2, spinCoordinatesFromComponents } from "../../packages/core/src/bank/spinMetric.js";
import { taylorF2Phase } from "../../packages/core/src/waveform/taylorf2.js";

describe("body-centred cubic (A3*) covering", () => {
  it("has covering thickness 5√5π/24 ≈ 1.4635 and the cubic lattice √3π/2 ≈ 2.7207", () => {
    // Conway & Sloane, Sphere Packings, Lattices and Groups (1988), Ch. 2, Table 2.3 (from memory, ±0.0005).
    expect(BCC_COVERING_THICKNESS).toBeCloseTo(1.4635, 3);
    expect(CUBIC_COVERING_THICKNESS).toBeCloseTo(2.7207, 3);
    // Thickness = ball volume / cell volume.
    expect(((4 / 3) * Math.PI) / bccCellVolume(1)).toBeCloseTo(BCC_COVERING_THICKNESS, 12);
  });

  it("covers space: every point lies within the covering radius of a lattice point, and some point nearly reaches it", () => {
    const rho = 0.7;
    const pts: number[][] = [];
    forEachBccPoint(rho, [-3, -3, -3], [3, 3, 3], (x, y, z) => pts.push([x, y, z]), [0.1, -0.2, 0.05]);
    const rng = seedrandom("bcc");
    let worst = 0;
    for (let k = 0; k < 4000; k++) {
      const p = [2 * rng() - 1, 2 * rng() - 1, 2 * rng() - 1];
      let best = Infinity;
      for (const q of pts) best = Math.min(best, Math.hypot(p[0] - q[0], p[1] - q[1], p[2] - q[2]));
      worst = Math.max(worst, best);
    }
    expect(worst).toBeLessThanOrEqual(rho * (1 + 1e-12));
    expect(worst).toBeGreaterThan(0.93 * rho); // the deep holes are reached (a looser lattice would fail the first check)
  });
});

describe("spin chirp-time metric", () => {
  it("writes the TaylorF2 phase of equal aligned spins as taylorF2Phase does (its own η-only form)", () => {
    for (const [m1, m2, chi] of [[10, 8, 0.4], [1.4, 1.3, -0.3], [25, 5, 0.8]]) {
      const m = m1 + m2;
      const f = Float64Array.of(30, 80, 200);
      const out = new Float64Array(3);
      equalSpinPhaseInto(m, (m1 * m2) / (m * m), chi, f, out);
      for (let i = 0; i < 3; i++) {
        const ref = taylorF2Phase(f[i], m1, m2, 7, chi, chi);
        expect(Math.abs(out[i] - ref)).toBeLessThan(1e-9 * Math.max(1, Math.abs(ref)));
      }
    }
  });

  it("maps masses and equal spins to (τ0, τ3, τs) and back", () => {
    const u = spinCoordinatesFromComponents(12, 7, 0.35, 0.35, 30);
    const back = massEtaSpinFromCoordinates(u[0], u[1], u[2], 30);
    expect(back.totalMassSolar).toBeCloseTo(19, 9);
    expect(back.eta).toBeCloseTo((12 * 7) / 19 ** 2, 12);
    expect(back.spin).toBeCloseTo(0.35, 12);
  });

  it("predicts small mismatches along the spin direction to 10% of direct matches (match.ts)", () => {
    const fmin = 30;
    const metric = createSpinMetric({ psd: ajith2011, fMinHz: fmin });
    const grid = chooseMatchGrid({ fMaxHz: 1100, lagSpanS: 4 });
    const mc = createMatchComputer({ ...grid, psd: ajith2011, fMinHz: fmin });
    const gen = createTaylorF2Generator(grid.nBins, grid.dfHz);
    const a = new Float64Array(2 * grid.nBins);
    const b = new Float64Array(2 * grid.nBins);
    for (const [m1, m2, chi] of [[6, 5, 0.25], [10, 8, 0.25]]) {
      const u = spinCoordinatesFromComponents(m1, m2, chi, chi, fmin);
      const g = metric.at(u[0], u[1], u[2]);
      const du = 0.02 * u[1] * 0.1; // a step of τs
      const v = massEtaSpinFromCoordinates(u[0], u[1], u[2] + du, fmin);
      const c = componentsFromMassEta(v.totalMassSolar, Math.min(v.eta, 0.25));
      gen.generate(a, fmin, m1, m2, 1, Infinity, chi, chi);
      gen.generate(b, fmin, c.m1, c.m2, 1, Infinity, v.spin, v.spin);
      const direct = 1 - mc.match(a, b, iscoFrequencyHz(m1 + m2), iscoFrequencyHz(c.m1 + c.m2)).match;
      const predicted = metricDistance2(g, 0, 0, du);
      expect(direct).toBeGreaterThan(1e-4); // a real step (measured here: 6e-4 to 2e-3)
      expect(Math.abs(predicted - direct)).toBeLessThan(0.1 * direct);
    }
  });
});

describe("aligned-spin bank files", () => {
  const bank = {
    fMinHz: 30,
    matchFloor: 0.97,
    noiseCurve: "ajith2011",
    massRangeSolar: [5, 15] as [number, number],
    spinRange: [0, 0.5] as [number, number],
    templates: [{ primaryMassSolar: 10, secondaryMassSolar: 8, chirpMassSolar: 0, tau0: 0, tau3: 0, primarySpin: 0.25, secondarySpin: 0.25 }],
  };
  const fill = (): typeof bank => {
    const t = bank.templates[0];
    const u = spinCoordinatesFromComponents(t.primaryMassSolar, t.secondaryMassSolar, 0, 0, 30);
    t.chirpMassSolar = Math.pow(t.primaryMassSolar * t.secondaryMassSolar, 0.6) / Math.pow(t.primaryMassSolar + t.secondaryMassSolar, 0.2);
    t.tau0 = u[0];
    t.tau3 = u[1];
    return bank;
  };

  it("records the spin range and each template's spins, and reads them back", () => {
    const back = parseBankFile(formatBankFile(fill()), "b.json");
    expect(back.spinRange).toEqual([0, 0.5]);
    expect(back.templates[0].primarySpin).toBe(0.25);
    expect(back.templates[0].secondarySpin).toBe(0.25);
  });

  it("refuses a spin outside the bank's spin range or outside (−1, 1), naming the entry", () => {
    const text = formatBankFile(fill());
    expect(() => parseBankFile(text.replace('"primarySpin": 0.25', '"primarySpin": 0.75'), "b.json")).toThrow(/templates\[0\]\.primarySpin 0\.75 lies outside spinRange/);
    expect(() => parseBankFile(text.replace('"spinRange": [0,0.5]', '"spinRange": [0,1]'), "b.json")).toThrow(/spinRange must satisfy/);
  });

  it("refuses to verify a spinning bank with non-spinning draws (its templates' spins would be dropped)", () => {
    expect(() => verifyBank(fill(), { draws: 1 })).toThrow(/carry aligned spins/);
  });
});

describe("aligned-spin bank guards", () => {
  const base = { massRangeSolar: [5, 30] as [number, number], matchFloor: 0.97, fMinHz: 30, psd: ajith2011, spinRange: [0, 0.5] as [number, number] };
  it("refuses, before placing, a bank over the template cap", () => {
    expect(() => buildSpinBank({ ...base, templateCap: 50 })).toThrow(TemplateLimitError);
  });
  it("keeps the band rule of non-spinning banks", () => {
    expect(() => buildSpinBank({ ...base, fMinHz: 70 })).toThrow(BandError);
  });
  it("refuses an empty or reversed spin range", () => {
    expect(() => buildSpinBank({ ...base, spinRange: [0.3, 0.3] })).toThrow(/minimum 0.3 must be below/);
    expect(() => buildSpinBank({ ...base, spinRange: [-1, 0.5] })).toThrow(/strictly between −1 and 1/);
  });
});

describe("coverage of spinning signals (5–30 M_sun from 30 Hz, spins 0–0.5, ajith2011, MM 0.97; 200 draws each)", () => {
  // The 5–30 M_sun region of the check, from 30 Hz rather than a lower cutoff so that the
  // spinning bank (≈ 1 900 templates) builds in about 20 s on one core.
  const region = { massRangeSolar: [5, 30] as [number, number], matchFloor: 0.97, fMinHz: 30, psd: ajith2011 };
  const spinRange: [number, number] = [0, 0.5];
  const flat = buildBank(region);
  const spinning = buildSpinBank({ ...region, spinRange });
  const mm = 0.97;
  // Owen, Phys. Rev. D 53, 6749 (1996): a bank meeting its minimal match loses at most 1 − MM³ of the event rate.
  const owenBound = 1 - mm ** 3;

  it("a non-spinning bank covers non-spinning signals but loses spinning ones", () => {
    expect(verifyBank(flat, { draws: 100, seed: 3 }).fractionAboveMinimalMatch).toBe(1);
    const r = verifyBankWithSpins(flat, { draws: 200, seed: 3, spinRange });
    // Measured here: 30–45% of draws at or above 0.97, rate loss 13–14%.
    expect(r.fractionAboveMinimalMatch).toBeLessThan(0.6);
    expect(1 - r.meanCube).toBeGreaterThan(owenBound);
  }, 60_000);

  it("an aligned-spin bank over the same region has ≥ 97% of spinning draws at its minimal match and meets Owen's bound", () => {
    expect(spinning.spinRange).toEqual(spinRange);
    expect(spinning.templates.every((t) => t.primarySpin! >= 0 && t.primarySpin! <= 0.5 && t.primarySpin === t.secondarySpin)).toBe(true);
    const r = verifyBankWithSpins(spinning, { draws: 200, seed: 3, spinRange });
    expect(r.fractionAboveMinimalMatch).toBeGreaterThanOrEqual(0.97);
    expect(1 - r.meanCube).toBeLessThanOrEqual(owenBound);
  }, 60_000);

  it("ranks neighbours well enough: the same fitting factors as matching every template (40 draws)", () => {
    const near = verifyBankWithSpins(flat, { draws: 40, seed: 5, spinRange });
    const all = verifyBankWithSpins(flat, { draws: 40, seed: 5, spinRange, exhaustive: true });
    expect(near.meanCube).toBeCloseTo(all.meanCube, 10);
    expect(near.min).toBeCloseTo(all.min, 10);
  }, 60_000);
});

import { describe, expect, it } from "vitest";
import { ajith2011, buildBank, verifyBank } from "@chirpsieve/core";
import { createMassRegion } from "../../packages/core/src/bank/massRegion.js";
import { drawInRegion } from "../../packages/core/src/bank/verify.js";

describe("bank verification", () => {
  it("near-template search finds the same fitting factors as a brute-force maximum over the whole bank", () => {
    const bank = buildBank({ massRangeSolar: [8, 20], matchFloor: 0.9, fMinHz: 20, psd: ajith2011 });
    const opts = { draws: 80, seed: "near-vs-all", psd: ajith2011, worstCount: 80 };
    const near = verifyBank(bank, opts);
    const all = verifyBank(bank, { ...opts, exhaustive: true });
    const byDraw = new Map(all.worst.map((w) => [`${w.primaryMassSolar},${w.secondaryMassSolar}`, w.fittingFactor]));
    for (const w of near.worst) expect(w.fittingFactor).toBe(byDraw.get(`${w.primaryMassSolar},${w.secondaryMassSolar}`));
    expect(near.matchesPerDraw).toBeLessThan(all.matchesPerDraw / 5);
  });

  it("near-template search agrees with brute force for TaylorT4 signals too", () => {
    const bank = buildBank({ massRangeSolar: [10, 20], matchFloor: 0.95, fMinHz: 25, psd: ajith2011 });
    const opts = { draws: 12, seed: "pn-time", psd: ajith2011, signal: "pn-time" as const, worstCount: 12 };
    const near = verifyBank(bank, opts);
    const all = verifyBank(bank, { ...opts, exhaustive: true });
    expect(near.signal).toBe("pn-time");
    expect(near.mean).toBeCloseTo(all.mean, 12);
    // A different approximant costs match: TaylorT4 signals fit TaylorF2 templates less well.
    const f2 = verifyBank(bank, { ...opts, signal: "taylorf2" });
    expect(near.mean).toBeLessThan(f2.mean);
  });

  it("is seeded: the same seed gives the same report, another seed other draws", () => {
    const bank = buildBank({ massRangeSolar: [8, 20], matchFloor: 0.95, fMinHz: 20, psd: ajith2011 });
    const a = verifyBank(bank, { draws: 30, seed: "s1", psd: ajith2011 });
    const b = verifyBank(bank, { draws: 30, seed: "s1", psd: ajith2011 });
    const c = verifyBank(bank, { draws: 30, seed: "s2", psd: ajith2011 });
    expect(b.worst).toEqual(a.worst);
    expect(c.worst).not.toEqual(a.worst);
    expect(a.min).toBeLessThanOrEqual(a.p01);
    expect(a.p01).toBeLessThanOrEqual(a.median);
    expect(a.meanCube).toBeLessThanOrEqual(a.mean);
  });

  it("draws inside the region, uniformly in masses or in chirp times", () => {
    const region = createMassRegion({ minMassSolar: 1, maxMassSolar: 3, massRatioCap: 2 }, 30);
    for (const space of ["masses", "chirp-times"] as const) {
      const d = drawInRegion(region, 300, space, "draws");
      expect(d).toHaveLength(300);
      for (const x of d) expect(region.containsMasses(x.m1, x.m2)).toBe(true);
    }
  });

  it("verifies a bank of thousands of templates in seconds (1–3 M_sun from 30 Hz, 1000 draws)", () => {
    const bank = buildBank({ massRangeSolar: [1, 3], matchFloor: 0.97, fMinHz: 30, psd: ajith2011 });
    expect(bank.templates.length).toBeGreaterThan(4000);
    const r = verifyBank(bank, { draws: 1000, seed: "thousands", psd: ajith2011 });
    // No timing assertion (loaded machine); r.wallTimeMs is reported. Coverage must hold.
    expect(r.fractionAboveMinimalMatch).toBeGreaterThanOrEqual(0.99);
    expect(r.matchesPerDraw).toBeLessThan(20);
  });
});

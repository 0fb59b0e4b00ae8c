import { describe, expect, it } from "vitest";
import { reweightedSnr } from "../../packages/core/src/filter/reweight.js";

describe("reweighted SNR", () => {
  it("follows Babak et al., Phys. Rev. D 87, 024033 (2013), Eq. 6: unchanged up to χ²/dof = 1, then ρ/[(1 + r³)/2]^{1/6}", () => {
    expect(reweightedSnr(10, 30, 30)).toBe(10);
    expect(reweightedSnr(10, 0, 0)).toBe(10); // no chi-squared: nothing to reweight
    // r = 2: ρ / (9/2)^{1/6} = 10 / 1.2849 (worked by hand from Eq. 6).
    expect(reweightedSnr(10, 60, 30)).toBeCloseTo(10 / Math.pow(4.5, 1 / 6), 12);
  });

  it("with an allowance δ divides χ² by dof + δρ² (δ = 0 is Babak et al. exactly)", () => {
    expect(reweightedSnr(30, 65, 30, 0)).toBe(reweightedSnr(30, 65, 30));
    // δρ² = 0.03 × 900 = 27: r = 65/57 = 1.140.
    const r = 65 / 57;
    expect(reweightedSnr(30, 65, 30, 0.03)).toBeCloseTo(30 / Math.pow((1 + r ** 3) / 2, 1 / 6), 12);
    expect(reweightedSnr(30, 56, 30, 0.03)).toBe(30);
  });
});

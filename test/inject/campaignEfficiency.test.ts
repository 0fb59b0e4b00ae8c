import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { gaussianDetectionProbability } from "@chirpsieve/core";
import { besselI0Scaled, marcumQ1 } from "../../packages/core/src/inject/detectionProbability.js";
import { binnedEfficiency, errorSpread, fiftyPercentCrossing, integerBinEdges, linearBinEdges, quantile, sensitiveVolume, wilsonInterval } from "../../packages/core/src/inject/efficiency.js";

describe("wilsonInterval", () => {
  it("matches worked 95% Wilson intervals", () => {
    // Newcombe, Stat. Med. 17, 857 (1998), Table I, method 3 (Wilson score without continuity
    // correction), from memory: 81/263 → [0.2553, 0.3662]; 15/148 → [0.0624, 0.1605]; 0/20 → [0, 0.1611].
    const a = wilsonInterval(81, 263, 1.959964);
    expect(a.lower).toBeCloseTo(0.2553, 3);
    expect(a.upper).toBeCloseTo(0.3662, 3);
    const b = wilsonInterval(15, 148, 1.959964);
    expect(b.lower).toBeCloseTo(0.0624, 3);
    expect(b.upper).toBeCloseTo(0.1605, 3);
    const c = wilsonInterval(0, 20, 1.959964);
    expect(c.lower).toBe(0);
    expect(c.upper).toBeCloseTo(0.1611, 3);
  });

  it("is exact at the ends, brackets k/n and is null for n = 0", () => {
    expect(wilsonInterval(10, 10)).toMatchObject({ efficiency: 1, upper: 1 });
    expect(wilsonInterval(10, 10).lower!).toBeCloseTo(10 / 11, 12); // z = 1: n/(n + 1)
    expect(wilsonInterval(0, 7)).toMatchObject({ efficiency: 0, lower: 0 });
    for (let k = 0; k <= 13; k++) {
      const w = wilsonInterval(k, 13);
      expect(w.lower!).toBeLessThanOrEqual(k / 13);
      expect(w.upper!).toBeGreaterThanOrEqual(k / 13);
    }
    expect(wilsonInterval(0, 0)).toEqual({ found: 0, total: 0, efficiency: null, lower: null, upper: null });
    expect(() => wilsonInterval(3, 2)).toThrow(/found/);
  });
});

describe("binned efficiency and its 50% crossing", () => {
  it("bins [low, high) with the last bin closed and interpolates the crossing between bin centres", () => {
    const x = [0.5, 1, 1.5, 2, 2.5, 3, 3];
    const found = [false, false, true, true, true, true, false];
    const bins = binnedEfficiency(x, found, [0, 1, 2, 3]);
    expect(bins.map((b) => [b.found, b.total])).toEqual([
      [0, 1],
      [1, 2],
      [3, 4],
    ]);
    // Centres 0.5 (0), 1.5 (0.5), 2.5 (0.75): rising through 0.5 at the second centre.
    expect(fiftyPercentCrossing(bins, "rising")).toBeCloseTo(1.5, 12);
    const falling = [
      { low: 0, high: 10, found: 9, total: 10, efficiency: 0.9, lower: 0, upper: 1 },
      { low: 10, high: 20, found: 0, total: 0, efficiency: null, lower: null, upper: null },
      { low: 20, high: 30, found: 1, total: 10, efficiency: 0.1, lower: 0, upper: 1 },
    ];
    expect(fiftyPercentCrossing(falling, "falling")).toBeCloseTo(15, 12); // empty bin skipped
    expect(fiftyPercentCrossing(falling, "rising")).toBeNull();
  });

  it("chooses whole-number and equal-width edges", () => {
    expect(integerBinEdges(10, 20)).toEqual([10, 11, 12, 13, 14, 15, 16, 17, 18, 19, 20]);
    expect(integerBinEdges(3.2, 4.9)).toEqual([3, 4, 5]);
    expect(integerBinEdges(0, 95, 20)).toEqual(Array.from({ length: 20 }, (_, i) => 5 * i));
    expect(linearBinEdges(10, 300, 2)).toEqual([10, 155, 300]);
  });
});

describe("quantiles and error spreads", () => {
  it("uses linear interpolation between order statistics (Hyndman & Fan definition 7)", () => {
    // Hyndman & Fan, Am. Stat. 50, 361 (1996): definition 7 gives 1.75 for the 25% point of {1,2,3,4}.
    expect(quantile([4, 1, 3, 2], 0.25)).toBeCloseTo(1.75, 12);
    expect(quantile([5], 0.95)).toBe(5);
    const s = errorSpread([-3, -1, 0, 2, 10])!;
    expect(s.median).toBe(0);
    expect(s.medianAbsolute).toBe(2);
    expect(s.p05).toBeCloseTo(-3 + 0.2 * 2, 12);
    expect(errorSpread([])).toBeNull();
  });
});

describe("sensitiveVolume (Monte Carlo)", () => {
  const ball = (r: number) => ((4 * Math.PI) / 3) * r ** 3;

  it("gives the whole ball when everything is found, for either distance density", () => {
    const rng = seedrandom("vol-all");
    const d = Array.from({ length: 500 }, () => 10 + 290 * rng());
    const all = d.map(() => true);
    expect(sensitiveVolume(d, all, [10, 300], "volume")!.volumeMpc3).toBeCloseTo(ball(300), -3);
    // Uniform in distance: unbiased, not exact; the seeded estimate lands within 3 standard errors.
    const u = sensitiveVolume(d, all, [10, 300], "uniform")!;
    expect(Math.abs(u.volumeMpc3 - ball(300))).toBeLessThan(3 * u.errorMpc3);
  });

  it("recovers the ball of a sharp horizon at 150 Mpc within its standard error", () => {
    const rng = seedrandom("vol-horizon");
    const n = 4000;
    const vol = Array.from({ length: n }, () => Math.cbrt(10 ** 3 + rng() * (300 ** 3 - 10 ** 3)));
    const v = sensitiveVolume(vol, vol.map((r) => r < 150), [10, 300], "volume")!;
    expect(Math.abs(v.volumeMpc3 - ball(150))).toBeLessThan(3 * v.errorMpc3);
    const uni = Array.from({ length: n }, () => 10 + 290 * rng());
    const w = sensitiveVolume(uni, uni.map((r) => r < 150), [10, 300], "uniform")!;
    expect(Math.abs(w.volumeMpc3 - ball(150))).toBeLessThan(3 * w.errorMpc3);
  });
});

describe("Marcum Q₁ and the Gaussian detection probability", () => {
  it("scaled I₀ agrees with its power series Σ (x/2)^{2k}/(k!)² (Abramowitz & Stegun 9.6.12)", () => {
    for (const x of [0, 0.5, 2, 3.75, 5, 12, 30]) {
      let term = 1;
      let sum = 1;
      for (let k = 1; k < 200; k++) {
        term *= (x / 2) ** 2 / (k * k);
        sum += term;
      }
      expect(besselI0Scaled(x)).toBeCloseTo(sum * Math.exp(-x), 6);
      expect(Math.abs(besselI0Scaled(x) / (sum * Math.exp(-x)) - 1)).toBeLessThan(3e-7);
    }
  });

  it("Q₁(0, b) = exp(−b²/2) (the noise-only Rayleigh tail; standard detection theory, e.g. Helstrom 1968)", () => {
    for (const b of [0, 1, 3, 6, 7, 8]) expect(marcumQ1(0, b)).toBeCloseTo(Math.exp((-b * b) / 2), 7);
    expect(marcumQ1(5, 0)).toBeCloseTo(1, 7);
  });

  it("matches the Poisson-mixture series of the non-central χ² with 2 degrees of freedom", () => {
    // |z|² with z complex Gaussian of mean modulus a is non-central χ²₂ with non-centrality λ = a²,
    // a Poisson(λ/2) mixture of central χ²_{2+2n}, whose tail is e^{−x/2} Σ_{k≤n} (x/2)^k / k! at x = b²:
    //   Q₁(a, b) = Σ_n e^{−a²/2} (a²/2)^n / n! · e^{−b²/2} Σ_{k=0..n} (b²/2)^k / k!
    // (Johnson, Kotz & Balakrishnan, Continuous Univariate Distributions, vol. 2 (1995), ch. 29).
    // Summed here in log space, terms up to n = 400, all positive.
    const series = (a: number, b: number): number => {
      const u = (a * a) / 2;
      const v = (b * b) / 2;
      let total = 0;
      let tail = 0; // Σ_{k≤n} e^{−v} v^k / k!
      let logPois = -u; // log of e^{−u} u^n / n!
      let logTerm = -v; // log of e^{−v} v^k / k!
      for (let n = 0; n <= 400; n++) {
        if (n > 0) {
          logPois += Math.log(u) - Math.log(n);
          logTerm += Math.log(v) - Math.log(n);
        }
        tail += Math.exp(logTerm);
        total += Math.exp(logPois) * Math.min(tail, 1);
      }
      return total;
    };
    let worst = 0;
    for (const a of [0.5, 1, 2, 4, 6.5, 7, 8, 10])
      for (const b of [0.5, 1, 3, 5, 7, 8, 10]) worst = Math.max(worst, Math.abs(marcumQ1(a, b) - series(a, b)));
    expect(worst).toBeLessThan(1e-6); // measured here 4.7e-7 (mostly the A&S Bessel approximation)
  });

  it("satisfies Q₁(a, a) = (1 + e^{−a²} I₀(a²)) / 2 (Marcum, IRE Trans. Inf. Theory 6, 59 (1960))", () => {
    // I₀ by its power series Σ (x/2)^{2m} / (m!)² (Abramowitz & Stegun 9.6.10), in log space.
    const i0Scaled = (x: number): number => {
      let s = 0;
      for (let m = 0; m < 400; m++) s += Math.exp(2 * m * Math.log(x / 2) - 2 * lgammaInt(m + 1) - x);
      return s;
    };
    for (const a of [0.5, 1, 3, 7, 9]) expect(Math.abs(marcumQ1(a, a) - (1 + i0Scaled(a * a)) / 2)).toBeLessThan(1e-6);
  });

  it("matches a seeded Monte Carlo of |a + n|, n complex Gaussian with unit variance per quadrature", () => {
    const rng = seedrandom("marcum");
    const gauss = () => Math.sqrt(-2 * Math.log(1 - rng())) * Math.cos(2 * Math.PI * rng());
    const n = 200_000;
    for (const [a, b] of [
      [7, 7],
      [5, 7],
      [9, 7],
    ]) {
      let above = 0;
      for (let i = 0; i < n; i++) {
        const re = a + gauss();
        const im = gauss();
        if (re * re + im * im >= b * b) above++;
      }
      const p = above / n;
      expect(Math.abs(marcumQ1(a, b) - p)).toBeLessThan(4 * Math.sqrt((p * (1 - p)) / n) + 1e-4);
    }
  });

  it("puts the 50% point for threshold 7 just below an optimal SNR of 7 for a perfect template", () => {
    expect(gaussianDetectionProbability(6.9, 7)).toBeLessThan(0.5);
    expect(gaussianDetectionProbability(7.0, 7)).toBeGreaterThan(0.5);
    // A fitting factor of 0.97 moves it to ≈ 6.93 / 0.97 ≈ 7.15.
    expect(gaussianDetectionProbability(7.2, 7, 0.97)).toBeGreaterThan(0.5);
    expect(gaussianDetectionProbability(7.1, 7, 0.97)).toBeLessThan(0.5);
  });
});

/** ln((n − 1)!) for a positive integer n, by summing logarithms. */
function lgammaInt(n: number): number {
  let s = 0;
  for (let k = 2; k < n; k++) s += Math.log(k);
  return s;
}

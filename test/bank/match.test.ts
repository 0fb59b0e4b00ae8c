import { describe, expect, it } from "vitest";
import { ajith2011 } from "@chirpsieve/core";
import { iscoFrequencyHz } from "../../packages/core/src/bank/chirpTimeCoordinates.js";
import { chooseMatchGrid, createMatchComputer } from "../../packages/core/src/bank/match.js";
import { createTaylorF2Generator } from "../../packages/core/src/waveform/taylorf2.js";

function setup(lagSpanS: number, fMaxHz = 1800) {
  const grid = chooseMatchGrid({ fMaxHz, lagSpanS });
  const mc = createMatchComputer({ ...grid, psd: ajith2011, fMinHz: 40 });
  const gen = createTaylorF2Generator(grid.nBins, grid.dfHz);
  return { grid, mc, gen, a: new Float64Array(2 * grid.nBins), b: new Float64Array(2 * grid.nBins) };
}

describe("match maximised over time and phase", () => {
  it("is 1 for a waveform against a time-shifted, phase-rotated copy of itself, between samples", () => {
    const { grid, mc, gen, a, b } = setup(2);
    gen.generate(a, 40, 1.5, 1.3);
    const dt = 0.0123457; // not a multiple of the correlation's sample spacing
    const phi = 1.1;
    for (let k = 0; k < grid.nBins; k++) {
      const ang = -2 * Math.PI * k * grid.dfHz * dt + phi;
      const re = a[2 * k];
      const im = a[2 * k + 1];
      b[2 * k] = re * Math.cos(ang) - im * Math.sin(ang);
      b[2 * k + 1] = re * Math.sin(ang) + im * Math.cos(ang);
    }
    const cut = iscoFrequencyHz(2.8);
    const r = mc.match(a, b, cut, cut);
    expect(r.match).toBeGreaterThan(1 - 1e-7);
    expect(Math.abs(Math.abs(r.lagS) - dt)).toBeLessThan(1e-6);
  });

  it("without the refinement, the sampled peak alone loses match between samples", () => {
    const grid = chooseMatchGrid({ fMaxHz: 1800, lagSpanS: 2, oversample: 1 });
    const mc = createMatchComputer({ ...grid, psd: ajith2011, fMinHz: 40, refinePeak: false });
    const gen = createTaylorF2Generator(grid.nBins, grid.dfHz);
    const a = new Float64Array(2 * grid.nBins);
    const b = new Float64Array(2 * grid.nBins);
    gen.generate(a, 40, 1.5, 1.3);
    const dt = 0.5 / (grid.fftSize * grid.dfHz); // half a sample
    for (let k = 0; k < grid.nBins; k++) {
      const ang = -2 * Math.PI * k * grid.dfHz * dt;
      b[2 * k] = a[2 * k] * Math.cos(ang) - a[2 * k + 1] * Math.sin(ang);
      b[2 * k + 1] = a[2 * k] * Math.sin(ang) + a[2 * k + 1] * Math.cos(ang);
    }
    expect(mc.match(a, b).match).toBeLessThan(0.999);
  });

  it("on a coarse grid (df = 1 Hz) agrees with a grid of df = 1/duration to 2e-4", () => {
    // Between nearby templates a b* / S is smooth in frequency, so 1/df need not cover the duration.
    const fine = setup(32);
    const coarse = setup(1);
    const pairs: [number, number, number, number][] = [
      [1.4, 1.3, 1.402, 1.299],
      [1.6, 1.2, 1.58, 1.2135],
      [2.0, 1.9, 2.02, 1.882],
    ];
    for (const [a1, a2, b1, b2] of pairs) {
      const results = [fine, coarse].map(({ mc, gen, a, b }) => {
        gen.generate(a, 40, a1, a2);
        gen.generate(b, 40, b1, b2);
        return mc.match(a, b, iscoFrequencyHz(a1 + a2), iscoFrequencyHz(b1 + b2)).match;
      });
      expect(results[0]).toBeGreaterThan(0.9);
      expect(Math.abs(results[0] - results[1])).toBeLessThan(2e-4);
    }
  });

  it("integrates an abrupt ISCO end to O(df²): norms on 1 Hz and 1/32 Hz grids agree to 1e-3", () => {
    // Heavy binary ending at ~98 Hz, from 40 Hz: few bins, the end weight matters.
    const f = (lag: number) => {
      const grid = chooseMatchGrid({ fMaxHz: 200, lagSpanS: lag });
      const mc = createMatchComputer({ ...grid, psd: ajith2011, fMinHz: 40 });
      const gen = createTaylorF2Generator(grid.nBins, grid.dfHz);
      const a = new Float64Array(2 * grid.nBins);
      gen.generate(a, 40, 25, 20);
      return mc.normSquared(a, iscoFrequencyHz(45)) * grid.dfHz;
    };
    expect(Math.abs(f(1) / f(32) - 1)).toBeLessThan(1e-3);
  });

  it("agrees with the inner product (a|b) = 4 Re Σ a b* / S df maximised by brute force over time and phase", () => {
    // The noise-weighted inner product and the match max_{t,φ} (a|b e^{2πift+iφ}) / √((a|a)(b|b))
    // (Owen, Phys. Rev. D 53, 6749 (1996), Sec. II), written out here independently: trapezoid rule
    // from f_low (half weight on its bin), the phase maximised by the modulus of the complex sum, the
    // time by a scan every 0.1 ms over ±0.1 s, then ternary search between the scan's neighbours.
    const fLow = 40;
    const { grid, mc, gen, a, b } = setup(8);
    const df = grid.dfHz;
    const kLow = Math.round(fLow / df);
    const weight = (k: number): number => (k === kLow ? 0.5 : 1) / ajith2011.evaluate(k * df);
    const inner = (x: Float64Array, y: Float64Array): number => {
      let s = 0;
      for (let k = kLow; k < grid.nBins; k++) s += (x[2 * k] * y[2 * k] + x[2 * k + 1] * y[2 * k + 1]) * weight(k);
      return 4 * df * s;
    };
    const prodRe = new Float64Array(grid.nBins);
    const prodIm = new Float64Array(grid.nBins);
    /** |4 df Σ a b* w e^{2πi f t}| at time t. */
    const overlapAt = (t: number): number => {
      let zr = 0;
      let zi = 0;
      for (let k = kLow; k < grid.nBins; k++) {
        const ang = 2 * Math.PI * k * df * t;
        const c = Math.cos(ang);
        const sn = Math.sin(ang);
        zr += prodRe[k] * c - prodIm[k] * sn;
        zi += prodRe[k] * sn + prodIm[k] * c;
      }
      return 4 * df * Math.hypot(zr, zi);
    };
    for (const [a1, a2, b1, b2] of [
      [5, 4, 5.08, 3.95],
      [8, 3, 7.7, 3.15],
      [12, 10, 12.6, 9.7],
    ]) {
      gen.generate(a, fLow, a1, a2);
      gen.generate(b, fLow, b1, b2);
      for (let k = kLow; k < grid.nBins; k++) {
        prodRe[k] = (a[2 * k] * b[2 * k] + a[2 * k + 1] * b[2 * k + 1]) * weight(k);
        prodIm[k] = (a[2 * k + 1] * b[2 * k] - a[2 * k] * b[2 * k + 1]) * weight(k);
      }
      const step = 1e-4;
      let tBest = 0;
      let best = -1;
      for (let t = -0.1; t <= 0.1; t += step) {
        const v = overlapAt(t);
        if (v > best) [best, tBest] = [v, t];
      }
      let lo = tBest - step;
      let hi = tBest + step;
      for (let i = 0; i < 50; i++) {
        const m1 = lo + (hi - lo) / 3;
        const m2 = hi - (hi - lo) / 3;
        if (overlapAt(m1) < overlapAt(m2)) lo = m1;
        else hi = m2;
      }
      const t = (lo + hi) / 2;
      const want = overlapAt(t) / Math.sqrt(inner(a, a) * inner(b, b));
      const got = mc.match(a, b);
      expect(want).toBeGreaterThan(0.5);
      expect(want).toBeLessThan(0.999);
      expect(Math.abs(got.match - want)).toBeLessThan(1e-9); // measured here ≤ 2.7e-11 (matches 0.83–0.98)
      expect(Math.abs(got.lagS - t)).toBeLessThan(1e-6);
      expect(Math.abs((mc.normSquared(a) * 4 * df) / inner(a, a) - 1)).toBeLessThan(1e-12);
    }
  });

  it("rejects an invalid grid with a one-line InputError", () => {
    expect(() => chooseMatchGrid({ fMaxHz: -1, lagSpanS: 1 })).toThrow(/fMaxHz/);
    expect(() => createMatchComputer({ dfHz: 1, nBins: 100, fftSize: 64, psd: ajith2011, fMinHz: 10 })).toThrow(/fftSize/);
  });
});

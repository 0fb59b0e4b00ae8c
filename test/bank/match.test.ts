import { describe, expect, it } from "vitest";
import { ajith2011, chooseMatchGrid, createMatchComputer, createTaylorF2Generator, iscoFrequencyHz } from "@chirpsieve/core";

function setup(lagSpanS: number, fHighHz = 1800) {
  const grid = chooseMatchGrid({ fHighHz, lagSpanS });
  const mc = createMatchComputer({ ...grid, psd: ajith2011, fLowHz: 40 });
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
    const grid = chooseMatchGrid({ fHighHz: 1800, lagSpanS: 2, oversample: 1 });
    const mc = createMatchComputer({ ...grid, psd: ajith2011, fLowHz: 40, refinePeak: false });
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
      const grid = chooseMatchGrid({ fHighHz: 200, lagSpanS: lag });
      const mc = createMatchComputer({ ...grid, psd: ajith2011, fLowHz: 40 });
      const gen = createTaylorF2Generator(grid.nBins, grid.dfHz);
      const a = new Float64Array(2 * grid.nBins);
      gen.generate(a, 40, 25, 20);
      return mc.normSquared(a, iscoFrequencyHz(45)) * grid.dfHz;
    };
    expect(Math.abs(f(1) / f(32) - 1)).toBeLessThan(1e-3);
  });

  it("rejects an invalid grid with a one-line InputError", () => {
    expect(() => chooseMatchGrid({ fHighHz: -1, lagSpanS: 1 })).toThrow(/fHighHz/);
    expect(() => createMatchComputer({ dfHz: 1, nBins: 100, fftSize: 64, psd: ajith2011, fLowHz: 10 })).toThrow(/fftSize/);
  });
});

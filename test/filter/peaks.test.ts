// The search's unrolled peak finder gives exactly the triggers of the plain definition below.
import seedrandom from "seedrandom";
import { describe, expect, it } from "vitest";
import { findWindowPeaks, type Trigger } from "../../packages/core/src/filter/peaks.js";

/** The definition, one sample per step: the loudest |z| above threshold in each window (reference). */
function plainWindowPeaks(z: Float32Array | Float64Array, start: number, end: number, threshold: number, window: number, templateIndex: number, out: Trigger[]): void {
  const n = z.length >> 1;
  for (let w0 = start; w0 < end; w0 += window) {
    let best = -1;
    let bestP = threshold * threshold;
    for (let j = w0; j < Math.min(end, w0 + window); j++) {
      const p = z[2 * j] ** 2 + z[2 * j + 1] ** 2;
      if (p > bestP) {
        bestP = p;
        best = j;
      }
    }
    if (best >= 0) {
      out.push({
        index: best,
        snr: Math.sqrt(bestP),
        re: z[2 * best],
        im: z[2 * best + 1],
        before: best > 0 ? Math.hypot(z[2 * best - 2], z[2 * best - 1]) : 0,
        after: best + 1 < n ? Math.hypot(z[2 * best + 2], z[2 * best + 3]) : 0,
        templateIndex,
      });
    }
  }
}

/** Seeded complex series with |z| mostly < 3, loud spikes, and runs of equal values (ties). */
function series(n: number, seed: string, Array: Float32ArrayConstructor | Float64ArrayConstructor) {
  const rng = seedrandom(seed);
  const z = new Array(2 * n);
  for (let i = 0; i < 2 * n; i++) z[i] = 2 * (rng() - 0.5);
  for (let s = 0; s < n / 50; s++) {
    const j = Math.floor(rng() * n);
    const v = 3 + 10 * rng();
    const run = 1 + Math.floor(rng() * 6); // equal maxima next to each other
    for (let r = 0; r < run && j + r < n; r++) {
      z[2 * (j + r)] = v;
      z[2 * (j + r) + 1] = rng() < 0.5 ? 0 : -0;
    }
  }
  return z;
}

describe("findWindowPeaks (the search's peak finder)", () => {
  for (const Array of [Float32Array, Float64Array]) {
    it(`returns the same triggers as the plain definition (${Array.name}, many windows, starts, ends and thresholds)`, () => {
      let compared = 0;
      for (let t = 0; t < 40; t++) {
        const rng = seedrandom(`case-${t}`);
        const n = 200 + Math.floor(rng() * 3000);
        const z = series(n, `series-${t}`, Array);
        const start = Math.floor(rng() * 20);
        const end = n - Math.floor(rng() * 20);
        const window = 1 + Math.floor(rng() * 97);
        const threshold = 2.5 + 6 * rng();
        const a: Trigger[] = [];
        const b: Trigger[] = [];
        plainWindowPeaks(z, start, end, threshold, window, t, a);
        findWindowPeaks(z, start, end, threshold, window, t, b);
        expect(b).toEqual(a);
        compared += a.length;
      }
      expect(compared).toBeGreaterThan(100);
    });
  }

  it("reports peaks at the first and last sample of the series with a zero neighbour outside", () => {
    const z = new Float32Array(2 * 16);
    z[0] = 9;
    z[30] = 8;
    const a: Trigger[] = [];
    const b: Trigger[] = [];
    findWindowPeaks(z, 0, 16, 5, 8, 0, a);
    findWindowPeaks(z, 0, 16, 5, 8, 0, b);
    expect(b).toEqual(a);
    expect(b.map((t) => [t.index, t.before, t.after])).toEqual([[0, 0, 0], [15, 0, 0]]);
  });
});

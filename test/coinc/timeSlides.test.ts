import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { maxSlidesPerSide, slideOnRing, slideShiftSeconds } from "../../packages/core/src/coinc/timeSlides.js";

describe("time slides on a ring", () => {
  it("moves ascending times by a shift modulo the ring, as a rotation (matches shift-then-sort)", () => {
    const rng = seedrandom("ring");
    const L = 100;
    const times = Float64Array.from({ length: 200 }, () => rng() * L).sort();
    for (const shift of [0, 7, -7, 93.5, 250, -1234.25]) {
      const outT = new Float64Array(times.length);
      const outI = new Int32Array(times.length);
      slideOnRing(times, shift, L, outT, outI);
      const expected = Array.from(times, (t, i) => ({ t: (((t + shift) % L) + L) % L, i })).sort((a, b) => a.t - b.t);
      expected.forEach((e, k) => {
        expect(outT[k]).toBeCloseTo(e.t, 9);
        expect(outI[k]).toBe(e.i);
      });
    }
  });

  it("shifts the site at network position j by k·j·step, leaving the reference site in place", () => {
    expect(slideShiftSeconds(3, 0, 7)).toBe(0);
    expect(slideShiftSeconds(3, 1, 7)).toBe(21);
    expect(slideShiftSeconds(-3, 2, 7)).toBe(-42);
  });

  it("allows only as many slides as keep every relative shift distinct and a step away from zero", () => {
    for (const [L, step, sites] of [[1000, 7, 2], [1000, 7, 3], [128, 1, 2], [600, 2, 3], [50, 7, 2]] as const) {
      const K = maxSlidesPerSide(L, step, sites);
      const shifts: number[] = [];
      for (let k = -K; k <= K; k++) {
        if (k === 0) continue;
        for (let a = 0; a < sites; a++) {
          for (let b = a + 1; b < sites; b++) {
            const rel = ((((slideShiftSeconds(k, b, step) - slideShiftSeconds(k, a, step)) % L) + L) % L);
            expect(Math.min(rel, L - rel)).toBeGreaterThanOrEqual(step - 1e-9);
            if (a === 0 && b === 1) shifts.push(rel);
          }
        }
      }
      // Slides are distinct from each other by at least one step too.
      shifts.sort((x, y) => x - y);
      for (let i = 1; i < shifts.length; i++) expect(shifts[i] - shifts[i - 1]).toBeGreaterThanOrEqual(step - 1e-9);
      // One more slide per side would break it (or K is limited by the ring).
      expect(2 * (sites - 1) * (K + 1) * step).toBeGreaterThan(L - step);
    }
    expect(maxSlidesPerSide(1000, 7, 2)).toBe(70);
    expect(maxSlidesPerSide(10, 7, 2)).toBe(0);
  });
});

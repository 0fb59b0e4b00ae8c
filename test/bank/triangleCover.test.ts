import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { triangleCoveringRadius } from "../../packages/core/src/bank/triangleCover.js";

/** max over a fine grid of the triangle's points of the distance to the nearest corner. */
function bruteForce(a: [number, number], b: [number, number], c: [number, number], n = 400): number {
  let best = 0;
  for (let i = 0; i <= n; i++) {
    for (let j = 0; j <= n - i; j++) {
      const u = i / n;
      const v = j / n;
      const w = 1 - u - v;
      const x = u * a[0] + v * b[0] + w * c[0];
      const y = u * a[1] + v * b[1] + w * c[1];
      const d = Math.min(Math.hypot(x - a[0], y - a[1]), Math.hypot(x - b[0], y - b[1]), Math.hypot(x - c[0], y - c[1]));
      best = Math.max(best, d);
    }
  }
  return best;
}

describe("triangleCoveringRadius", () => {
  it("is the circumradius of an equilateral triangle: side/√3 (common practice, no source)", () => {
    expect(triangleCoveringRadius([0, 0], [1, 0], [0.5, Math.sqrt(3) / 2])).toBeCloseTo(1 / Math.sqrt(3), 12);
  });

  it("is half the hypotenuse of a right triangle, and half the widest gap of a collinear one", () => {
    expect(triangleCoveringRadius([0, 0], [3, 0], [0, 4])).toBeCloseTo(2.5, 12);
    expect(triangleCoveringRadius([0, 0], [1, 0], [3, 0])).toBeCloseTo(1, 12);
  });

  it("matches a brute-force maximum over the triangle for random acute and obtuse triangles", () => {
    const rng = seedrandom("triangle-cover");
    let obtuse = 0;
    for (let k = 0; k < 60; k++) {
      const p = (): [number, number] => [rng() * 2 - 1, (rng() * 2 - 1) * (k % 3 === 0 ? 0.1 : 1)];
      const a = p();
      const b = p();
      const c = p();
      const sides = [Math.hypot(a[0] - b[0], a[1] - b[1]), Math.hypot(b[0] - c[0], b[1] - c[1]), Math.hypot(c[0] - a[0], c[1] - a[1])].sort((x, y) => x - y);
      if (sides[0] ** 2 + sides[1] ** 2 < sides[2] ** 2) obtuse++;
      const exact = triangleCoveringRadius(a, b, c);
      const brute = bruteForce(a, b, c);
      // The grid's points are within 1/400 of the triangle's longest side of any point.
      expect(exact).toBeGreaterThanOrEqual(brute - 1e-12);
      expect(exact - brute).toBeLessThan(0.01 * sides[2]);
    }
    expect(obtuse).toBeGreaterThan(15);
  });
});

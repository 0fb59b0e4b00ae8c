import { describe, expect, it } from "vitest";
import { massEtaFromChirpTimes } from "../../../packages/core/src/bank/chirpTimeCoordinates.js";
import { patchBoundaryPoints, walkCurve } from "../../../packages/core/src/bank/boundaryWalk.js";
import { projectOntoBoundary } from "../../../packages/core/src/bank/boundaryProjection.js";
import { metricFactor } from "../../../packages/core/src/bank/metric.js";
import { componentsFromMassEta } from "../../../packages/core/src/bank/chirpTimeCoordinates.js";
import { G, r, region, wholeBox } from "./flatFixture.js";

// Whitened coordinates of the fixture's constant metric (u = W x with G = Wᵀ W).
const W = metricFactor(G);
const toU = (t0: number, t3: number): [number, number] => [W.w00 * t0 + W.w01 * t3, W.w11 * t3];

describe("walkCurve", () => {
  it("walks a circle from end to end in steps no longer than the bound", () => {
    const circle = (s: number): [number, number] => [Math.cos(s), Math.sin(s)];
    const id = (a: number, b: number): [number, number] => [a, b];
    const pts = walkCurve(circle, 0, Math.PI, id, 0.05);
    expect(pts[0]).toEqual([1, 0]);
    expect(pts[pts.length - 1][0]).toBeCloseTo(-1, 12);
    for (let k = 1; k < pts.length; k++) expect(Math.hypot(pts[k][0] - pts[k - 1][0], pts[k][1] - pts[k - 1][1])).toBeLessThanOrEqual(0.05);
    // Not much finer than needed: a half circle of length π in steps of 0.025–0.05.
    expect(pts.length).toBeLessThan(Math.PI / 0.025 + 2);
    expect(walkCurve(circle, 1, 1, id, 0.05)).toEqual([]);
  });
});

describe("patchBoundaryPoints", () => {
  it("stays on the boundary of box ∩ region: its τ0 sides, its η sides, or a mass limit", () => {
    const box = { tau0Lo: 0.8, tau0Hi: 1.2, etaLo: 0.245, etaHi: 0.25 };
    const pts = patchBoundaryPoints(region, box, toU, r / 8);
    expect(pts.length).toBeGreaterThan(50);
    let onChain = 0;
    for (const [t0, t3] of pts) {
      const { totalMassSolar, eta } = massEtaFromChirpTimes(t0, t3, 40);
      const { m1, m2 } = componentsFromMassEta(totalMassSolar, Math.min(eta, 0.25));
      const onSide = Math.abs(t0 - 0.8) < 1e-12 || Math.abs(t0 - 1.2) < 1e-12 || Math.abs(eta - 0.245) < 1e-9 || Math.abs(eta - 0.25) < 1e-9;
      const onMassLimit = Math.abs(m1 - 12) < 1e-6 || Math.abs(m2 - 8) < 1e-6;
      if (!onSide) onChain++;
      expect(onSide || onMassLimit).toBe(true);
    }
    expect(onChain).toBeGreaterThan(0); // the box's lower side dips below η_low, so the chain crosses it
  });

  it("covers the whole region's boundary in small steps: no gap longer than the step along any piece", () => {
    const pts = patchBoundaryPoints(region, wholeBox(), toU, r / 8);
    // Consecutive points are either within a step or the start of the next piece (at most 5 pieces plus the chain's edges).
    let jumps = 0;
    for (let k = 1; k < pts.length; k++) {
      const a = toU(...pts[k - 1]);
      const b = toU(...pts[k]);
      if (Math.hypot(b[0] - a[0], b[1] - a[1]) > r / 8) jumps++;
    }
    expect(jumps).toBeLessThanOrEqual(3 + region.upperChain.length);
  });
});

describe("projectOntoBoundary", () => {
  it("moves a point just outside the region to the nearest boundary point (against a dense search)", () => {
    // Points above the equal-mass line (η > 1/4) and beyond the mass limits, a fraction of r away.
    const dense: [number, number][] = [];
    for (let k = 0; k <= 20000; k++) {
      const t0 = region.tau0Min + ((region.tau0Max - region.tau0Min) * k) / 20000;
      dense.push([t0, region.tau3At(t0, 0.25)], [t0, region.tau3At(t0, Math.max(0, region.etaLow(t0)))]);
    }
    for (const [t0, eta] of [
      [0.9, 0.2505],
      [1.2, 0.2503],
      [0.97, 0.2395],
      [1.3, 0.2485],
    ]) {
      const t3 = region.tau3At(t0, eta);
      expect(region.contains(t0, t3)).toBe(false);
      const target = toU(t0, t3);
      const p = projectOntoBoundary(region, toU, t0, r, target);
      const d = Math.hypot(toU(...p)[0] - target[0], toU(...p)[1] - target[1]);
      const best = Math.min(...dense.map((q) => Math.hypot(toU(...q)[0] - target[0], toU(...q)[1] - target[1])));
      expect(d).toBeLessThanOrEqual(best * (1 + 1e-6) + 1e-9);
      expect(d).toBeLessThan(r);
    }
  });
});

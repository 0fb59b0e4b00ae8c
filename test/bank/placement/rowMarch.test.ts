import { describe, expect, it } from "vitest";
import { bandProfile, type BandProfile } from "../../../packages/core/src/bank/bandProfile.js";
import { ACROSS, createBandGeometry, crossSectionGrid } from "../../../packages/core/src/bank/bandGeometry.js";
import { marchPiece } from "../../../packages/core/src/bank/rowMarch.js";
import { constantPatch, identityChart, r, region, regionGrid, worstCover } from "./flatFixture.js";

describe("marchPiece (one piece of staggered rows, constant metric, identity chart)", () => {
  const patches = [constantPatch()];
  const profile = bandProfile(region, patches) as BandProfile;
  const geometry = createBandGeometry(region, identityChart, patches, profile);
  const [lo, hi] = [0.9, 1.08];
  const crossAt = crossSectionGrid(geometry, lo, hi, 32);

  it("opens and closes with a full column of k templates and covers the band between within about r", () => {
    // The band here is 1.4–2.9 r wide (measured here; widest at the chain's kink, τ0 ≈ 0.98).
    expect(geometry.across(0.98)[ACROSS] / r).toBeGreaterThan(2.5);
    const points = marchPiece({ region, geometry, crossAt, lo, hi, rows: 2, radius: r, patchIndex: 1 })!;
    expect(points).not.toBeNull();
    const atHi = points.slice(0, 2);
    const atLo = points.slice(-2);
    // The full columns lie on the normals at hi and lo: one on each side of the middle curve.
    for (const [col, sigma] of [
      [atHi, hi],
      [atLo, lo],
    ] as const) {
      const below = col.filter((p) => region.etaAt(p.tau0, p.tau3) < geometry.etaAtFraction(p.tau0, 0.5)).length;
      expect(below).toBe(1);
      for (const p of col) expect(Math.abs(p.tau0 - sigma)).toBeLessThan(0.02); // the normal leans: measured here ≤ 0.0105 s
    }
    // Between the end normals (they lean: the corners beyond them belong to the neighbouring piece or
    // to the end clearance). Measured here: 0.983 r (the checks hold 0.99 r).
    expect(worstCover(points, regionGrid(60, 9, lo + 0.02, hi - 0.02))).toBeLessThan(1.01);
  });

  it("needs more templates for three rows than for two over the same stretch, and fails when one row cannot cover the band", () => {
    const two = marchPiece({ region, geometry, crossAt, lo, hi, rows: 2, radius: r, patchIndex: 1 })!;
    const three = marchPiece({ region, geometry, crossAt, lo, hi, rows: 3, radius: r, patchIndex: 1 })!;
    expect(three.length).toBeGreaterThan(two.length);
    // One row reaches at most r to either side: a band over 2 r wide cannot be covered by it.
    expect(marchPiece({ region, geometry, crossAt, lo, hi, rows: 1, radius: r, patchIndex: 1 })).toBeNull();
  });
});

import { describe, expect, it } from "vitest";
import { layPatchLattice } from "../../../packages/core/src/bank/patchLattice.js";
import { constantPatch, distance, identityChart, r, region, regionGrid, worstCover } from "./flatFixture.js";

describe("layPatchLattice (constant metric, identity chart)", () => {
  const patch = constantPatch();
  const anchor: [number, number] = [1, region.tau3At(1, 0.249)];
  const points = layPatchLattice({ region, chart: identityChart, patch, anchor, radius: r, patchIndex: 3 });

  it("covers patch ∩ region within the covering radius r", () => {
    // The A2 lattice with nearest-neighbour spacing √3 r has covering radius r (Conway & Sloane,
    // Sphere Packings, Lattices and Groups (1999), ch. 4; from memory), and moving boundary points
    // onto a convex boundary keeps the part of their cells inside covered. Measured here: 0.94.
    expect(worstCover(points, regionGrid(200, 9))).toBeLessThanOrEqual(1 + 1e-9);
  });

  it("lies on the A2 lattice of spacing √3 r through the anchor, except the points moved onto the boundary", () => {
    const onLattice = points.filter((p) => !p.projected);
    expect(onLattice.length).toBeGreaterThan(10);
    for (const p of onLattice) {
      // In whitened coordinates (G diagonal): u = (10 τ0, 150 τ3) relative to the anchor.
      const u0 = 10 * (p.tau0 - anchor[0]);
      const u1 = 150 * (p.tau3 - anchor[1]);
      const j = u1 / (1.5 * r);
      const i = (u0 - j * 0.5 * Math.sqrt(3) * r) / (Math.sqrt(3) * r);
      expect(Math.abs(j - Math.round(j))).toBeLessThan(1e-6);
      expect(Math.abs(i - Math.round(i))).toBeLessThan(1e-6);
    }
  });

  it("keeps every template inside the region, labelled with its patch, and no two moved points within 0.05 r", () => {
    const moved = points.filter((p) => p.projected);
    expect(moved.length).toBeGreaterThan(0);
    for (const p of points) {
      expect(p.patch).toBe(3);
      const eta = region.etaAt(p.tau0, p.tau3);
      expect(eta).toBeLessThanOrEqual(0.25 * (1 + 1e-9));
      expect(eta).toBeGreaterThanOrEqual(region.etaLow(p.tau0) * (1 - 1e-6));
    }
    for (let a = 0; a < points.length; a++) {
      for (let b = a + 1; b < points.length; b++) {
        if (points[b].projected) expect(distance([points[a].tau0, points[a].tau3], [points[b].tau0, points[b].tau3])).toBeGreaterThanOrEqual(0.05 * r);
      }
    }
  });

  it("a patch over part of the region keeps only the cells meeting it", () => {
    const half = constantPatch({ tau0Lo: region.tau0Min, tau0Hi: 1, etaLo: 0, etaHi: 0.25 });
    const part = layPatchLattice({ region, chart: identityChart, patch: half, anchor, radius: r, patchIndex: 0 });
    expect(part.length).toBeLessThan(points.length);
    // Every kept point's cell reaches the patch: its centre lies within r of τ0 ≤ 1 (distance along τ0 under G is 10 Δτ0).
    for (const p of part) expect(10 * (p.tau0 - 1)).toBeLessThanOrEqual(r * (1 + 1e-9));
    expect(worstCover(part, regionGrid(100, 9, region.tau0Min, 1))).toBeLessThanOrEqual(1 + 1e-9);
  });
});

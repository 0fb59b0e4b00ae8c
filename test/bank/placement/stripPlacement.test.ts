import { describe, expect, it } from "vitest";
import { placeStrips } from "../../../packages/core/src/bank/stripPlacement.js";
import { constantPatch, identityChart, r, region, regionGrid, worstCover } from "./flatFixture.js";

describe("placeStrips (rows along the fixture's band: constant metric, identity chart)", () => {
  const patch = constantPatch();
  const rows = placeStrips({ region, chart: identityChart, patches: [patch], patchIndex: 5, radius: r })!;

  it("covers the band within about r, with fewer templates than a lattice's area and boundary layer", () => {
    expect(rows).not.toBeNull();
    // The checks hold every triangle and every sampled edge point within 0.99 r; the band's edges
    // curve between the edge samples (r/12 apart) in this chart. Measured here: 1.012 r.
    expect(worstCover(rows, regionGrid(200, 9))).toBeLessThan(1.02);
    // The lattice of patchLattice.test.ts holds 83 here; rows measured here: 54.
    expect(rows.length).toBeLessThan(83);
    for (const p of rows) {
      expect(p).toMatchObject({ patch: 5, projected: false });
      expect(region.contains(p.tau0, p.tau3) || region.etaAt(p.tau0, p.tau3) <= 0.25 * (1 + 1e-9)).toBe(true);
    }
  });

  it("a run of two patches is covered as one band; without the end clearance only for counting", () => {
    const mid = 1.0;
    const left = constantPatch({ tau0Lo: region.tau0Min, tau0Hi: mid, etaLo: 0, etaHi: 0.25 });
    const right = constantPatch({ tau0Lo: mid, tau0Hi: region.tau0Max, etaLo: 0, etaHi: 0.25 });
    const both = placeStrips({ region, chart: identityChart, patches: [left, right], patchIndex: 0, radius: r })!;
    expect(worstCover(both, regionGrid(200, 9))).toBeLessThan(1.02);
    // Laid alone with the clearance, the left patch runs past τ0 = 1 to cover its corner there.
    const alone = placeStrips({ region, chart: identityChart, patches: [left], patchIndex: 0, radius: r })!;
    expect(Math.max(...alone.map((p) => p.tau0))).toBeGreaterThan(mid);
    const bare = placeStrips({ region, chart: identityChart, patches: [left], patchIndex: 0, radius: r, clearEnds: false })!;
    // Without it the last station is the normal at τ0 = 1 itself, which leans across the side.
    expect(bare.length).toBeLessThanOrEqual(alone.length);
    expect(Math.max(...bare.map((p) => p.tau0))).toBeLessThan(Math.max(...alone.map((p) => p.tau0)));
  });

  it("gives no rows for a run outside the region and null when the band is too wide for the rows allowed", () => {
    expect(placeStrips({ region, chart: identityChart, patches: [constantPatch({ tau0Lo: region.tau0Min, tau0Hi: region.tau0Max, etaLo: 0, etaHi: 0.2 })], patchIndex: 0, radius: r })).toEqual([]);
    expect(placeStrips({ region, chart: identityChart, patches: [patch], patchIndex: 0, radius: r / 20, maxRows: 2 })).toBeNull();
  });
});

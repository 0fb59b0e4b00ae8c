import { describe, expect, it } from "vitest";
import { chooseRunCover, patchRuns, singlePatchRuns } from "../../../packages/core/src/bank/coverChoice.js";
import type { LatticePoint, PatchBox } from "../../../packages/core/src/bank/patch.js";

const box = (tau0Lo: number, tau0Hi: number, etaLo = 0, etaHi = 0.25): PatchBox => ({ tau0Lo, tau0Hi, etaLo, etaHi });
const points = (n: number, tau0Lo: number, tau0Hi: number, patch: number): LatticePoint[] =>
  Array.from({ length: n }, (_, k) => ({ tau0: tau0Lo + ((tau0Hi - tau0Lo) * (k + 0.5)) / n, tau3: 1, patch, projected: false }));

describe("patchRuns", () => {
  it("chains neighbours along τ0 with the same η-range, in order of τ0", () => {
    // Three patches along τ0 in the lower η half, two in the upper half, listed out of order.
    const boxes = [box(2, 3, 0, 0.1), box(0, 1, 0, 0.1), box(1, 2, 0.1, 0.25), box(1, 2, 0, 0.1), box(0, 1, 0.1, 0.25)];
    expect(patchRuns(boxes)).toEqual([
      [1, 3, 0],
      [4, 2],
    ]);
    expect(singlePatchRuns(boxes)).toEqual([[1], [4], [3], [2], [0]]);
  });

  it("does not chain across a gap or a different η-range", () => {
    expect(patchRuns([box(0, 1), box(1.5, 2), box(1, 1.5, 0, 0.2)])).toEqual([[0], [2], [1]]);
  });
});

describe("chooseRunCover", () => {
  const boxes = [box(0, 1), box(1, 2), box(2, 3)];
  const lattices = [points(10, 0, 1, 0), points(10, 1, 2, 1), points(10, 2, 3, 2)];

  it("takes the run's rows when they are fewer and no inner patch's share exceeds its lattice", () => {
    const rows = [...points(9, 0, 1, 0), ...points(5, 1, 2, 0), ...points(9, 2, 3, 0)];
    const calls: string[] = [];
    const out = chooseRunCover([0, 1, 2], boxes, lattices, (run, clear) => (calls.push(`${run}:${clear}`), rows));
    expect(out).toEqual([rows]);
    expect(calls).toEqual(["0,1,2:true"]);
  });

  it("keeps the lattices when the rows are not fewer", () => {
    const out = chooseRunCover([0, 1, 2], boxes, lattices, () => points(30, 0, 3, 0));
    // Then each patch decides alone: 30 rows for one patch are not fewer than its 10 either.
    expect(out).toEqual(lattices);
  });

  it("decides patch by patch when an inner patch's share is larger than its lattice, and re-lays stretches of rows", () => {
    // The run's rows are fewer in all (25 < 30), but the middle patch holds 12 of them (> 10).
    const runRows = [...points(6, 0, 1, 0), ...points(12, 1, 2, 0), ...points(7, 2, 3, 0)];
    const alone = [points(5, 0, 1, 0), points(12, 1, 2, 1), points(4, 2, 3, 2)];
    const calls: string[] = [];
    const out = chooseRunCover([0, 1, 2], boxes, lattices, (run, clear) => {
      calls.push(`${run}:${clear}`);
      if (run.length === 3) return runRows;
      if (!clear) return alone[run[0]];
      return points(6, boxes[run[0]].tau0Lo, boxes[run[run.length - 1]].tau0Hi, run[0]); // each stretch again, with its end clearance
    });
    expect(calls).toEqual(["0,1,2:true", "0:false", "1:false", "0:true", "2:false", "2:true"]);
    expect(out).toEqual([points(6, 0, 1, 0), lattices[1], points(6, 2, 3, 2)]);
  });

  it("keeps a single patch's lattice when its rows fail", () => {
    expect(chooseRunCover([1], boxes, lattices, () => null)).toEqual([lattices[1]]);
  });
});

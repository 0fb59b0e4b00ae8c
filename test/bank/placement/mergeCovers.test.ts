import { describe, expect, it } from "vitest";
import { mergeCovers } from "../../../packages/core/src/bank/mergeCovers.js";

const p = (tau0: number, tau3: number, patch = 0) => ({ tau0, tau3, patch, projected: false });

describe("mergeCovers", () => {
  it("keeps each position once, the first of equals, in order", () => {
    const a = [p(1, 2, 0), p(3, 4, 0)];
    const b = [p(3, 4, 1), p(5, 6, 1), p(1 + 1e-14, 2, 1)];
    expect(mergeCovers([a, b])).toEqual([p(1, 2, 0), p(3, 4, 0), p(5, 6, 1)]);
  });

  it("keeps positions that differ beyond 12 significant digits", () => {
    const out = mergeCovers([[p(1, 2)], [p(1 + 1e-10, 2)], [p(1, 2 + 1e-10)]]);
    expect(out).toHaveLength(3);
  });
});

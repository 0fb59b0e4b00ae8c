import { describe, expect, it } from "vitest";
import { rowCountFor, rowPieces, rowSpacing } from "../../../packages/core/src/bank/rowSpacing.js";

describe("rowSpacing (staggered rows across a band)", () => {
  it("gives the hexagonal lattice for a band 3 radii wide in two rows (common practice, no source)", () => {
    // A2 lattice of covering radius r: rows 1.5 r apart, √3 r between neighbours in a row, and each
    // row's discs reach r/2 beyond it, so two rows cover a band of width 1.5 r + 2 × r/2 = 2.5 r.
    const { edge, spacing } = rowSpacing(2.5, 2, 1);
    expect(edge).toBeCloseTo(0.5, 6);
    expect(spacing).toBeCloseTo(Math.sqrt(3), 6);
  });

  it("gives the one-row strip limit 2 sqrt(r² − w²/4) for one row (common practice, no source)", () => {
    expect(rowSpacing(1, 1, 1).spacing).toBeCloseTo(Math.sqrt(3), 12);
    expect(rowSpacing(1.2, 1, 2).spacing).toBeCloseTo(2 * Math.sqrt(4 - 0.36), 12);
  });

  it("balances the edge rows against the inner gaps: more rows for wider bands, never a spacing above 2r", () => {
    for (const w of [0.5, 1, 2, 3, 4, 6]) {
      for (let k = 1; k <= 5; k++) {
        const { edge, spacing } = rowSpacing(w, k, 1);
        expect(spacing).toBeLessThanOrEqual(2);
        expect(edge).toBeGreaterThanOrEqual(0);
        expect(edge).toBeLessThanOrEqual((k === 1 ? w / 2 : Math.min(w / 2, 1)) + 1e-12);
        if (k === 1 && w >= 2) expect(spacing).toBe(0); // one row cannot cover a band 2r wide
      }
    }
    // A band of width 4.5 r: three staggered rows (edge r/2, rows 1.75 r apart) beat two.
    expect(3 / rowSpacing(4.5, 3, 1).spacing).toBeLessThan(2 / Math.max(1e-9, rowSpacing(4.5, 2, 1).spacing));
  });
});

describe("rowCountFor and rowPieces (row counts along a band)", () => {
  it("picks the count with the fewest templates per unit length", () => {
    // Brute force over k against the same spacings: the argmin of k / spacing.
    for (const w of [0.3, 1, 1.9, 2.5, 4, 7, 12]) {
      let best = 0;
      let density = Infinity;
      for (let k = 1; k <= 16; k++) {
        const s = rowSpacing(w, k, 1).spacing;
        if (s > 0.5 && k / s < density) [best, density] = [k, k / s];
      }
      expect(rowCountFor(w, 1, 0.5, 16)).toBe(best);
    }
    // A thin band takes one row; the hexagonal band of width 2.5 r two (common practice, no source).
    expect(rowCountFor(1, 1, 0.5, 16)).toBe(1);
    expect(rowCountFor(2.5, 1, 0.5, 16)).toBe(2);
    // Wider than maxRows rows can cover with a useful spacing: no count.
    expect(rowCountFor(20, 1, 0.5, 3)).toBe(0);
  });

  it("joins neighbouring intervals of equal count, each counted at its wider end", () => {
    const ts = [0, 1, 2, 3, 4];
    const ws = [1, 1, 2.5, 2.5, 1];
    expect(rowPieces(ts, ws, 1, 0.5, 16)).toEqual([
      { lo: 0, hi: 1, rows: 1 },
      { lo: 1, hi: 4, rows: 2 },
    ]);
    expect(rowPieces(ts, [1, 1, 20, 1, 1], 1, 0.5, 3)).toBeNull();
  });
});

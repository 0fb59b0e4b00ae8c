// Merge the covers of all runs into one list of template positions.
import type { LatticePoint } from "./patch.js";

/**
 * Significant digits of (τ0, τ3) below which two positions count as one (ours, no source: far below
 * any template spacing, far above the rounding of one computation done twice).
 */
export const MERGE_DIGITS = 12;

/**
 * The points of all lists in order, each position once: neighbouring pieces of rows share their end
 * normal and can put a template on the same point (the middle row of an odd row count). The first of
 * equal positions is kept. Appended one by one: one list can hold 10⁵ and more points, too many to spread.
 */
export function mergeCovers(lists: readonly (readonly LatticePoint[])[]): LatticePoint[] {
  const seen = new Set<string>();
  const out: LatticePoint[] = [];
  for (const list of lists) {
    for (const p of list) {
      const key = `${p.tau0.toPrecision(MERGE_DIGITS)},${p.tau3.toPrecision(MERGE_DIGITS)}`;
      if (seen.has(key)) continue;
      seen.add(key);
      out.push(p);
    }
  }
  return out;
}

import { UsageError } from "./errors.js";

/** Help text of `--spin-range`, shared by the commands that draw injections. */
export const SPIN_RANGE_HELP =
  "aligned spins of random injections: each body's dimensionless spin along the orbital angular momentum " +
  "is drawn uniformly and independently in [MIN, MAX], −1 < MIN ≤ MAX < 1 (default: no spin); " +
  "write a negative MIN as --spin-range=-0.5:0.5";

/** Help of `--spin-range` on `bank`, `bank sweep` and `scan`. */
export const BANK_SPIN_RANGE_HELP =
  "aligned spins of the templates: a bank over masses and spins whose templates carry equal spins χ1 = χ2 in [MIN, MAX], " +
  "meant for binaries whose two spins each lie in the range, −1 < MIN < MAX < 1 (write a negative MIN as --spin-range=-0.5:0.5)";

/** `--spin-range -0.5:0.9` → [−0.5, 0.9], each strictly inside (−1, 1), MIN ≤ MAX. */
export function parseSpinRangeFlag(flag: string, text: string): [number, number] {
  const parts = String(text).split(":");
  if (parts.length !== 2 || parts[0].trim() === "" || parts[1].trim() === "") {
    throw new UsageError(`${flag}: expected MIN:MAX, e.g. 0:0.5 (got "${text}")`);
  }
  const lo = Number(parts[0]);
  const hi = Number(parts[1]);
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) throw new UsageError(`${flag}: expected two numbers MIN:MAX (got "${text}")`);
  if (!(lo > -1) || !(hi < 1)) throw new UsageError(`${flag}: spins must lie strictly between −1 and 1 (got "${text}")`);
  if (hi < lo) throw new UsageError(`${flag}: MIN must not exceed MAX (got "${text}")`);
  return [lo, hi];
}

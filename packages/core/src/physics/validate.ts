// Boundary checks shared by the physics functions (internal; not re-exported).
import { InputError } from "../errors.js";

/** Formats a received value for an error message: numbers as written, anything else quoted. */
function shown(value: unknown): string {
  return typeof value === "number" ? String(value) : JSON.stringify(value) ?? String(value);
}

/**
 * Throws InputError unless `value` is a finite number > 0.
 * `where` is the function name, `name` the parameter (with its unit), e.g. ("chirpMass", "m1 (kg)").
 */
export function requirePositive(where: string, name: string, value: number): void {
  if (typeof value !== "number" || !Number.isFinite(value) || value <= 0) {
    throw new InputError(`${where}: ${name} must be a positive finite number (got ${shown(value)})`);
  }
}

/** Throws InputError unless 0 ≤ e < 1 (a bound Keplerian orbit). */
export function requireEccentricity(where: string, name: string, value: number): void {
  if (typeof value !== "number" || !Number.isFinite(value) || value < 0 || value >= 1) {
    throw new InputError(`${where}: ${name} must be in [0, 1) for a bound orbit (got ${shown(value)})`);
  }
}

/** Throws InputError unless `value` is finite (any sign). */
export function requireFinite(where: string, name: string, value: number): void {
  if (typeof value !== "number" || !Number.isFinite(value)) {
    throw new InputError(`${where}: ${name} must be a finite number (got ${shown(value)})`);
  }
}

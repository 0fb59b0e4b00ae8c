// Boundary checks shared by the TaylorF2 files (internal; not re-exported from waveform/index.ts).
import { InputError } from "../errors.js";

function shown(value: unknown): string {
  return typeof value === "number" ? String(value) : (JSON.stringify(value) ?? String(value));
}

/** Throws InputError unless `value` is a finite number > 0. `where` names the function, `name` the parameter. */
export function requirePositiveFinite(where: string, name: string, value: number): void {
  if (typeof value !== "number" || !Number.isFinite(value) || value <= 0) {
    throw new InputError(`${where}: ${name} must be a positive finite number (got ${shown(value)})`);
  }
}

/** Throws InputError unless `value` is > 0 (Infinity allowed: no upper cut). */
export function requirePositiveOrInfinity(where: string, name: string, value: number): void {
  if (typeof value !== "number" || Number.isNaN(value) || value <= 0) {
    throw new InputError(`${where}: ${name} must be a positive number or Infinity (got ${shown(value)})`);
  }
}

/** Throws InputError unless both component masses (solar masses) are positive and finite. */
export function requireMasses(where: string, m1Solar: number, m2Solar: number): void {
  requirePositiveFinite(where, "m1Solar", m1Solar);
  requirePositiveFinite(where, "m2Solar", m2Solar);
}

/** Throws InputError unless `eta` ∈ (0, 1/4] (an excess over 1/4 of rounding size, ≤ 1e-12 relative, is accepted). */
export function checkEta(where: string, eta: number): void {
  if (typeof eta !== "number" || !Number.isFinite(eta) || eta <= 0 || eta > 0.25 * (1 + 1e-12)) {
    throw new InputError(`${where}: eta must be in (0, 0.25] (got ${shown(eta)})`);
  }
}

/** Throws InputError unless `pnOrder` is an integer in 0..7 (twice the PN order). */
export function checkPnOrder(where: string, pnOrder: number): void {
  if (!Number.isInteger(pnOrder) || pnOrder < 0 || pnOrder > 7) {
    throw new InputError(`${where}: pnOrder must be an integer 0..7, twice the PN order (got ${shown(pnOrder)})`);
  }
}

/** Throws InputError unless `nBins` is a positive integer. */
export function requireBinCount(where: string, nBins: number): void {
  if (!Number.isInteger(nBins) || nBins < 1) {
    throw new InputError(`${where}: nBins must be a positive integer (got ${shown(nBins)})`);
  }
}

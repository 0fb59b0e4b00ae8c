// The component masses chirpsieve models.
import { parameterError } from "../errors.js";

/**
 * Lightest and heaviest component mass (solar masses) chirpsieve accepts. Ours: lighter than about
 * a Jupiter mass (1e-3 M_sun) no compact object is known, and heavier than 1e5 M_sun a binary's
 * chirp ends (at its ISCO) below 0.03 Hz, far below any band this tool filters; outside these
 * bounds the chirp times over- or underflow float64 long before anything physical happens.
 */
export const MIN_COMPONENT_MASS_SOLAR = 1e-3;
export const MAX_COMPONENT_MASS_SOLAR = 1e5;

/**
 * Checks a component-mass range [min, max] (solar masses) against the domain above; throws a
 * parameterError on `parameter` naming the bound.
 */
export function checkComponentMassRange(range: readonly number[] | undefined, parameter = "massRangeSolar"): void {
  const [lo, hi] = range ?? [];
  if (!(Number.isFinite(lo) && Number.isFinite(hi) && lo > 0 && hi > 0)) {
    throw parameterError(parameter, `must be two positive numbers of solar masses (got ${JSON.stringify(range)})`);
  }
  if (lo < MIN_COMPONENT_MASS_SOLAR || hi > MAX_COMPONENT_MASS_SOLAR) {
    throw parameterError(
      parameter,
      `component masses must lie within ${MIN_COMPONENT_MASS_SOLAR}–${MAX_COMPONENT_MASS_SOLAR} M_sun, the domain chirpsieve models (got ${lo}–${hi})`,
    );
  }
}

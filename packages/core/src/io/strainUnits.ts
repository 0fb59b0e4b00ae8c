/**
 * Unit names that mean dimensionless strain (case and surrounding space ignored). A file that
 * states none is taken as strain.
 */
export const STRAIN_UNIT_NAMES: readonly string[] = ["strain", "dimensionless", "1", "", "h", "strain (dimensionless)"];

/**
 * True when `units` (as a file states them) mean dimensionless strain, so that amplitudes, and
 * distances derived from them, are physical; false for anything else (e.g. "counts", "V"), for
 * which effective distances in Mpc would be wrong by the unknown calibration.
 */
export function isDimensionlessStrain(units: string | undefined): boolean {
  if (units === undefined) return true;
  return STRAIN_UNIT_NAMES.includes(units.trim().toLowerCase());
}

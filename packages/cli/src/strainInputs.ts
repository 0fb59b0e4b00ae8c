// What the CLI says about the strain files it reads: warnings and units.
import {
  isDimensionlessStrain,
  openStrain,
  type StrainOpenOptions,
  type StrainReader,
} from "@chirpsieve/core";

/** Prints each of a file's warnings on stderr, one line each (they name the file). */
export function printStrainWarnings(warnings: readonly string[] | undefined): void {
  for (const w of warnings ?? []) process.stderr.write(`chirpsieve: warning: ${w}\n`);
}

/** Opens a strain file and prints its warnings. */
export async function openStrainInput(path: string, options: StrainOpenOptions): Promise<StrainReader> {
  const source = await openStrain(path, options);
  printStrainWarnings(source.warnings);
  return source;
}

/** Files whose stated units are not dimensionless strain, with their units. */
export interface NonStrainInput {
  file: string;
  units: string;
}

/**
 * The inputs whose units are not dimensionless strain, each with a one-line note on stderr saying
 * `what` is not given: distances would be wrong by the unknown calibration.
 */
export function nonStrainInputs(
  sources: readonly { file: string; units?: string }[],
  what = "effective distances are unavailable (null in JSON, — in tables, empty in CSV)",
): NonStrainInput[] {
  const out: NonStrainInput[] = [];
  for (const s of sources) {
    if (isDimensionlessStrain(s.units)) continue;
    out.push({ file: s.file, units: s.units! });
    process.stderr.write(
      `chirpsieve: note: ${s.file}: units ${JSON.stringify(s.units)} are not dimensionless strain, so ${what}\n`,
    );
  }
  return out;
}

import { extname } from "node:path";
import { InputError } from "../errors.js";
import type { StrainFormat } from "./strainTypes.js";

const FORMATS: readonly StrainFormat[] = ["f32", "f64", "text", "hdf5"];

/** File extensions (lower case) and the strain format each one means. */
export const STRAIN_EXTENSIONS: Readonly<Record<string, StrainFormat>> = {
  ".f32": "f32",
  ".f64": "f64",
  ".txt": "text",
  ".dat": "text",
  ".csv": "text",
  ".h5": "hdf5",
  ".hdf5": "hdf5",
  ".hdf": "hdf5",
};

/**
 * The strain format of `path`: `format` when given (checked), else from the extension
 * (case-insensitive, see {@link STRAIN_EXTENSIONS}). An unknown extension is an InputError.
 */
export function strainFormatOf(path: string, format?: StrainFormat): StrainFormat {
  if (format !== undefined) {
    if (!FORMATS.includes(format)) {
      throw new InputError(`format must be one of ${FORMATS.join(", ")} (got ${JSON.stringify(format)})`);
    }
    return format;
  }
  const ext = extname(path).toLowerCase();
  const found = Object.prototype.hasOwnProperty.call(STRAIN_EXTENSIONS, ext) ? STRAIN_EXTENSIONS[ext] : undefined;
  if (found === undefined) {
    const known = Object.keys(STRAIN_EXTENSIONS).join(", ");
    throw new InputError(
      `${path}: cannot tell the strain format from the extension ${ext === "" ? "(none)" : JSON.stringify(ext)}; strain files must end in one of ${known} (the extension decides how a file is read)`,
    );
  }
  return found;
}

import { InputError, parameterError } from "../errors.js";
import { openHdf5Strain, writeHdf5Strain } from "./hdf5Strain.js";
import { openRawStrain, writeRawStrain } from "./rawStrain.js";
import { checkOutputDirectory, checkRateStartOptions, checkSeriesToWrite, shown } from "./strainChecks.js";
import { strainFormatOf } from "./strainFormat.js";
import { checkFileTimeBase } from "./timeBase.js";
import { openTextStrain, writeTextStrain } from "./textStrain.js";
import type {
  StrainOpenOptions,
  StrainSeries,
  StrainReader,
  StrainWriteInput,
  StrainWriteOptions,
} from "./strainTypes.js";

function checkPath(path: unknown): asserts path is string {
  if (typeof path !== "string" || path === "") {
    throw new InputError(`strain file path must be a non-empty string (got ${shown(path)})`);
  }
}

function checkOpenOptions(options: StrainOpenOptions): void {
  if (options === null || typeof options !== "object") throw new InputError(`strain open options must be an object`);
  checkRateStartOptions(options.rate, options.start);
  if (options.nonFinite !== undefined && options.nonFinite !== "error" && options.nonFinite !== "allow") {
    throw new InputError(`nonFinite must be "error" or "allow" (got ${shown(options.nonFinite)})`);
  }
  for (const key of ["dataset", "rateAttribute", "startAttribute"] as const) {
    const v = options[key];
    if (v !== undefined && (typeof v !== "string" || v.trim() === "")) {
      throw parameterError(key, `must be a non-empty name (got ${shown(v)})`);
    }
  }
}

/**
 * Opens a strain file for chunked reading: raw .f32/.f64 with a .json sidecar, text
 * (.txt/.dat/.csv) or HDF5 (.h5/.hdf5/.hdf); the format comes from the extension unless
 * `options.format` says otherwise. Every problem with the file is an InputError whose one-line
 * message names the file (and the line, sample or attribute) and what is wrong; a missing file is
 * `<path>: no such file`. Close the source when done.
 */
export async function openStrain(path: string, options: StrainOpenOptions = {}): Promise<StrainReader> {
  checkPath(path);
  checkOpenOptions(options);
  const format = strainFormatOf(path, options.format);
  if (options.dataset !== undefined && format !== "hdf5") {
    throw parameterError("dataset", `${path}: a dataset (${options.dataset}) applies only to HDF5 files; this is a ${format === "text" ? "text" : "raw " + format} file`);
  }
  const source =
    format === "text" ? await openTextStrain(path, options) : format === "hdf5" ? await openHdf5Strain(path, options) : await openRawStrain(path, format, options);
  try {
    checkFileTimeBase(path, source.sampleRate, source.startTime, source.length);
  } catch (err) {
    await source.close();
    throw err;
  }
  return source;
}

/** Samples per read when {@link readStrain} loads a whole file (bounds the HDF5 worker's memory). */
const READ_CHUNK = 1 << 22;

/** Reads a whole strain file into memory (see {@link openStrain}); every sample is checked. */
export async function readStrain(path: string, options: StrainOpenOptions = {}): Promise<StrainSeries> {
  const source = await openStrain(path, options);
  try {
    let data: Float64Array;
    if (source.length <= READ_CHUNK) {
      data = await source.read(0, source.length);
    } else {
      data = new Float64Array(source.length);
      for (let at = 0; at < source.length; at += READ_CHUNK) {
        data.set(await source.read(at, Math.min(READ_CHUNK, source.length - at)), at);
      }
    }
    const series: StrainSeries = { data, sampleRate: source.sampleRate, startTime: source.startTime, file: source.file };
    if (source.label !== undefined) series.label = source.label;
    if (source.units !== undefined) series.units = source.units;
    if (source.warnings !== undefined && source.warnings.length > 0) series.warnings = [...source.warnings];
    return series;
  } finally {
    await source.close();
  }
}

/**
 * Writes a strain file atomically (temporary file in the same directory, then rename; a raw
 * file's sidecar is written the same way, after the data). Formats: .f32/.f64 (little-endian, or
 * big-endian with `options.byteOrder` "big", with sidecar `<path>.json` stating it), text (two columns, time and strain, shortest round-trip
 * numbers; comma-separated for .csv) or HDF5 (float64 dataset `options.dataset`, default
 * "strain", with attributes sampleRate, startTime, label, units). The series is checked first:
 * sampleRate positive, startTime finite, at least one sample, and (unless
 * `options.nonFinite` is "allow") no NaN/±Infinity samples.
 */
export async function writeStrain(
  path: string,
  series: StrainWriteInput,
  options: StrainWriteOptions = {},
): Promise<void> {
  checkPath(path);
  if (options === null || typeof options !== "object") throw new InputError(`strain write options must be an object`);
  const nonFinite = options.nonFinite ?? "error";
  if (nonFinite !== "error" && nonFinite !== "allow") {
    throw new InputError(`nonFinite must be "error" or "allow" (got ${shown(nonFinite)})`);
  }
  const format = strainFormatOf(path, options.format);
  const byteOrder = options.byteOrder ?? "little";
  if (byteOrder !== "little" && byteOrder !== "big") {
    throw new InputError(`byteOrder must be "little" or "big" (got ${shown(byteOrder)})`);
  }
  checkSeriesToWrite(path, series, nonFinite);
  await checkOutputDirectory(path);
  switch (format) {
    case "f32":
    case "f64":
      writeRawStrain(path, series, format, byteOrder, options.sidecarPath);
      return;
    case "text":
      writeTextStrain(path, series);
      return;
    case "hdf5":
      await writeHdf5Strain(path, series, options.dataset ?? "strain");
      return;
  }
}

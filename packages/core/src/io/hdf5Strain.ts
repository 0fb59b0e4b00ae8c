// HDF5 strain files through h5wasm (internal: use strainFile.ts).
import { open, rename, rm } from "node:fs/promises";
import { resolve } from "node:path";
import { partialPathFor, removeStalePartials } from "./atomicWrite.js";
import { outputTarget } from "./fileIdentity.js";
import { InputError, parameterError } from "../errors.js";
import { Hdf5Failure, hdf5Request } from "./hdf5Client.js";
import { agrees, checkFinite, checkReadRange, inputFsError, shown, statInputFile } from "./strainChecks.js";
import type { StrainOpenOptions, StrainReader, StrainWriteInput } from "./strainTypes.js";

/** Attribute names read as a sample rate in Hz. */
export const HDF5_RATE_ATTRIBUTES: readonly string[] = ["sampleRate", "sample_rate", "samplingRate", "sampling_rate", "rate", "fs"];
/** Attribute names read as a sample spacing in seconds. */
export const HDF5_SPACING_ATTRIBUTES: readonly string[] = ["dt", "spacing", "delta", "deltaT", "delta_t", "Xspacing"];
/** Attribute names read as the start time in seconds. */
export const HDF5_START_ATTRIBUTES: readonly string[] = ["startTime", "start_time", "start", "t0", "Xstart"];

/** The 8-byte HDF5 format signature (HDF5 File Format Specification, "Format Signature"). */
const SIGNATURE = [0x89, 0x48, 0x44, 0x46, 0x0d, 0x0a, 0x1a, 0x0a];

/**
 * True when the HDF5 signature sits where the HDF5 specification allows a superblock: byte 0,
 * 512, 1024, 2048, … (after a user block). Checked before the library sees the file.
 */
async function hasHdf5Signature(path: string, size: number): Promise<boolean> {
  let handle;
  try {
    handle = await open(path, "r");
  } catch (err) {
    throw inputFsError(path, err);
  }
  try {
    const buf = new Uint8Array(8);
    for (let at = 0; at + 8 <= size; at = at === 0 ? 512 : at * 2) {
      const { bytesRead } = await handle.read(buf, 0, 8, at);
      if (bytesRead === 8 && SIGNATURE.every((b, i) => buf[i] === b)) return true;
    }
    return false;
  } finally {
    await handle.close();
  }
}

/** Strips leading/trailing and repeated slashes: "/a//b/" → "a/b". */
function normalisePath(p: string): string {
  return p.split("/").filter((s) => s !== "").join("/");
}

interface DatasetInfo {
  path: string;
  type: number;
  size: number;
  signed: boolean;
  shape: number[] | null;
}

/** HDF5 datatype classes (H5T_class_t in the HDF5 reference manual). */
function describeType(info: DatasetInfo): string {
  switch (info.type) {
    case 0:
      return `${info.signed ? "int" : "uint"}${info.size * 8}`;
    case 1:
      return `float${info.size * 8}`;
    case 2:
      return "time";
    case 3:
      return "string";
    case 4:
      return "bitfield";
    case 5:
      return "opaque";
    case 6:
      return "compound";
    case 7:
      return "reference";
    case 8:
      return "enum";
    case 9:
      return "variable-length";
    case 10:
      return "array";
    case 11:
      return "complex";
    default:
      return `type class ${info.type}`;
  }
}

function describeShape(shape: number[] | null): string {
  if (shape === null) return "no dataspace";
  if (shape.length === 0) return "scalar";
  return shape.join("×");
}

function isStrainCandidate(info: DatasetInfo): boolean {
  return info.type === 1 && (info.size === 4 || info.size === 8) && info.shape !== null && info.shape.length === 1;
}

/** A scalar number from an attribute value (number, bigint, or a one-element array). */
function scalarOf(value: unknown): number | undefined {
  if (typeof value === "number") return value;
  if (typeof value === "bigint") return Number(value);
  if ((ArrayBuffer.isView(value) || Array.isArray(value)) && (value as ArrayLike<unknown>).length === 1) {
    return scalarOf((value as ArrayLike<unknown>)[0]);
  }
  return undefined;
}

/** One attribute found on the dataset or the root group. */
interface Found {
  name: string;
  where: string;
  value: unknown;
}

class Hdf5StrainSource implements StrainReader {
  private open = true;
  constructor(
    private readonly handle: number,
    private readonly generation: number,
    private readonly datasetPath: string,
    readonly file: string,
    readonly sampleRate: number,
    readonly startTime: number,
    readonly length: number,
    private readonly checkSamples: boolean,
    readonly label?: string,
    readonly units?: string,
  ) {}

  async read(offset: number, count: number): Promise<Float64Array> {
    checkReadRange(this.file, offset, count, this.length);
    if (!this.open) throw new Error(`${this.file}: read after close`);
    if (count === 0) return new Float64Array(0);
    const what = `cannot read samples ${offset}..${offset + count}`;
    let raw: unknown;
    try {
      ({ value: raw } = await hdf5Request<unknown>(
        "read",
        { handle: this.handle, dataset: this.datasetPath, offset, count },
        { samples: count, generation: this.generation },
      ));
    } catch (err) {
      throw asInputError(this.file, err, what);
    }
    if (!(raw instanceof Float64Array || raw instanceof Float32Array) || raw.length !== count) {
      throw new InputError(`${this.file}: ${what} (the HDF5 library returned something other than those samples)`);
    }
    const out = raw instanceof Float64Array ? raw : Float64Array.from(raw);
    if (this.checkSamples) checkFinite(this.file, out, offset, this.sampleRate, this.startTime);
    return out;
  }

  async close(): Promise<void> {
    if (!this.open) return;
    this.open = false;
    await closeQuietly(this.handle, this.generation);
  }
}

async function closeQuietly(handle: number, generation: number): Promise<void> {
  try {
    await hdf5Request("close", { handle }, { generation });
  } catch {
    // Closing a damaged file can report errors, and a restarted worker has nothing to close.
  }
}

/** An InputError for a failed HDF5 request on a file the user named (other errors pass through). */
function asInputError(path: string, err: unknown, what = "unreadable HDF5 file"): unknown {
  if (err instanceof Hdf5Failure) return new InputError(`${path}: ${what} (${err.reason})`);
  return err;
}

/**
 * Opens a strain dataset in an HDF5 file for chunked reading (see {@link StrainOpenOptions} for
 * how the dataset, sample rate and start time are found). The HDF5 library runs in a worker
 * thread (see hdf5Client.ts), so a damaged file cannot hang or crash the caller.
 */
export async function openHdf5Strain(path: string, options: StrainOpenOptions): Promise<StrainReader> {
  const st = await statInputFile(path);
  if (st.size === 0) throw new InputError(`${path}: empty file`);
  if (!(await hasHdf5Signature(path, st.size))) {
    throw new InputError(`${path}: not an HDF5 file (no HDF5 signature found)`);
  }
  let opened: { value: { handle: number; datasets: DatasetInfo[]; groups: string[] }; generation: number };
  try {
    opened = await hdf5Request("open", { path: resolve(path) });
  } catch (err) {
    throw asInputError(path, err);
  }
  const { handle, datasets, groups } = opened.value;
  const generation = opened.generation;
  try {
    const listing = (infos: DatasetInfo[]) =>
      infos.map((d) => `/${d.path} (${describeType(d)}, ${describeShape(d.shape)})`).join(", ");

    let info: DatasetInfo;
    if (options.dataset !== undefined) {
      const want = normalisePath(options.dataset);
      const hit = datasets.find((d) => d.path === want);
      if (!hit) {
        if (want === "" || groups.includes(want)) {
          throw new InputError(`${path}: /${want} is a group, not a dataset (datasets: ${listing(datasets) || "none"})`);
        }
        throw new InputError(`${path}: no dataset /${want} (datasets: ${listing(datasets) || "none"})`);
      }
      info = hit;
    } else {
      const candidates = datasets.filter(isStrainCandidate);
      if (candidates.length === 0) {
        throw parameterError(
          "dataset",
          `${path}: no 1-D floating-point dataset (datasets: ${listing(datasets) || "none"}); name the dataset to read`,
        );
      }
      if (candidates.length > 1) {
        throw parameterError(
          "dataset",
          `${path}: several 1-D floating-point datasets (${candidates.map((d) => `/${d.path}`).join(", ")}); name the one to read`,
        );
      }
      info = candidates[0];
    }
    const dsName = `/${info.path}`;
    if (info.type !== 1 || (info.size !== 4 && info.size !== 8)) {
      throw new InputError(`${path}: dataset ${dsName} holds ${describeType(info)} values; strain must be float32 or float64`);
    }
    if (info.shape === null || info.shape.length !== 1) {
      throw new InputError(`${path}: dataset ${dsName} has shape ${describeShape(info.shape)}; strain must be a 1-D dataset`);
    }
    const length = info.shape[0];
    if (length === 0) throw new InputError(`${path}: dataset ${dsName} is empty (no samples)`);

    // Every attribute name we may use, read once from the dataset and once from the root.
    const wanted = [
      ...HDF5_RATE_ATTRIBUTES,
      ...HDF5_SPACING_ATTRIBUTES,
      ...HDF5_START_ATTRIBUTES,
      "label",
      "units",
      ...(options.rateAttribute !== undefined ? [options.rateAttribute] : []),
      ...(options.startAttribute !== undefined ? [options.startAttribute] : []),
    ];
    const places: { where: string; values: Record<string, unknown> }[] = [];
    for (const [object, where] of [
      [info.path, dsName],
      ["", "the file root"],
    ] as const) {
      try {
        const { value } = await hdf5Request<{ present: string[]; values: Record<string, unknown> }>(
          "attrs",
          { handle, object, names: wanted },
          { generation },
        );
        places.push({ where, values: value.values });
      } catch (err) {
        throw asInputError(path, err);
      }
    }
    // Attributes on the dataset take precedence over those on the root: `find` returns the
    // matches on the first of the two places that has any.
    const find = (names: readonly string[]): Found[] => {
      for (const place of places) {
        const found: Found[] = [];
        for (const name of names) {
          if (Object.prototype.hasOwnProperty.call(place.values, name)) {
            found.push({ name, where: place.where, value: place.values[name] });
          }
        }
        if (found.length > 0) return found;
      }
      return [];
    };
    const numberOf = (f: Found, what: string): number => {
      const x = scalarOf(f.value);
      if (x === undefined || !Number.isFinite(x)) {
        throw new InputError(`${path}: attribute ${f.name} on ${f.where} must be ${what} (got ${shown(f.value)})`);
      }
      return x;
    };
    // Sample rate: a named attribute, else the known names; Hz or a spacing in seconds.
    const rateFound: { hz: number; text: string }[] = [];
    const toHz = (f: Found, spacing: boolean) => {
      const x = numberOf(f, spacing ? "a positive spacing in seconds" : "a positive rate in Hz");
      if (x <= 0) {
        throw new InputError(`${path}: attribute ${f.name} on ${f.where} must be positive (got ${x})`);
      }
      rateFound.push({ hz: spacing ? 1 / x : x, text: `${f.name} = ${x}${spacing ? " s" : " Hz"} on ${f.where}` });
    };
    if (options.rateAttribute !== undefined) {
      const name = options.rateAttribute;
      const found = find([name]);
      if (found.length === 0) throw new InputError(`${path}: no attribute ${name} on ${dsName} or the file root`);
      const f = found[0];
      const x = numberOf(f, "a positive number");
      const spacing = HDF5_RATE_ATTRIBUTES.includes(name) ? false : HDF5_SPACING_ATTRIBUTES.includes(name) ? true : x < 1;
      toHz(f, spacing);
    } else {
      for (const f of find([...HDF5_RATE_ATTRIBUTES, ...HDF5_SPACING_ATTRIBUTES])) {
        toHz(f, HDF5_SPACING_ATTRIBUTES.includes(f.name));
      }
      for (const other of rateFound.slice(1)) {
        if (!agrees(other.hz, rateFound[0].hz, 1e-9)) {
          throw new InputError(`${path}: sample-rate attributes disagree (${rateFound[0].text}; ${other.text})`);
        }
      }
    }
    let sampleRate: number;
    if (rateFound.length > 0) {
      sampleRate = rateFound[0].hz;
      if (options.rate !== undefined && !agrees(options.rate, sampleRate, 1e-9)) {
        throw new InputError(`${path}: the given rate ${options.rate} Hz disagrees with ${rateFound[0].text}`);
      }
    } else if (options.rate !== undefined) {
      sampleRate = options.rate;
    } else {
      throw parameterError(
        "rate",
        `${path}: no sample rate in the file (no attribute ${[...HDF5_RATE_ATTRIBUTES, ...HDF5_SPACING_ATTRIBUTES].join("/")} on ${dsName} or the root); give the sample rate (Hz)`,
      );
    }

    // Start time: a named attribute, else the known names.
    const startNames = options.startAttribute !== undefined ? [options.startAttribute] : HDF5_START_ATTRIBUTES;
    const startFound = find(startNames);
    if (options.startAttribute !== undefined && startFound.length === 0) {
      throw new InputError(`${path}: no attribute ${options.startAttribute} on ${dsName} or the file root`);
    }
    let startTime: number;
    if (startFound.length > 0) {
      const f = startFound[0];
      startTime = numberOf(f, "a finite number of seconds");
      for (const other of startFound.slice(1)) {
        const y = numberOf(other, "a finite number of seconds");
        if (y !== startTime) {
          throw new InputError(`${path}: start-time attributes disagree (${f.name} = ${startTime} s on ${f.where}; ${other.name} = ${y} s on ${other.where})`);
        }
      }
      const tol = 1e-6 / sampleRate + 8 * Number.EPSILON * Math.abs(startTime);
      if (options.start !== undefined && Math.abs(options.start - startTime) > tol) {
        throw new InputError(`${path}: the given start ${options.start} s disagrees with ${f.name} = ${startTime} s on ${f.where}`);
      }
    } else if (options.start !== undefined) {
      startTime = options.start;
    } else {
      throw parameterError(
        "start",
        `${path}: no start time in the file (no attribute ${HDF5_START_ATTRIBUTES.join("/")} on ${dsName} or the root); give the start time (s)`,
      );
    }

    const text = (name: string): string | undefined => {
      const f = find([name])[0];
      return f !== undefined && typeof f.value === "string" ? f.value : undefined;
    };
    return new Hdf5StrainSource(
      handle,
      generation,
      info.path,
      path,
      sampleRate,
      startTime,
      length,
      options.nonFinite !== "allow",
      text("label"),
      text("units"),
    );
  } catch (err) {
    await closeQuietly(handle, generation);
    throw err;
  }
}

/** Checks an HDF5 dataset path for writing and splits it: "/a/b" → ["a", "b"]. */
export function hdf5DatasetSegments(dataset: string): string[] {
  if (typeof dataset !== "string") throw parameterError("dataset", `must be a path like "strain" (got ${shown(dataset)})`);
  const segments = dataset.split("/").filter((s) => s !== "");
  if (segments.length === 0 || segments.some((s) => s === "." || s === ".." || /[\u0000-\u001f]/.test(s))) {
    throw parameterError("dataset", `must be a path like "strain" or "group/strain" (got ${shown(dataset)})`);
  }
  return segments;
}

/**
 * Writes a float64 dataset (default "strain") with attributes sampleRate (Hz), startTime (s) and,
 * when given, label and units, to a temporary file beside `path` that is then renamed over it.
 * Assumes a checked series.
 */
export async function writeHdf5Strain(path: string, series: StrainWriteInput, dataset = "strain"): Promise<void> {
  const segments = hdf5DatasetSegments(dataset);
  const data = Float64Array.from(series.data);
  const target = outputTarget(path);
  removeStalePartials(target);
  const tmp = partialPathFor(target);
  const numberAttrs: [string, number][] = [
    ["sampleRate", series.sampleRate],
    ["startTime", series.startTime],
  ];
  const stringAttrs: [string, string][] = [];
  if (series.label !== undefined) stringAttrs.push(["label", series.label]);
  if (series.units !== undefined) stringAttrs.push(["units", series.units]);
  try {
    try {
      await hdf5Request(
        "write",
        { path: resolve(tmp), segments, data, numberAttrs, stringAttrs },
        { samples: data.length, transfer: [data.buffer] },
      );
    } catch (err) {
      if (err instanceof Hdf5Failure) throw new Error(`${path}: could not write the HDF5 file (${err.reason})`);
      throw err;
    }
    const handle = await open(tmp, "r+");
    try {
      await handle.sync();
    } finally {
      await handle.close();
    }
    await rename(tmp, target);
  } catch (err) {
    await rm(tmp, { force: true });
    throw err;
  }
}

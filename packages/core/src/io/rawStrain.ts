// Raw float32/float64 strain (little- or big-endian) with a JSON sidecar (internal: use strainFile.ts).
import { open, readFile } from "node:fs/promises";
import type { FileHandle } from "node:fs/promises";
import { endianness } from "node:os";
import { InputError } from "../errors.js";
import { writeFileAtomic } from "./atomicWrite.js";
import {
  agrees,
  checkFinite,
  checkReadRange,
  inputFsError,
  shown,
  statInputFile,
} from "./strainChecks.js";
import type { StrainOpenOptions, StrainRun, StrainReader, StrainWriteInput } from "./strainTypes.js";

/** The two raw formats: IEEE-754 float32 (.f32) or float64 (.f64) samples. */
export type RawStrainFormat = "f32" | "f64";

/** Byte order of raw samples, as a sidecar's "byteOrder" states it (default "little"). */
export type ByteOrder = "little" | "big";

/** The keys a sidecar may hold; any other is reported as a warning and ignored. */
export const RAW_SIDECAR_KEYS: readonly string[] = ["sampleRate", "startTime", "label", "units", "length", "sampleType", "byteOrder", "run"];

const SAMPLE_TYPE: Record<RawStrainFormat, "float32" | "float64"> = { f32: "float32", f64: "float64" };
const SAMPLE_BYTES: Record<RawStrainFormat, number> = { f32: 4, f64: 8 };
const LITTLE_ENDIAN_HOST = endianness() === "LE";

/** The sidecar of a raw strain file: the same path plus ".json". */
export function rawSidecarPath(path: string): string {
  return `${path}.json`;
}

/** What a sidecar says, after checking. */
export interface RawSidecar {
  sampleRate: number;
  startTime: number;
  label?: string;
  units?: string;
  /** Number of samples, when the sidecar states it. */
  length?: number;
  /** Byte order of the samples (default "little"). */
  byteOrder: ByteOrder;
  /** One line per unknown key, naming the sidecar (the key is ignored). */
  warnings: string[];
  /** The run that wrote the file, when the sidecar records it. */
  run?: StrainRun;
}

/**
 * Parses and checks the sidecar JSON of a raw strain file of `format`:
 * `{"sampleRate": Hz, "startTime": s}` plus optional "label", "units", "length" (samples),
 * "sampleType" ("float32" | "float64", must match the format) and "byteOrder" ("little" | "big",
 * default "little"). Other keys are ignored, each with a warning naming the sidecar and the key.
 * Every problem is an InputError naming `sidecar`.
 */
export function parseRawSidecar(sidecar: string, text: string, format: RawStrainFormat): RawSidecar {
  let json: unknown;
  try {
    json = JSON.parse(text.charCodeAt(0) === 0xfeff ? text.slice(1) : text);
  } catch (err) {
    const why = err instanceof Error ? err.message.replace(/\s+/g, " ") : "parse error";
    throw new InputError(`${sidecar}: malformed JSON (${why})`);
  }
  if (json === null || typeof json !== "object" || Array.isArray(json)) {
    throw new InputError(`${sidecar}: expected a JSON object like {"sampleRate": 4096, "startTime": 0} (got ${shown(json)})`);
  }
  const o = json as Record<string, unknown>;
  if (!("sampleRate" in o)) throw new InputError(`${sidecar}: missing "sampleRate" (Hz)`);
  const sampleRate = o.sampleRate;
  if (typeof sampleRate !== "number" || !Number.isFinite(sampleRate) || sampleRate <= 0) {
    throw new InputError(`${sidecar}: sampleRate must be a positive number (got ${shown(sampleRate)})`);
  }
  if (!("startTime" in o)) throw new InputError(`${sidecar}: missing "startTime" (seconds)`);
  const startTime = o.startTime;
  if (typeof startTime !== "number" || !Number.isFinite(startTime)) {
    throw new InputError(`${sidecar}: startTime must be a finite number of seconds (got ${shown(startTime)})`);
  }
  let byteOrder: ByteOrder = "little";
  if (o.byteOrder !== undefined) {
    if (o.byteOrder !== "little" && o.byteOrder !== "big") {
      throw new InputError(`${sidecar}: byteOrder must be "little" or "big" (got ${shown(o.byteOrder)})`);
    }
    byteOrder = o.byteOrder;
  }
  const warnings = Object.keys(o)
    .filter((k) => !RAW_SIDECAR_KEYS.includes(k))
    .map((k) => `${sidecar}: unknown key ${shown(k)} ignored (known: ${RAW_SIDECAR_KEYS.join(", ")})`);
  const out: RawSidecar = { sampleRate, startTime, byteOrder, warnings };
  for (const key of ["label", "units"] as const) {
    const v = o[key];
    if (v === undefined) continue;
    if (typeof v !== "string") throw new InputError(`${sidecar}: ${key} must be a string (got ${shown(v)})`);
    out[key] = v;
  }
  if (o.sampleType !== undefined) {
    const want = SAMPLE_TYPE[format];
    if (o.sampleType !== "float32" && o.sampleType !== "float64") {
      throw new InputError(`${sidecar}: sampleType must be "float32" or "float64" (got ${shown(o.sampleType)})`);
    }
    if (o.sampleType !== want) {
      throw new InputError(`${sidecar}: sampleType ${shown(o.sampleType)} disagrees with the .${format} data file (${want})`);
    }
  }
  if (o.length !== undefined) {
    const n = o.length;
    if (typeof n !== "number" || !Number.isSafeInteger(n) || n < 0) {
      throw new InputError(`${sidecar}: length must be a whole number of samples (got ${shown(n)})`);
    }
    out.length = n;
  }
  const run = o.run as Record<string, unknown> | undefined;
  if (run !== undefined) {
    const ok = run !== null && typeof run === "object" && typeof run.id === "string" && Array.isArray(run.sites) && run.sites.every((x) => typeof x === "string");
    if (!ok) throw new InputError(`${sidecar}: run must be {"id": text, "sites": [names]} (got ${shown(run)})`);
    out.run = { id: run.id as string, sites: [...(run.sites as string[])] };
  }
  return out;
}

/** Checks caller-given rate/start against what a file states; disagreement is an InputError. */
export function checkAgainstFile(
  file: string,
  stated: { sampleRate: number; startTime: number },
  options: Pick<StrainOpenOptions, "rate" | "start">,
  where: string,
): void {
  if (options.rate !== undefined && !agrees(options.rate, stated.sampleRate, 1e-9)) {
    throw new InputError(`${file}: the given rate ${options.rate} Hz disagrees with ${where} (${stated.sampleRate} Hz)`);
  }
  if (options.start !== undefined) {
    const tol = 1e-6 / stated.sampleRate + 8 * Number.EPSILON * Math.abs(stated.startTime);
    if (Math.abs(options.start - stated.startTime) > tol) {
      throw new InputError(`${file}: the given start ${options.start} s disagrees with ${where} (${stated.startTime} s)`);
    }
  }
}

class RawStrainSource implements StrainReader {
  private handle: FileHandle | undefined;
  constructor(
    handle: FileHandle,
    readonly file: string,
    private readonly format: RawStrainFormat,
    readonly sampleRate: number,
    readonly startTime: number,
    readonly length: number,
    private readonly checkSamples: boolean,
    private readonly byteOrder: ByteOrder,
    readonly warnings: readonly string[],
    readonly label?: string,
    readonly units?: string,
    readonly run?: StrainRun,
  ) {
    this.handle = handle;
  }

  async read(offset: number, count: number): Promise<Float64Array> {
    checkReadRange(this.file, offset, count, this.length);
    const handle = this.handle;
    if (!handle) throw new Error(`${this.file}: read after close`);
    const size = SAMPLE_BYTES[this.format];
    const bytes = new Uint8Array(count * size);
    let got = 0;
    while (got < bytes.length) {
      const { bytesRead } = await handle.read(bytes, got, bytes.length - got, offset * size + got);
      if (bytesRead === 0) throw new InputError(`${this.file}: the file ended early (was it truncated while being read?)`);
      got += bytesRead;
    }
    const out = decodeSamples(bytes, this.format, count, this.byteOrder);
    if (this.checkSamples) checkFinite(this.file, out, offset, this.sampleRate, this.startTime);
    return out;
  }

  async close(): Promise<void> {
    const handle = this.handle;
    this.handle = undefined;
    if (handle) await handle.close();
  }
}

/** Decodes `count` samples of `format` in `byteOrder` from `bytes` (offset 0, 8-byte aligned buffer). */
function decodeSamples(bytes: Uint8Array, format: RawStrainFormat, count: number, byteOrder: ByteOrder): Float64Array {
  const native = (byteOrder === "little") === LITTLE_ENDIAN_HOST;
  const little = byteOrder === "little";
  if (format === "f64") {
    if (native) return new Float64Array(bytes.buffer, bytes.byteOffset, count);
    const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    const out = new Float64Array(count);
    for (let i = 0; i < count; i++) out[i] = view.getFloat64(8 * i, little);
    return out;
  }
  const out = new Float64Array(count);
  if (native) {
    out.set(new Float32Array(bytes.buffer, bytes.byteOffset, count));
  } else {
    const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    for (let i = 0; i < count; i++) out[i] = view.getFloat32(4 * i, little);
  }
  return out;
}

/** Encodes samples as float32/float64 bytes in `byteOrder`. */
function encodeSamples(path: string, data: ArrayLike<number>, format: RawStrainFormat, byteOrder: ByteOrder): Uint8Array {
  const n = data.length;
  const native = (byteOrder === "little") === LITTLE_ENDIAN_HOST;
  const little = byteOrder === "little";
  if (format === "f64") {
    const arr = Float64Array.from(data);
    if (native) return new Uint8Array(arr.buffer);
    const bytes = new Uint8Array(8 * n);
    const view = new DataView(bytes.buffer);
    for (let i = 0; i < n; i++) view.setFloat64(8 * i, arr[i], little);
    return bytes;
  }
  const arr = Float32Array.from(data);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(arr[i]) && Number.isFinite(data[i])) {
      throw new InputError(`${path}: sample ${i} (${data[i]}) is out of float32 range; write a .f64 file instead`);
    }
  }
  if (native) return new Uint8Array(arr.buffer);
  const bytes = new Uint8Array(4 * n);
  const view = new DataView(bytes.buffer);
  for (let i = 0; i < n; i++) view.setFloat32(4 * i, arr[i], little);
  return bytes;
}

/** Opens a raw .f32/.f64 strain file and its sidecar for chunked reading. */
export async function openRawStrain(
  path: string,
  format: RawStrainFormat,
  options: StrainOpenOptions,
): Promise<StrainReader> {
  const st = await statInputFile(path);
  const sidecar = rawSidecarPath(path);
  let text: string;
  try {
    text = await readFile(sidecar, "utf8");
  } catch (err) {
    const code = (err as { code?: string }).code;
    if (code === "ENOENT") {
      throw new InputError(`${sidecar}: missing sidecar for ${path} (write {"sampleRate": <Hz>, "startTime": <s>} there)`);
    }
    throw inputFsError(sidecar, err);
  }
  const meta = parseRawSidecar(sidecar, text, format);
  const size = SAMPLE_BYTES[format];
  if (st.size === 0) throw new InputError(`${path}: empty file (no samples)`);
  if (st.size % size !== 0) {
    throw new InputError(`${path}: file size ${st.size} bytes is not a multiple of ${size} (${SAMPLE_TYPE[format]} samples)`);
  }
  const length = st.size / size;
  if (meta.length !== undefined && meta.length !== length) {
    throw new InputError(
      `${sidecar}: length ${meta.length} disagrees with the file size (${st.size} bytes = ${length} ${SAMPLE_TYPE[format]} samples)`,
    );
  }
  checkAgainstFile(path, meta, options, `the sidecar ${sidecar}`);
  let handle: FileHandle;
  try {
    handle = await open(path, "r");
  } catch (err) {
    throw inputFsError(path, err);
  }
  return new RawStrainSource(
    handle,
    path,
    format,
    meta.sampleRate,
    meta.startTime,
    length,
    options.nonFinite !== "allow",
    meta.byteOrder,
    meta.warnings,
    meta.label,
    meta.units,
    meta.run,
  );
}

/**
 * Writes raw samples in `byteOrder` (default little-endian) and then the sidecar (which states
 * the byte order; at `sidecarPath`, default `<path>.json`), each atomically (temporary file, then
 * rename), so a reader that finds the sidecar finds the whole data file. Assumes a checked series.
 */
export function writeRawStrain(
  path: string,
  series: StrainWriteInput,
  format: RawStrainFormat,
  byteOrder: ByteOrder = "little",
  sidecarPath = rawSidecarPath(path),
): void {
  const bytes = encodeSamples(path, series.data, format, byteOrder);
  const meta: Record<string, unknown> = {
    sampleRate: series.sampleRate,
    startTime: series.startTime,
    sampleType: SAMPLE_TYPE[format],
    byteOrder,
    length: series.data.length,
  };
  if (series.label !== undefined) meta.label = series.label;
  if (series.units !== undefined) meta.units = series.units;
  if (series.run !== undefined) meta.run = { id: series.run.id, sites: [...series.run.sites] };
  writeFileAtomic(path, bytes);
  writeFileAtomic(sidecarPath, `${JSON.stringify(meta, null, 2)}\n`);
}

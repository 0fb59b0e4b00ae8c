// Checks shared by the strain readers and writers (internal: not re-exported by io/index.ts).
import { stat } from "node:fs/promises";
import type { Stats } from "node:fs";
import { dirname } from "node:path";
import { InputError, parameterError } from "../errors.js";
import { MAX_SAMPLE_RATE_HZ, checkFileTimeBase } from "./timeBase.js";

/** A value shown in a one-line message: JSON where possible, shortened. */
export function shown(value: unknown): string {
  let s: string;
  if (typeof value === "number") s = String(value);
  else if (typeof value === "bigint") s = `${value}`;
  else if (value === undefined) s = "nothing";
  else {
    try {
      s = JSON.stringify(value) ?? String(value);
    } catch {
      s = String(value);
    }
  }
  s = s.replace(/[\r\n\t]+/g, " ");
  return s.length > 60 ? `${s.slice(0, 57)}...` : s;
}

/** Node's system error code, if `err` is one. */
function codeOf(err: unknown): string | undefined {
  return typeof err === "object" && err !== null && "code" in err ? String((err as { code: unknown }).code) : undefined;
}

/**
 * Stats a file the user named for reading. Missing → InputError `<path>: no such file`;
 * a directory, permission problem or empty file → InputError naming the path.
 */
export async function statInputFile(path: string, what = "file"): Promise<Stats> {
  let st: Stats;
  try {
    st = await stat(path);
  } catch (err) {
    const code = codeOf(err);
    if (code === "ENOENT" || code === "ENOTDIR") throw new InputError(`${path}: no such ${what}`);
    if (code === "EACCES" || code === "EPERM") throw new InputError(`${path}: permission denied`);
    throw err;
  }
  if (st.isDirectory()) throw new InputError(`${path}: is a directory, not a ${what}`);
  if (!st.isFile()) throw new InputError(`${path}: not a regular file`);
  return st;
}

/** Maps an fs error met while opening/reading a named input to an InputError where it is one. */
export function inputFsError(path: string, err: unknown): unknown {
  const code = codeOf(err);
  if (code === "ENOENT" || code === "ENOTDIR") return new InputError(`${path}: no such file`);
  if (code === "EACCES" || code === "EPERM") return new InputError(`${path}: permission denied`);
  if (code === "EISDIR") return new InputError(`${path}: is a directory, not a file`);
  return err;
}

/** The directory an output file goes to must exist (else InputError naming it). */
export async function checkOutputDirectory(path: string): Promise<void> {
  const dir = dirname(path);
  let st: Stats;
  try {
    st = await stat(dir);
  } catch {
    throw new InputError(`${path}: the directory ${JSON.stringify(dir)} does not exist`);
  }
  if (!st.isDirectory()) throw new InputError(`${path}: ${JSON.stringify(dir)} is not a directory`);
  const existing = await stat(path).catch(() => undefined);
  if (existing?.isDirectory()) throw new InputError(`${path}: is a directory; name a file to write`);
}

/** Throws a RangeError unless [offset, offset + count) lies within [0, length]. */
export function checkReadRange(file: string, offset: number, count: number, length: number): void {
  if (!Number.isSafeInteger(offset) || !Number.isSafeInteger(count) || offset < 0 || count < 0 || offset + count > length) {
    throw new RangeError(`${file}: cannot read ${count} samples at offset ${offset} (the file has ${length})`);
  }
}

/** Describes a non-finite number for a message. */
function nonFiniteName(x: number): string {
  return Number.isNaN(x) ? "NaN" : x > 0 ? "+Infinity" : "-Infinity";
}

/**
 * Throws an InputError at the first non-finite value of `chunk`, whose element 0 is sample
 * `offset` of a series starting at `startTime` with `sampleRate` Hz. `where(i)` may add the
 * place in the file (e.g. a line number) for absolute sample i.
 */
export function checkFinite(
  file: string,
  chunk: ArrayLike<number>,
  offset: number,
  sampleRate: number,
  startTime: number,
  where?: (sample: number) => string,
): void {
  const n = chunk.length;
  for (let i = 0; i < n; i++) {
    const x = chunk[i];
    if (x - x !== 0) {
      const k = offset + i;
      const t = startTime + k / sampleRate;
      const place = where ? `${where(k)}: ` : "";
      throw new InputError(
        `${file}: ${place}sample ${k} (t = ${t} s) is ${nonFiniteName(x)}; non-finite samples are rejected`,
      );
    }
  }
}

/** Validates the sampleRate/startTime/label/units of a series the caller wants written. */
export function checkSeriesToWrite(
  path: string,
  series: { data: ArrayLike<number>; sampleRate: number; startTime: number; label?: string; units?: string },
  nonFinite: "error" | "allow",
): void {
  if (series === null || typeof series !== "object") throw new InputError(`${path}: nothing to write (no series given)`);
  const { data, sampleRate, startTime, label, units } = series;
  if (typeof sampleRate !== "number" || !Number.isFinite(sampleRate) || sampleRate <= 0) {
    throw new InputError(`${path}: sampleRate must be a positive number (got ${shown(sampleRate)})`);
  }
  if (typeof startTime !== "number" || !Number.isFinite(startTime)) {
    throw new InputError(`${path}: startTime must be a finite number of seconds (got ${shown(startTime)})`);
  }
  if (data === null || typeof data !== "object" || typeof data.length !== "number") {
    throw new InputError(`${path}: data must be an array of numbers`);
  }
  if (data.length === 0) throw new InputError(`${path}: no samples to write`);
  checkFileTimeBase(path, sampleRate, startTime, data.length);
  for (const [name, value] of [["label", label], ["units", units]] as const) {
    if (value !== undefined && (typeof value !== "string" || /[\r\n]/.test(value))) {
      throw new InputError(`${path}: ${name} must be a one-line string (got ${shown(value)})`);
    }
  }
  if (nonFinite === "error") {
    for (let i = 0; i < data.length; i++) {
      const x = data[i];
      if (typeof x !== "number" || x - x !== 0) {
        throw new InputError(
          `${path}: sample ${i} is ${typeof x === "number" ? nonFiniteName(x) : shown(x)}; refusing to write non-finite samples`,
        );
      }
    }
  }
}

/** Checks a caller-supplied rate/start option (InputError naming the flag). */
export function checkRateStartOptions(rate: number | undefined, start: number | undefined): void {
  if (rate !== undefined && (typeof rate !== "number" || !Number.isFinite(rate) || rate <= 0)) {
    throw parameterError("rate", `must be a positive number of Hz (got ${shown(rate)})`);
  }
  if (rate !== undefined && rate > MAX_SAMPLE_RATE_HZ) {
    throw parameterError("rate", `${rate} Hz is above the highest sample rate chirpsieve handles, ${MAX_SAMPLE_RATE_HZ} Hz; resample the data first`);
  }
  if (start !== undefined && (typeof start !== "number" || !Number.isFinite(start))) {
    throw parameterError("start", `must be a finite number of seconds (got ${shown(start)})`);
  }
}

/** True when a and b agree to a relative tolerance `rel` (of the larger magnitude). */
export function agrees(a: number, b: number, rel: number): boolean {
  return Math.abs(a - b) <= rel * Math.max(Math.abs(a), Math.abs(b));
}

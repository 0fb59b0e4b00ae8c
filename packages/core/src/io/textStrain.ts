// Text strain files: one column (strain) or two (time, strain) (internal: use strainFile.ts).
import { readFile } from "node:fs/promises";
import { extname } from "node:path";
import { InputError } from "../errors.js";
import { writeFileAtomic } from "./atomicWrite.js";
import { checkFinite, inputFsError, statInputFile } from "./strainChecks.js";
import { strainSourceFromSeries } from "./memoryStrain.js";
import type { StrainOpenOptions, StrainSeries, StrainSource, StrainWriteInput } from "./strainTypes.js";

/** Relative tolerance of a time step, as a fraction of the step (common practice, no source). */
const STEP_TOLERANCE = 1e-6;
/** Largest share of a step that the written precision of the time column may excuse. */
const PRECISION_SHARE = 0.01;
/** A sample rate within this relative distance of a whole number of Hz, and within what the
 * time column can resolve, is taken to be that whole number. */
const RATE_SNAP_CAP = 1e-4;

const DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
const SPECIAL = /^([+-]?)(nan|inf|infinity)$/i;
const META = /^#\s*(label|units)\s*:\s*(.*?)\s*$/i;
/** A column name in a header line: starts with a letter or underscore, optionally quoted. */
const COLUMN_NAME = /^(["']?)[A-Za-z_][\w.()[\]/*^-]*\1$/;

/** Parses one field; undefined when it is not a number. */
function parseField(s: string): number | undefined {
  if (DECIMAL.test(s)) return Number(s);
  const m = SPECIAL.exec(s);
  if (m) return m[2].toLowerCase() === "nan" ? Number.NaN : m[1] === "-" ? -Infinity : Infinity;
  return undefined;
}

/** Half a unit in the last written place of a decimal field: its rounding error as written. */
function writtenQuantum(s: string): number {
  const e = s.search(/[eE]/);
  const mantissa = e < 0 ? s : s.slice(0, e);
  const exponent = e < 0 ? 0 : Number(s.slice(e + 1));
  const dot = mantissa.indexOf(".");
  const decimals = dot < 0 ? 0 : mantissa.length - dot - 1;
  return 0.5 * 10 ** (exponent - decimals);
}

/** Splits a data line into fields: on commas when it has any, else on whitespace. */
function splitFields(line: string): string[] {
  return line.includes(",") ? line.split(",").map((f) => f.trim()) : line.split(/\s+/);
}

/**
 * Parses a text strain file already read into `text`. Layout: one column (strain; needs
 * `options.rate`, start from `options.start` or 0) or two columns (time in s, strain), separated
 * by commas, spaces or tabs; `#` starts a comment; blank lines are skipped; `# label: …` and
 * `# units: …` comments set the label and units. One header line of column names (e.g.
 * `time,strain`; each name starts with a letter or underscore) may come before the first number;
 * it must name as many columns as the data has. Two-column times must be evenly spaced: with
 * dt = (t_last − t_0)/(n − 1), every t_i must lie within 1e-6·dt of t_0 + i·dt (no drift can
 * accumulate), widened only by the rounding of the written times (4 × half a unit in the finest
 * written decimal place, capped at 4% of dt) and by float64 spacing at |t| (8 ulp). A step that
 * differs from the median step by twice that is reported first, at its own line. A rate within
 * what the times resolve (and 1e-4 relative) of a whole number of Hz is taken to be that number.
 * Every problem is an InputError naming `file` and, where it applies, the line.
 */
export function parseStrainText(text: string, file: string, options: StrainOpenOptions = {}): StrainSeries {
  const lines = text.split(/\r\n|\n|\r/);
  if (lines.length > 0 && lines[0].charCodeAt(0) === 0xfeff) lines[0] = lines[0].slice(1);
  let columns = 0;
  let firstDataLine = 0;
  let header: { line: number; names: number } | undefined;
  let label: string | undefined;
  let units: string | undefined;
  const times: number[] = [];
  const values: number[] = [];
  const lineOf: number[] = [];
  let quantum = Infinity;
  for (let li = 0; li < lines.length; li++) {
    const raw = lines[li];
    const hash = raw.indexOf("#");
    if (hash >= 0) {
      const meta = META.exec(raw.slice(hash).trim());
      if (meta && columns === 0 && raw.slice(0, hash).trim() === "") {
        if (meta[1].toLowerCase() === "label") label = meta[2];
        else units = meta[2];
      }
    }
    const line = (hash >= 0 ? raw.slice(0, hash) : raw).trim();
    if (line === "") continue;
    const lineNo = li + 1;
    const fields = splitFields(line);
    if (columns === 0 && header === undefined && fields.every((f) => parseField(f) === undefined && COLUMN_NAME.test(f))) {
      if (fields.length > 2) {
        throw new InputError(`${file}: line ${lineNo}: header names ${fields.length} columns; expected 1 (strain) or 2 (time, strain)`);
      }
      header = { line: lineNo, names: fields.length };
      continue;
    }
    if (columns === 0) {
      if (header !== undefined && fields.length !== header.names) {
        throw new InputError(
          `${file}: line ${lineNo}: ${fields.length} column${fields.length === 1 ? "" : "s"} of data, but the header on line ${header.line} names ${header.names}`,
        );
      }
      if (fields.length > 2) {
        throw new InputError(`${file}: line ${lineNo}: expected 1 column (strain) or 2 columns (time, strain), got ${fields.length}`);
      }
      columns = fields.length;
      firstDataLine = lineNo;
    } else if (fields.length !== columns) {
      throw new InputError(
        `${file}: line ${lineNo}: expected ${columns === 1 ? "1 column" : "2 columns"} like line ${firstDataLine}, got ${fields.length}`,
      );
    }
    for (let c = 0; c < fields.length; c++) {
      const x = parseField(fields[c]);
      if (x === undefined) {
        const hint = values.length === 0 ? " (start header lines with #)" : "";
        throw new InputError(`${file}: line ${lineNo}: malformed number ${JSON.stringify(fields[c].slice(0, 40))}${hint}`);
      }
      if (c === 0 && columns === 2) {
        if (!Number.isFinite(x)) throw new InputError(`${file}: line ${lineNo}: time ${fields[c]} is not a finite number`);
        times.push(x);
        const q = writtenQuantum(fields[c]);
        if (q < quantum) quantum = q;
      } else {
        values.push(x);
      }
    }
    lineOf.push(lineNo);
  }
  const n = values.length;
  if (n === 0) throw new InputError(`${file}: no samples (only comments or blank lines)`);

  let sampleRate: number;
  let startTime: number;
  if (columns === 1) {
    if (options.rate === undefined) {
      throw new InputError(`${file}: a one-column text file has no times; pass --rate <Hz> (and --start <s>, default 0)`);
    }
    sampleRate = options.rate;
    startTime = options.start ?? 0;
  } else {
    ({ sampleRate, startTime } = timeAxis(file, times, lineOf, quantum, options));
  }
  const data = Float64Array.from(values);
  if (options.nonFinite !== "allow") {
    checkFinite(file, data, 0, sampleRate, startTime, (k) => `line ${lineOf[k]}`);
  }
  const series: StrainSeries = { data, sampleRate, startTime, file };
  if (label !== undefined && label !== "") series.label = label;
  if (units !== undefined && units !== "") series.units = units;
  return series;
}

/** Derives (sampleRate, startTime) from an even time column; see {@link parseStrainText}. */
function timeAxis(
  file: string,
  t: number[],
  lineOf: number[],
  quantum: number,
  options: StrainOpenOptions,
): { sampleRate: number; startTime: number } {
  const n = t.length;
  const t0 = t[0];
  if (n === 1) {
    if (options.rate === undefined) {
      throw new InputError(`${file}: one sample cannot show the sample rate; pass --rate <Hz>`);
    }
    if (options.start !== undefined && options.start !== t0) {
      throw new InputError(`${file}: the given start ${options.start} s disagrees with the time column (${t0} s)`);
    }
    return { sampleRate: options.rate, startTime: t0 };
  }
  for (let i = 1; i < n; i++) {
    if (!(t[i] > t[i - 1])) {
      throw new InputError(`${file}: line ${lineOf[i]}: time ${t[i]} does not increase (previous ${t[i - 1]})`);
    }
  }
  let maxAbs = 0;
  for (let i = 0; i < n; i++) maxAbs = Math.max(maxAbs, Math.abs(t[i]));
  const ulps = 8 * Number.EPSILON * maxAbs;
  // Local check first, so a gap or a jump is reported at its own line: every step against the
  // median step, which one bad step cannot move.
  const steps = new Float64Array(n - 1);
  for (let i = 1; i < n; i++) steps[i - 1] = t[i] - t[i - 1];
  const median = Float64Array.from(steps).sort()[(n - 1) >> 1];
  const tolOf = (dt: number) => STEP_TOLERANCE * dt + 4 * Math.min(quantum, PRECISION_SHARE * dt) + ulps;
  const localTol = 2 * tolOf(median);
  for (let i = 1; i < n; i++) {
    if (Math.abs(steps[i - 1] - median) > localTol) {
      throw new InputError(
        `${file}: line ${lineOf[i]}: uneven time step ${steps[i - 1]} s (the usual step is ${median} s)`,
      );
    }
  }
  // Global check: t_i against t_0 + i·dt with dt from the end points, so no drift accumulates.
  const dt = (t[n - 1] - t0) / (n - 1);
  const tol = tolOf(dt);
  for (let i = 1; i < n - 1; i++) {
    const dev = t[i] - (t0 + i * dt);
    if (Math.abs(dev) > tol) {
      throw new InputError(
        `${file}: line ${lineOf[i]}: time ${t[i]} is off the even grid by ${dev} s (step ${dt} s); the time steps drift`,
      );
    }
  }
  let sampleRate = 1 / dt;
  const span = t[n - 1] - t0;
  const resolvable = Math.min(RATE_SNAP_CAP, (2 * tol) / span) * sampleRate;
  const whole = Math.round(sampleRate);
  if (whole > 0 && Math.abs(sampleRate - whole) <= resolvable) sampleRate = whole;
  if (options.rate !== undefined && Math.abs(options.rate - sampleRate) > Math.max(resolvable, 1e-9 * sampleRate)) {
    throw new InputError(`${file}: the given rate ${options.rate} Hz disagrees with the time column (${sampleRate} Hz)`);
  }
  if (options.start !== undefined && Math.abs(options.start - t0) > tol) {
    throw new InputError(`${file}: the given start ${options.start} s disagrees with the time column (${t0} s)`);
  }
  return { sampleRate, startTime: t0 };
}

/** Reads a whole text strain file (text files are small by nature) and serves it in chunks. */
export async function openTextStrain(path: string, options: StrainOpenOptions): Promise<StrainSource> {
  const st = await statInputFile(path);
  if (st.size === 0) throw new InputError(`${path}: empty file (no samples)`);
  let text: string;
  try {
    text = await readFile(path, "utf8");
  } catch (err) {
    throw inputFsError(path, err);
  }
  return strainSourceFromSeries(parseStrainText(text, path, options));
}

/**
 * Formats a series as two-column text: `# label: …` / `# units: …` comments, then one
 * "time strain" line per sample (comma-separated for .csv). Numbers are written in the shortest
 * form that reads back to the same float64, so a round trip is exact. Times are
 * startTime + i/sampleRate.
 */
export function formatStrainText(series: StrainWriteInput, separator = " "): string {
  const { data, sampleRate, startTime } = series;
  const parts: string[] = [`# chirpsieve strain series: time (s)${separator === "," ? "," : ""} strain`];
  if (series.label !== undefined) parts.push(`# label: ${series.label}`);
  if (series.units !== undefined) parts.push(`# units: ${series.units}`);
  parts.push(`# sampleRate ${sampleRate} Hz, ${data.length} samples`);
  const n = data.length;
  for (let i = 0; i < n; i++) parts.push(`${startTime + i / sampleRate}${separator}${data[i]}`);
  parts.push("");
  return parts.join("\n");
}

/** Writes a text strain file atomically. Assumes a checked series. */
export function writeTextStrain(path: string, series: StrainWriteInput): void {
  const separator = extname(path).toLowerCase() === ".csv" ? "," : " ";
  writeFileAtomic(path, formatStrainText(series, separator));
}

// Text strain files: one column (strain) or two (time, strain) (internal: use strainFile.ts).
import { createReadStream } from "node:fs";
import { StringDecoder } from "node:string_decoder";
import { extname } from "node:path";
import { InputError, parameterError } from "../errors.js";
import { writeFileAtomic } from "./atomicWrite.js";
import { checkFinite, checkReadRange, inputFsError, statInputFile } from "./strainChecks.js";
import { Float64Spill } from "./float64Spill.js";
import type { StrainOpenOptions, StrainSeries, StrainReader, StrainWriteInput } from "./strainTypes.js";

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

/** A column name in a header line: a word (optionally quoted), e.g. time, strain, "h(t)", t_gps. */
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

/** Longest line a text strain file may have (characters): bounds the memory of a file with no line breaks. */
const MAX_LINE = 1 << 20;
/** Steps sampled (evenly spread) for the median step of a long file; all of them up to this many. */
const MEDIAN_SAMPLE = 1 << 16;

/** What parsing the lines of a text strain file gives: columns on disk beyond one block (float64Spill.ts). */
interface ParsedColumns {
  columns: number;
  label?: string;
  units?: string;
  values: Float64Spill;
  times: Float64Spill;
  lineOf: Float64Spill;
  quantum: number;
  maxAbsTime: number;
  /** First non-finite value (sample index), or −1. */
  firstNonFinite: number;
}

/**
 * Parses lines one at a time (see {@link parseStrainText} for the layout), keeping the columns in
 * bounded memory. Errors are InputErrors naming the file and line.
 */
class TextColumnParser {
  private lineNo = 0;
  private firstDataLine = 0;
  /** A header line of column names before the data (its line and how many names). */
  private header: { line: number; names: number } | undefined;
  readonly out: ParsedColumns = {
    columns: 0,
    values: new Float64Spill(),
    times: new Float64Spill(),
    lineOf: new Float64Spill(),
    quantum: Infinity,
    maxAbsTime: 0,
    firstNonFinite: -1,
  };

  constructor(private readonly file: string) {}

  line(raw0: string): void {
    const lineNo = ++this.lineNo;
    const out = this.out;
    const raw = lineNo === 1 && raw0.charCodeAt(0) === 0xfeff ? raw0.slice(1) : raw0;
    const hash = raw.indexOf("#");
    if (hash >= 0) {
      const meta = META.exec(raw.slice(hash).trim());
      if (meta && out.columns === 0 && raw.slice(0, hash).trim() === "") {
        if (meta[1].toLowerCase() === "label") out.label = meta[2];
        else out.units = meta[2];
      }
    }
    const line = (hash >= 0 ? raw.slice(0, hash) : raw).trim();
    if (line === "") return;
    const file = this.file;
    const fields = splitFields(line);
    if (out.columns === 0 && this.header === undefined && fields.every((f) => parseField(f) === undefined && COLUMN_NAME.test(f))) {
      if (fields.length > 2) {
        throw new InputError(`${file}: line ${lineNo}: header names ${fields.length} columns; expected 1 (strain) or 2 (time, strain)`);
      }
      this.header = { line: lineNo, names: fields.length };
      return;
    }
    if (out.columns === 0) {
      if (this.header !== undefined && fields.length !== this.header.names) {
        throw new InputError(
          `${file}: line ${lineNo}: ${fields.length} column${fields.length === 1 ? "" : "s"} of data, but the header on line ${this.header.line} names ${this.header.names}`,
        );
      }
      if (fields.length > 2) {
        throw new InputError(`${file}: line ${lineNo}: expected 1 column (strain) or 2 columns (time, strain), got ${fields.length}`);
      }
      out.columns = fields.length;
      this.firstDataLine = lineNo;
    } else if (fields.length !== out.columns) {
      throw new InputError(
        `${file}: line ${lineNo}: expected ${out.columns === 1 ? "1 column" : "2 columns"} like line ${this.firstDataLine}, got ${fields.length}`,
      );
    }
    for (let c = 0; c < fields.length; c++) {
      const x = parseField(fields[c]);
      if (x === undefined) {
        const hint = out.values.length === 0 ? " (start header lines with #)" : "";
        throw new InputError(`${file}: line ${lineNo}: malformed number ${JSON.stringify(fields[c].slice(0, 40))}${hint}`);
      }
      if (c === 0 && out.columns === 2) {
        if (!Number.isFinite(x)) throw new InputError(`${file}: line ${lineNo}: time ${fields[c]} is not a finite number`);
        out.times.push(x);
        const q = writtenQuantum(fields[c]);
        if (q < out.quantum) out.quantum = q;
        if (Math.abs(x) > out.maxAbsTime) out.maxAbsTime = Math.abs(x);
      } else {
        if (x - x !== 0 && out.firstNonFinite < 0) out.firstNonFinite = out.values.length;
        out.values.push(x);
      }
    }
    out.lineOf.push(lineNo);
  }

  /** Releases the columns' temporary files. */
  close(): void {
    this.out.values.close();
    this.out.times.close();
    this.out.lineOf.close();
  }
}

/** The time base and checks once every line is parsed; returns the series' sampleRate and startTime. */
function finishColumns(file: string, c: ParsedColumns, options: StrainOpenOptions): { sampleRate: number; startTime: number } {
  const n = c.values.length;
  if (n === 0) throw new InputError(`${file}: no samples (only comments or blank lines)`);
  let sampleRate: number;
  let startTime: number;
  if (c.columns === 1) {
    if (options.rate === undefined) {
      throw parameterError("rate", `${file}: a one-column text file has no times; give its sample rate (Hz; and its start time, default 0 s)`);
    }
    sampleRate = options.rate;
    startTime = options.start ?? 0;
  } else {
    ({ sampleRate, startTime } = timeAxis(file, c, options));
  }
  if (options.nonFinite !== "allow" && c.firstNonFinite >= 0) {
    const k = c.firstNonFinite;
    checkFinite(file, [c.values.at(k)], k, sampleRate, startTime, () => `line ${c.lineOf.at(k)}`);
  }
  return { sampleRate, startTime };
}

/**
 * Parses a text strain file already read into `text`. Layout: one column (strain; needs
 * `options.rate`, start from `options.start` or 0) or two columns (time in s, strain), separated
 * by commas, spaces or tabs; `#` starts a comment; blank lines are skipped; `# label: …` and
 * `# units: …` comments set the label and units. Two-column times must be evenly spaced: with
 * dt = (t_last − t_0)/(n − 1), every t_i must lie within 1e-6·dt of t_0 + i·dt (no drift can
 * accumulate), widened only by the rounding of the written times (4 × half a unit in the finest
 * written decimal place, capped at 4% of dt) and by float64 spacing at |t| (8 ulp). A step that
 * differs from the median step (of all steps, or of 65 536 spread evenly over a longer file) by
 * twice that is reported first, at its own line. A rate within what the times resolve (and 1e-4
 * relative) of a whole number of Hz is taken to be that number.
 * Every problem is an InputError naming `file` and, where it applies, the line.
 */
export function parseStrainText(text: string, file: string, options: StrainOpenOptions = {}): StrainSeries {
  const parser = new TextColumnParser(file);
  try {
    for (const line of text.split(/\r\n|\n|\r/)) parser.line(line);
    const c = parser.out;
    const { sampleRate, startTime } = finishColumns(file, c, options);
    const series: StrainSeries = { data: c.values.read(0, c.values.length), sampleRate, startTime, file };
    if (c.label !== undefined && c.label !== "") series.label = c.label;
    if (c.units !== undefined && c.units !== "") series.units = c.units;
    return series;
  } finally {
    parser.close();
  }
}

/** Calls `each` on the times [from, to) in blocks (t[i] is block[i − start]). */
function forEachTimeBlock(times: Float64Spill, from: number, to: number, each: (block: Float64Array, start: number) => void): void {
  const step = 1 << 16;
  for (let at = from; at < to; at += step) each(times.read(at, Math.min(step, to - at)), at);
}

/** Derives (sampleRate, startTime) from an even time column; see {@link parseStrainText}. */
function timeAxis(file: string, c: ParsedColumns, options: StrainOpenOptions): { sampleRate: number; startTime: number } {
  const t = c.times;
  const lineOf = (i: number): number => c.lineOf.at(i);
  const quantum = c.quantum;
  const n = t.length;
  const t0 = t.at(0);
  if (n === 1) {
    if (options.rate === undefined) {
      throw parameterError("rate", `${file}: one sample cannot show the sample rate; give it (Hz)`);
    }
    if (options.start !== undefined && options.start !== t0) {
      throw new InputError(`${file}: the given start ${options.start} s disagrees with the time column (${t0} s)`);
    }
    return { sampleRate: options.rate, startTime: t0 };
  }
  let prev = t0;
  forEachTimeBlock(t, 1, n, (block, start) => {
    for (let k = 0; k < block.length; k++) {
      if (!(block[k] > prev)) {
        throw new InputError(`${file}: line ${lineOf(start + k)}: time ${block[k]} does not increase (previous ${prev})`);
      }
      prev = block[k];
    }
  });
  const ulps = 8 * Number.EPSILON * c.maxAbsTime;
  // Local check first, so a gap or a jump is reported at its own line: every step against the
  // median step, which one bad step cannot move.
  const stepCount = n - 1;
  const picked = Math.min(stepCount, MEDIAN_SAMPLE);
  const steps = new Float64Array(picked);
  for (let k = 0; k < picked; k++) {
    const i = picked === stepCount ? k : Math.floor((k * (stepCount - 1)) / (picked - 1));
    steps[k] = t.at(i + 1) - t.at(i);
  }
  const median = steps.sort()[(picked === stepCount ? stepCount : picked) >> 1];
  const tolOf = (dt: number) => STEP_TOLERANCE * dt + 4 * Math.min(quantum, PRECISION_SHARE * dt) + ulps;
  const localTol = 2 * tolOf(median);
  prev = t0;
  forEachTimeBlock(t, 1, n, (block, start) => {
    for (let k = 0; k < block.length; k++) {
      const step = block[k] - prev;
      if (Math.abs(step - median) > localTol) {
        throw new InputError(`${file}: line ${lineOf(start + k)}: uneven time step ${step} s (the usual step is ${median} s)`);
      }
      prev = block[k];
    }
  });
  // Global check: t_i against t_0 + i·dt with dt from the end points, so no drift accumulates.
  const tLast = t.at(n - 1);
  const dt = (tLast - t0) / (n - 1);
  const tol = tolOf(dt);
  forEachTimeBlock(t, 1, n - 1, (block, start) => {
    for (let k = 0; k < block.length; k++) {
      const i = start + k;
      const dev = block[k] - (t0 + i * dt);
      if (Math.abs(dev) > tol) {
        throw new InputError(`${file}: line ${lineOf(i)}: time ${block[k]} is off the even grid by ${dev} s (step ${dt} s); the time steps drift`);
      }
    }
  });
  let sampleRate = 1 / dt;
  const span = tLast - t0;
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

/**
 * Opens a text strain file for chunked reading. The file is read once as a stream, line by line
 * (see {@link parseStrainText}); the samples go to an anonymous temporary file beyond the first
 * 2^16, so memory stays bounded whatever the file's length, as for raw files.
 */
export async function openTextStrain(path: string, options: StrainOpenOptions): Promise<StrainReader> {
  const st = await statInputFile(path);
  if (st.size === 0) throw new InputError(`${path}: empty file (no samples)`);
  const parser = new TextColumnParser(path);
  let ok = false;
  try {
    const decoder = new StringDecoder("utf8");
    let rest = "";
    const feed = (text: string, last: boolean): void => {
      let buffer = rest + text;
      // A "\r" at the end may be the first half of "\r\n": keep it until the next piece.
      const hold = !last && buffer.endsWith("\r");
      if (hold) buffer = buffer.slice(0, -1);
      const lines = buffer.split(/\r\n|\n|\r/);
      rest = last ? "" : (lines.pop() ?? "") + (hold ? "\r" : "");
      for (const line of lines) parser.line(line);
      if (rest.length > MAX_LINE) throw new InputError(`${path}: a line is longer than ${MAX_LINE} characters; not a strain text file`);
    };
    try {
      for await (const chunk of createReadStream(path, { highWaterMark: 1 << 16 })) feed(decoder.write(chunk as Buffer), false);
    } catch (err) {
      if (err instanceof InputError) throw err;
      throw inputFsError(path, err);
    }
    feed(decoder.end(), true);
    const c = parser.out;
    const { sampleRate, startTime } = finishColumns(path, c, options);
    c.times.close();
    c.lineOf.close();
    const values = c.values;
    const length = values.length;
    let closed = false;
    const source: StrainReader = {
      file: path,
      sampleRate,
      startTime,
      length,
      ...(c.label !== undefined && c.label !== "" ? { label: c.label } : {}),
      ...(c.units !== undefined && c.units !== "" ? { units: c.units } : {}),
      async read(offset: number, count: number): Promise<Float64Array> {
        checkReadRange(path, offset, count, length);
        if (closed) throw new Error(`${path}: read after close`);
        return values.read(offset, count);
      },
      async close(): Promise<void> {
        closed = true;
        values.close();
      },
    };
    ok = true;
    return source;
  } finally {
    if (!ok) parser.close();
  }
}

/**
 * Formats a series as two-column text, as bytes in pieces of at most 64 KiB: `# label: …` /
 * `# units: …` comments, then one "time strain" line per sample (comma-separated for .csv). Numbers
 * are written in the shortest form that reads back to the same float64, so a round trip is exact.
 * Times are startTime + i/sampleRate. One buffer is reused: each piece is valid until the next is
 * asked for (memory stays bounded, and few strings are made per sample).
 */
export function* strainTextBytes(series: StrainWriteInput, separator = " "): Generator<Uint8Array> {
  const { data, sampleRate, startTime } = series;
  const head: string[] = [`# chirpsieve strain series: time (s)${separator === "," ? "," : ""} strain`];
  if (series.label !== undefined) head.push(`# label: ${series.label}`);
  if (series.units !== undefined) head.push(`# units: ${series.units}`);
  head.push(`# sampleRate ${sampleRate} Hz, ${data.length} samples`);
  yield Buffer.from(head.join("\n") + "\n", "utf8");
  const buffer = Buffer.allocUnsafe(1 << 16);
  // A line is at most 2 × 24 characters of a shortest float64 plus the separator and newline.
  const room = buffer.length - 64;
  const sep = separator.charCodeAt(0);
  let at = 0;
  const n = data.length;
  for (let i = 0; i < n; i++) {
    at += buffer.write(String(startTime + i / sampleRate), at, "latin1");
    buffer[at++] = sep;
    at += buffer.write(String(data[i]), at, "latin1");
    buffer[at++] = 10;
    if (at > room) {
      yield buffer.subarray(0, at);
      at = 0;
    }
  }
  if (at > 0) yield buffer.subarray(0, at);
}

/** The whole text of {@link strainTextBytes} as one string (for small series). */
export function formatStrainText(series: StrainWriteInput, separator = " "): string {
  const parts: string[] = [];
  for (const piece of strainTextBytes(series, separator)) parts.push(Buffer.from(piece).toString("utf8"));
  return parts.join("");
}

/** Writes a text strain file atomically, piece by piece (memory bounded by one piece). Assumes a checked series. */
export function writeTextStrain(path: string, series: StrainWriteInput): void {
  const separator = extname(path).toLowerCase() === ".csv" ? "," : " ";
  writeFileAtomic(path, strainTextBytes(series, separator));
}

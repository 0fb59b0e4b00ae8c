import { existsSync, readFileSync, statSync } from "node:fs";
import { basename } from "node:path";
import { InputError } from "../errors.js";
import { psdModelByName, type PsdModel } from "./psdModel.js";

/**
 * Parses a two-column PSD table: frequency (Hz) and one-sided PSD (1/Hz) per row, separated by
 * whitespace and/or a comma; `#` starts a comment (whole line or after the values); blank lines are
 * skipped. Frequencies must be positive and strictly increasing, PSD values positive and finite,
 * and there must be at least two rows. Errors name `fileLabel` and the 1-based line number.
 *
 * The returned curve interpolates ln S linearly in ln f between rows (log–log interpolation; common
 * practice, no source) and is +Infinity outside [first, last] frequency, so a matched filter
 * weighting by 1/S ignores frequencies the table does not cover. fMinHz / fMaxHz are the first and
 * last table frequencies.
 */
export function parsePsdTable(text: string, fileLabel: string): PsdModel {
  const freqs: number[] = [];
  const values: number[] = [];
  const lines = text.split(/\r?\n/);
  for (let i = 0; i < lines.length; i++) {
    const where = `${fileLabel} line ${i + 1}`;
    const hash = lines[i].indexOf("#");
    const body = (hash >= 0 ? lines[i].slice(0, hash) : lines[i]).trim();
    if (body === "") continue;
    const fields = body.split(/[\s,]+/).filter((s) => s !== "");
    if (fields.length !== 2) {
      throw new InputError(`${where}: expected two columns (frequency in Hz, PSD in 1/Hz), got ${fields.length}: "${body}"`);
    }
    const f = Number(fields[0]);
    const s = Number(fields[1]);
    if (!Number.isFinite(f)) throw new InputError(`${where}: frequency is not a number ("${fields[0]}")`);
    if (!Number.isFinite(s)) throw new InputError(`${where}: PSD is not a finite number ("${fields[1]}")`);
    if (!(f > 0)) throw new InputError(`${where}: frequency must be positive (got ${fields[0]})`);
    if (!(s > 0)) throw new InputError(`${where}: PSD must be positive (got ${fields[1]})`);
    if (freqs.length > 0 && !(f > freqs[freqs.length - 1])) {
      throw new InputError(`${where}: frequencies must increase strictly (${fields[0]} after ${freqs[freqs.length - 1]})`);
    }
    freqs.push(f);
    values.push(s);
  }
  if (freqs.length < 2) throw new InputError(`${fileLabel}: a PSD table needs at least two rows (found ${freqs.length})`);

  const n = freqs.length;
  const lnF = Float64Array.from(freqs, Math.log);
  const lnS = Float64Array.from(values, Math.log);
  const fMin = freqs[0];
  const fMax = freqs[n - 1];
  return {
    name: basename(fileLabel),
    fMinHz: fMin,
    fMaxHz: fMax,
    source: `table ${fileLabel}`,
    evaluate(fHz: number): number {
      if (!(fHz >= fMin && fHz <= fMax)) return Infinity;
      const x = Math.log(fHz);
      // Binary search for the row interval [lo, lo + 1] holding x.
      let lo = 0;
      let hi = n - 1;
      while (hi - lo > 1) {
        const mid = (lo + hi) >> 1;
        if (lnF[mid] <= x) lo = mid;
        else hi = mid;
      }
      if (fHz === freqs[lo]) return values[lo]; // exact at the rows
      if (fHz === freqs[hi]) return values[hi];
      const t = (x - lnF[lo]) / (lnF[hi] - lnF[lo]);
      return Math.exp(lnS[lo] + t * (lnS[hi] - lnS[lo]));
    },
  };
}

/** Reads a PSD table file (see {@link parsePsdTable}). A missing file is an InputError naming it. */
export function readPsdTable(path: string): PsdModel {
  let text: string;
  try {
    text = readFileSync(path, "utf8");
  } catch (err) {
    const code = (err as { code?: string }).code;
    const why = code === "ENOENT" ? "no such file" : code === "EISDIR" ? "is a directory, expected a PSD table file" : (err as Error).message;
    throw new InputError(`${path}: cannot read PSD table (${why})`);
  }
  return parsePsdTable(text, path);
}

/**
 * Formats a PSD as a table {@link parsePsdTable} reads back: one `#` header line (plus optional
 * further comment lines), then "frequency,psd" rows with 17 significant digits. Rows with f ≤ 0 or
 * a PSD that is not positive and finite (e.g. the DC bin) are left out, since a log–log table
 * cannot hold them.
 */
export function formatPsdTable(frequencies: ArrayLike<number>, psd: ArrayLike<number>, comments: string[] = []): string {
  if (frequencies.length !== psd.length) {
    throw new InputError(`formatPsdTable: frequencies (${frequencies.length}) and psd (${psd.length}) differ in length`);
  }
  const out: string[] = ["# frequency_hz,psd_per_hz", ...comments.map((c) => `# ${c}`)];
  for (let i = 0; i < frequencies.length; i++) {
    const f = frequencies[i];
    const s = psd[i];
    if (f > 0 && s > 0 && Number.isFinite(s)) out.push(`${f},${s.toPrecision(17)}`);
  }
  return out.join("\n") + "\n";
}

/**
 * A noise curve from a command-line style spec: a known name ("dis2001", "ajith2011", "flat",
 * "flat:LEVEL") or the path of a two-column table file. A spec is taken as a path when a file of
 * that name exists or it looks like one (contains a path separator or ends in a file extension);
 * otherwise the unknown-name error lists the known curves.
 */
export function psdModelFromSpec(spec: string): PsdModel {
  if (typeof spec !== "string" || spec.trim() === "") throw new InputError(`noise curve must be a name or a table file (got "${spec}")`);
  const known = spec === "dis2001" || spec === "ajith2011" || spec === "flat" || spec.startsWith("flat:");
  if (known) return psdModelByName(spec);
  let isFile = false;
  try {
    isFile = existsSync(spec) && statSync(spec).isFile();
  } catch {
    isFile = false;
  }
  const pathLike = /[\\/]/.test(spec) || /\.[A-Za-z0-9]{1,5}$/.test(spec);
  if (isFile || pathLike) return readPsdTable(spec);
  return psdModelByName(spec);
}

import { InputError } from "../errors.js";
import type { PsdModel } from "./psdModel.js";

/**
 * A one-sided PSD sampled on a uniform grid: `psd[k]` (1/Hz) at frequency k·df, k = 0…length−1
 * (for a segment of N samples at rate fs, df = fs/N and length = N/2 + 1).
 */
export interface SampledPsd {
  readonly df: number;
  readonly psd: Float64Array;
}

/** Either an analytic/tabulated curve or a sampled estimate. */
export type PsdInput = PsdModel | SampledPsd;

/** True when `input` is a sampled PSD rather than a model with `evaluate`. */
export function isSampledPsd(input: PsdInput): input is SampledPsd {
  return (input as SampledPsd).psd instanceof Float64Array && typeof (input as PsdModel).evaluate !== "function";
}

function checkSampled(sampled: SampledPsd, what: string): void {
  if (!(sampled.df > 0) || !Number.isFinite(sampled.df)) {
    throw new InputError(`${what}: df must be a positive number of Hz (got ${sampled.df})`);
  }
  if (!(sampled.psd instanceof Float64Array) || sampled.psd.length < 2) {
    throw new InputError(`${what}: psd must be a Float64Array of at least 2 bins`);
  }
}

/**
 * Value of a uniformly sampled PSD at `fHz`, interpolating ln S linearly in f between the two
 * neighbouring bins (geometric interpolation, which follows steep power-law walls better than
 * linear; common practice, no source). If either neighbour is zero the interpolation is linear in
 * S; if either is +Infinity the result is +Infinity. Outside [0, (length−1)·df] it is +Infinity.
 */
function sampleAt(psd: Float64Array, df: number, fHz: number): number {
  const last = psd.length - 1;
  let x = fHz / df;
  // Allow for rounding in fHz = k·df at the last bin.
  if (!(x >= 0) || x > last + 1e-9) return Infinity;
  if (x > last) x = last;
  const i = Math.min(Math.floor(x), last - 1);
  const t = x - i;
  const a = psd[i];
  const b = psd[i + 1];
  if (t === 0) return a;
  if (t === 1) return b;
  if (a > 0 && b > 0 && a < Infinity && b < Infinity) return Math.exp((1 - t) * Math.log(a) + t * Math.log(b));
  if (a === Infinity || b === Infinity) return Infinity;
  return (1 - t) * a + t * b;
}

/**
 * A {@link PsdModel} view of a sampled PSD (see {@link sampleAt} for the interpolation).
 * fMinHz is the first non-zero bin (df), fMaxHz the last bin; evaluate() is +Infinity outside.
 */
export function sampledPsdModel(sampled: SampledPsd, name = "sampled"): PsdModel {
  checkSampled(sampled, name);
  const { psd, df } = sampled;
  return {
    name,
    fMinHz: df,
    fMaxHz: (psd.length - 1) * df,
    source: "sampled estimate",
    evaluate: (fHz: number) => sampleAt(psd, df, fHz),
  };
}

/** The input as a model: a model is returned as is, a sampled PSD through {@link sampledPsdModel}. */
export function asPsdModel(input: PsdInput): PsdModel {
  return isSampledPsd(input) ? sampledPsdModel(input) : input;
}

/**
 * Resamples a PSD onto the grid k·dfHz, k = 0…length−1, e.g. a Welch estimate made with one
 * segment length onto the frequency grid of a search segment of another length (ln S interpolated
 * linearly in f between bins of a sampled PSD; a model is simply evaluated). Frequencies outside a
 * sampled PSD's range get +Infinity, so a filter weighting by 1/S ignores them.
 */
export function interpolatePsd(psd: PsdInput, dfHz: number, length: number): Float64Array {
  if (!(dfHz > 0) || !Number.isFinite(dfHz)) throw new InputError(`interpolatePsd: dfHz must be a positive number (got ${dfHz})`);
  if (!Number.isInteger(length) || length < 1) throw new InputError(`interpolatePsd: length must be a positive integer (got ${length})`);
  const out = new Float64Array(length);
  if (isSampledPsd(psd)) {
    checkSampled(psd, "interpolatePsd");
    // sampleAt for every k, with ln S of each source bin taken once rather than twice per output
    // bin (a 2^22-sample segment has 2^21 bins; the results are the same to the bit).
    const src = psd.psd;
    const logs = new Float64Array(src.length);
    for (let i = 0; i < src.length; i++) logs[i] = src[i] > 0 && src[i] < Infinity ? Math.log(src[i]) : NaN;
    const last = src.length - 1;
    for (let k = 0; k < length; k++) {
      const fHz = k * dfHz;
      let x = fHz / psd.df;
      if (!(x >= 0) || x > last + 1e-9) {
        out[k] = Infinity;
        continue;
      }
      if (x > last) x = last;
      const i = Math.min(Math.floor(x), last - 1);
      const t = x - i;
      const a = src[i];
      const b = src[i + 1];
      if (t === 0) out[k] = a;
      else if (t === 1) out[k] = b;
      else if (a > 0 && b > 0 && a < Infinity && b < Infinity) out[k] = Math.exp((1 - t) * logs[i] + t * logs[i + 1]);
      else out[k] = a === Infinity || b === Infinity ? Infinity : (1 - t) * a + t * b;
    }
  } else {
    for (let k = 0; k < length; k++) out[k] = psd.evaluate(k * dfHz);
  }
  return out;
}

// Parsing of plain flag values (numbers, ranges, choices). Every error names the flag.
import { MAX_SAMPLE_RATE_HZ } from "@chirpsieve/core";
import { UsageError } from "./errors.js";

/** A finite number, optionally bounded: `--min-snr 6`. */
export function parseNumberFlag(
  flag: string,
  text: string,
  bounds: { min?: number; max?: number; minExclusive?: boolean; maxExclusive?: boolean; integer?: boolean } = {},
): number {
  const t = String(text).trim();
  const x = t === "" ? NaN : Number(t);
  if (!Number.isFinite(x)) throw new UsageError(`${flag}: expected a number (got "${text}")`);
  if (bounds.integer && !Number.isInteger(x)) throw new UsageError(`${flag}: expected a whole number (got "${text}")`);
  const { min, max } = bounds;
  if (min !== undefined && (bounds.minExclusive ? x <= min : x < min)) {
    throw new UsageError(`${flag}: must be ${bounds.minExclusive ? "greater than" : "at least"} ${min} (got ${text})`);
  }
  if (max !== undefined && (bounds.maxExclusive ? x >= max : x > max)) {
    throw new UsageError(`${flag}: must be ${bounds.maxExclusive ? "less than" : "at most"} ${max} (got ${text})`);
  }
  return x;
}

/** `MIN:MAX` with 0 < MIN ≤ MAX (or MIN < MAX when `strict`): `--mass-range 1:3`. */
export function parseRangeFlag(flag: string, text: string, options: { strict?: boolean; allowZero?: boolean } = {}): [number, number] {
  const parts = String(text).split(":");
  if (parts.length !== 2) throw new UsageError(`${flag}: expected MIN:MAX, e.g. 1:3 (got "${text}")`);
  const lo = Number(parts[0]);
  const hi = Number(parts[1]);
  if (!Number.isFinite(lo) || !Number.isFinite(hi) || parts[0].trim() === "" || parts[1].trim() === "") {
    throw new UsageError(`${flag}: expected two numbers MIN:MAX (got "${text}")`);
  }
  if (options.allowZero ? lo < 0 : lo <= 0) throw new UsageError(`${flag}: MIN must be ${options.allowZero ? "non-negative" : "positive"} (got "${text}")`);
  if (options.strict ? hi <= lo : hi < lo) throw new UsageError(`${flag}: MIN must be below MAX (got "${text}")`);
  return [lo, hi];
}

/** One of a fixed set of words: `--format csv`. */
export function parseChoiceFlag<T extends string>(flag: string, text: string, choices: readonly T[]): T {
  if (!(choices as readonly string[]).includes(text)) {
    throw new UsageError(`${flag}: expected one of ${choices.join(", ")} (got "${text}")`);
  }
  return text as T;
}

/** A sample rate in Hz: positive and at most core's MAX_SAMPLE_RATE_HZ, `--rate 4096`. */
export function parseRateFlag(flag: string, text: string): number {
  const rate = parseNumberFlag(flag, text, { min: 0, minExclusive: true });
  if (rate > MAX_SAMPLE_RATE_HZ) {
    throw new UsageError(`${flag}: ${text} Hz is above the highest sample rate chirpsieve handles, ${MAX_SAMPLE_RATE_HZ} Hz`);
  }
  return rate;
}

// Quantities with units on the command line: parsing ("50AU", "3e5km", "2.5d", "35Hz") into SI,
// and formatting SI values in human units for tables. Conversion factors only; no physics here.
import { AU, DAY, JULIAN_YEAR, LIGHT_YEAR, M_SUN, PARSEC } from "@chirpsieve/core";
import { UsageError } from "./errors.js";

/** The kinds of quantity a flag can take. Each has a unit table and a unit for bare numbers. */
export type Dimension = "length" | "time" | "frequency" | "frequencyDerivative" | "mass" | "angle";

interface DimensionSpec {
  /** Noun used in messages ("a length"). */
  noun: string;
  /** Unit symbol → factor to SI (kg for mass, rad for angle). */
  units: Record<string, number>;
  /** Units listed in messages, in this order. */
  listed: string[];
  /** Factor applied to a bare number, or null when a unit is required. */
  bare: number | null;
}

const SPECS: Record<Dimension, DimensionSpec> = {
  length: {
    noun: "a length",
    units: { m: 1, km: 1e3, AU: AU, au: AU, pc: PARSEC, kpc: 1e3 * PARSEC, Mpc: 1e6 * PARSEC, Gpc: 1e9 * PARSEC, ly: LIGHT_YEAR },
    listed: ["m", "km", "AU", "pc", "kpc", "Mpc", "Gpc", "ly"],
    bare: 1,
  },
  time: {
    noun: "a time",
    units: {
      s: 1,
      ms: 1e-3,
      min: 60,
      h: 3600,
      d: DAY,
      yr: JULIAN_YEAR,
      Myr: 1e6 * JULIAN_YEAR,
      Gyr: 1e9 * JULIAN_YEAR,
    },
    listed: ["s", "ms", "min", "h", "d", "yr", "Myr", "Gyr"],
    bare: 1,
  },
  frequency: {
    noun: "a frequency",
    units: { Hz: 1, mHz: 1e-3, kHz: 1e3, uHz: 1e-6, "µHz": 1e-6, nHz: 1e-9 },
    listed: ["Hz", "mHz", "kHz", "uHz", "nHz"],
    bare: 1,
  },
  frequencyDerivative: {
    noun: "a frequency derivative",
    units: { "Hz/s": 1 },
    listed: ["Hz/s"],
    bare: 1,
  },
  mass: {
    noun: "a mass",
    units: { Msun: M_SUN, M_sun: M_SUN, Msol: M_SUN, kg: 1 },
    listed: ["Msun", "kg"],
    bare: M_SUN,
  },
  angle: {
    noun: "an angle",
    units: { deg: Math.PI / 180, rad: 1 },
    listed: ["deg", "rad"],
    bare: null,
  },
};

/** Human list "m, km or AU". */
function orList(items: string[]): string {
  return items.length < 2 ? items.join("") : `${items.slice(0, -1).join(", ")} or ${items[items.length - 1]}`;
}

/** Number, optional blanks, optional unit (which must not start with a digit, sign or point). */
const QUANTITY = /^\s*([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*([^\s\d.+-]\S*)?\s*$/;

export interface ParseOptions {
  /** "positive" (default): > 0; "nonNegative": ≥ 0; "any": any finite value. */
  sign?: "positive" | "nonNegative" | "any";
}

/**
 * Parses a flag's value such as "50AU", "3e5 km", "2.5d", "35Hz" or a bare number into SI
 * (m, s, Hz, Hz/s, kg, rad). Bare numbers are SI, except masses (solar masses); angles need a unit.
 * Throws UsageError naming the flag, e.g.
 * `--separation: unknown unit "AUx" in "50AUx" (use m, km, AU, pc, kpc, Mpc, Gpc or ly)`.
 */
export function parseQuantity(flag: string, text: string, dimension: Dimension, options: ParseOptions = {}): number {
  const spec = SPECS[dimension];
  const use = `use ${orList(spec.listed)}`;
  const m = QUANTITY.exec(text);
  if (!m) {
    const example = dimension === "mass" ? "1.4" : `1${spec.listed[0]}`;
    throw new UsageError(`${flag}: expected a number with an optional unit, e.g. ${example} (got "${text}"; ${use})`);
  }
  const value = Number(m[1]);
  const unit = m[2];
  let factor: number;
  if (unit === undefined) {
    if (spec.bare === null) throw new UsageError(`${flag}: give a unit (${use}), e.g. 30${spec.listed[0]} (got "${text}")`);
    factor = spec.bare;
  } else if (Object.prototype.hasOwnProperty.call(spec.units, unit)) {
    factor = spec.units[unit];
  } else {
    const other = (Object.keys(SPECS) as Dimension[]).find(
      (d) => d !== dimension && Object.prototype.hasOwnProperty.call(SPECS[d].units, unit),
    );
    if (other) throw new UsageError(`${flag}: "${text}" is ${SPECS[other].noun}, expected ${spec.noun} (${use})`);
    throw new UsageError(`${flag}: unknown unit "${unit}" in "${text}" (${use})`);
  }
  const si = value * factor;
  if (!Number.isFinite(si)) throw new UsageError(`${flag}: value out of range (got "${text}")`);
  const sign = options.sign ?? "positive";
  if (sign === "positive" && !(si > 0)) throw new UsageError(`${flag}: must be positive (got "${text}")`);
  if (sign === "nonNegative" && !(si >= 0)) throw new UsageError(`${flag}: must not be negative (got "${text}")`);
  return si;
}

/** Parses a plain number (no unit) within [min, max) or [min, max]; UsageError naming the flag otherwise. */
export function parsePlainNumber(flag: string, text: string, range: { min: number; max: number; maxInclusive: boolean }): number {
  const m = QUANTITY.exec(text);
  const value = m && m[2] === undefined ? Number(m[1]) : NaN;
  const inside = value >= range.min && (range.maxInclusive ? value <= range.max : value < range.max);
  if (!Number.isFinite(value) || !inside) {
    const r = `[${range.min}, ${range.max}${range.maxInclusive ? "]" : ")"}`;
    throw new UsageError(`${flag}: must be a number in ${r} (got "${text}")`);
  }
  return value;
}

/** Parses "A,B" into two quantities of one dimension (SI), e.g. masses "1.4,1.4" or "10Msun,1.4Msun". */
export function parsePair(flag: string, text: string, dimension: Dimension, example: string): [number, number] {
  const parts = text.split(",");
  if (parts.length !== 2 || parts.some((p) => p.trim() === "")) {
    throw new UsageError(`${flag}: give two values separated by a comma, e.g. ${example} (got "${text}")`);
  }
  return [parseQuantity(flag, parts[0], dimension), parseQuantity(flag, parts[1], dimension)];
}

// ---------- formatting ----------

/**
 * A number with `digits` significant figures, without trailing zeros: 250 → "250", 0.25 → "0.25",
 * 7.48e12 → "7.48e12", 3.7788e-24 → "3.779e-24". Plain notation for 1e-3 ≤ |x| < 1e6.
 */
export function formatNumber(x: number, digits = 4): string {
  if (!Number.isFinite(x)) return String(x);
  if (x === 0) return "0";
  const ax = Math.abs(x);
  if (ax >= 1e-3 && ax < 1e6) {
    let s = x.toPrecision(digits);
    if (s.includes("e")) s = Number(s).toString(); // toPrecision may switch to exponent near 1e6
    return s.includes(".") ? s.replace(/0+$/, "").replace(/\.$/, "") : s;
  }
  const [mant, exp] = x.toExponential(digits - 1).split("e");
  const mm = mant.includes(".") ? mant.replace(/0+$/, "").replace(/\.$/, "") : mant;
  return `${mm}e${exp.replace(/^\+/, "")}`;
}

/**
 * A value in the unit of the last ladder step whose threshold ≤ |x| (the first step if none);
 * each step is [threshold, factor to SI, symbol].
 */
function withLadder(x: number, ladder: [number, number, string][], digits: number): string {
  let chosen = ladder[0];
  for (const step of ladder) if (Math.abs(x) >= step[0]) chosen = step;
  return `${formatNumber(x / chosen[1], digits)} ${chosen[2]}`;
}

/** A duration in s shown in µs, ms, s, min, h, d or (Julian) yr. */
export function formatDuration(seconds: number, digits = 4): string {
  return withLadder(
    seconds,
    [
      [0, 1e-6, "µs"],
      [1e-3, 1e-3, "ms"],
      [1, 1, "s"],
      [120, 60, "min"],
      [2 * 3600, 3600, "h"],
      [2 * DAY, DAY, "d"],
      [JULIAN_YEAR, JULIAN_YEAR, "yr"],
    ],
    digits,
  );
}

/** A length in m shown in m, km, AU (from 0.01 AU), pc (from 0.1 pc), kpc, Mpc or Gpc. */
export function formatLength(meters: number, digits = 4): string {
  return withLadder(
    meters,
    [
      [0, 1, "m"],
      [1e3, 1e3, "km"],
      [0.01 * AU, AU, "AU"],
      [0.1 * PARSEC, PARSEC, "pc"],
      [1e3 * PARSEC, 1e3 * PARSEC, "kpc"],
      [1e6 * PARSEC, 1e6 * PARSEC, "Mpc"],
      [1e9 * PARSEC, 1e9 * PARSEC, "Gpc"],
    ],
    digits,
  );
}

/** An SI value with its unit, e.g. formatSi(7.48e12, "m") → "7.48e12 m". */
export function formatSi(x: number, unit: string, digits = 4): string {
  return unit ? `${formatNumber(x, digits)} ${unit}` : formatNumber(x, digits);
}

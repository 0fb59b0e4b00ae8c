import { InputError } from "../errors.js";

/** A one-sided noise power spectral density S_n(f) in 1/Hz. */
export interface PsdModel {
  /** Our label for the curve, e.g. "ajith2011". */
  readonly name: string;
  /** The lowest frequency (Hz) at which the curve is meant to be used. */
  readonly fMinHz: number;
  /**
   * The highest frequency (Hz) the curve covers, when it has one (a table or a sampled estimate);
   * `evaluate` returns +Infinity above it. Absent for analytic fits, which extend to any frequency.
   */
  readonly fMaxHz?: number;
  /** Where the formula comes from. */
  readonly source: string;
  /** S_n(f) in 1/Hz for f > 0. */
  evaluate(fHz: number): number;
}

/**
 * First-generation interferometer fit:
 * S_n(f) = 9e-46 [ (4.49x)^−56 + 0.16 x^−4.52 + 0.52 + 0.32 x² ], x = f / 150 Hz, used above 40 Hz.
 * Damour, Iyer & Sathyaprakash, Phys. Rev. D 63, 044023 (2001).
 */
export const dis2001: PsdModel = {
  name: "dis2001",
  fMinHz: 40,
  source: "Damour, Iyer & Sathyaprakash, Phys. Rev. D 63, 044023 (2001)",
  evaluate(fHz: number): number {
    const x = fHz / 150;
    return 9e-46 * (Math.pow(4.49 * x, -56) + 0.16 * Math.pow(x, -4.52) + 0.52 + 0.32 * x * x);
  },
};

/**
 * Second-generation design fit:
 * S_n(f) = 1e-49 [ x^−4.14 − 5 x^−2 + 111 (1 − x² + x⁴/2) / (1 + x²/2) ], x = f / 215 Hz, used above 10 Hz.
 * Ajith, Phys. Rev. D 84, 084037 (2011).
 */
export const ajith2011: PsdModel = {
  name: "ajith2011",
  fMinHz: 10,
  source: "Ajith, Phys. Rev. D 84, 084037 (2011)",
  evaluate(fHz: number): number {
    const x = fHz / 215;
    const x2 = x * x;
    return 1e-49 * (Math.pow(x, -4.14) - 5 / x2 + (111 * (1 - x2 + 0.5 * x2 * x2)) / (1 + 0.5 * x2));
  },
};

/** White noise at a constant level (1/Hz); default 1e-46 /Hz. Common practice, no source. */
export function flatPsd(level = 1e-46): PsdModel {
  if (!(level > 0) || !Number.isFinite(level)) {
    throw new InputError(`flat noise level must be a positive number (got ${level})`);
  }
  return { name: level === 1e-46 ? "flat" : `flat:${level}`, fMinHz: 0, source: "white noise", evaluate: () => level };
}

/** Names accepted by {@link psdModelByName}. */
export const PSD_MODEL_NAMES = ["dis2001", "ajith2011", "flat"] as const;

/** The analytic curve with this name: "dis2001", "ajith2011", "flat" or "flat:LEVEL". */
export function psdModelByName(name: string): PsdModel {
  if (name === "dis2001") return dis2001;
  if (name === "ajith2011") return ajith2011;
  if (name === "flat") return flatPsd();
  if (name.startsWith("flat:")) {
    const level = Number(name.slice(5));
    if (!(level > 0) || !Number.isFinite(level)) {
      throw new InputError(`noise curve "${name}": the level after "flat:" must be a positive number`);
    }
    return flatPsd(level);
  }
  throw new InputError(`unknown noise curve "${name}" (known: ${PSD_MODEL_NAMES.join(", ")}, flat:LEVEL, or a two-column table file)`);
}

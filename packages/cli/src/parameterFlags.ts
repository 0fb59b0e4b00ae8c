// The one place where the library's parameter names meet the command line's flags.
import type { InputError } from "@chirpsieve/core";

/**
 * The flag a user sets for each core parameter an InputError can name (its `parameter` field).
 * Core errors speak the library's terms; the CLI names the flag from this table and nowhere else.
 */
const FLAG_OF_PARAMETER: Readonly<Record<string, string>> = {
  massRangeSolar: "--mass-range",
  matchFloor: "--match-floor",
  fMinHz: "--fmin",
  fMaxHz: "--fmax",
  templateCap: "--template-cap",
  draws: "--draws",
  slidesPerSide: "--slides",
  slideStepSeconds: "--slide-step",
  timingToleranceSeconds: "--timing-tolerance",
  loudestWithinSeconds: "--loudest-within",
  segmentSeconds: "--segment",
  injectionsPerBatch: "--per-batch",
  sampleRate: "--rate",
  rate: "--rate",
  start: "--start",
  startTime: "--start",
  threads: "--threads",
  dataset: "--dataset",
  "psd.segmentSeconds": "--welch-segment",
};

/** The flag for a core parameter, or undefined when the CLI has none. */
export function flagOfParameter(parameter: string): string | undefined {
  return Object.prototype.hasOwnProperty.call(FLAG_OF_PARAMETER, parameter) ? FLAG_OF_PARAMETER[parameter] : undefined;
}

/** The one-line message for an InputError: `--flag: detail` when it names a parameter with a flag. */
export function describeInputError(err: InputError): string {
  const flag = err.parameter === undefined ? undefined : flagOfParameter(err.parameter);
  return flag !== undefined && err.detail !== undefined ? `${flag}: ${err.detail}` : err.message;
}

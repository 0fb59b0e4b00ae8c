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
  snrThreshold: "--min-snr",
  chi2Bands: "--chi2-bands",
  chi2Allowance: "--chi2-allowance",
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

/**
 * For parameters the CLI sets by a switch rather than a valued flag: what to tell the user after
 * core's message (which already names the file and what was wrong).
 */
const HINT_OF_PARAMETER: Readonly<Record<string, string>> = {
  badData: "pass --skip-bad-data to leave such stretches out and use the rest",
};

/** The flag for a core parameter, or undefined when the CLI has none. */
export function flagOfParameter(parameter: string): string | undefined {
  return Object.prototype.hasOwnProperty.call(FLAG_OF_PARAMETER, parameter) ? FLAG_OF_PARAMETER[parameter] : undefined;
}

/** The one-line message for an InputError: `--flag: detail` when it names a parameter with a flag; the message and what to do when it names a switch. */
export function describeInputError(err: InputError): string {
  const flag = err.parameter === undefined ? undefined : flagOfParameter(err.parameter);
  if (flag !== undefined && err.detail !== undefined) return `${flag}: ${err.detail}`;
  const hint = err.parameter === undefined || !Object.prototype.hasOwnProperty.call(HINT_OF_PARAMETER, err.parameter) ? undefined : HINT_OF_PARAMETER[err.parameter];
  return hint === undefined ? err.message : `${err.message}; ${hint}`;
}

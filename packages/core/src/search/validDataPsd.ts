import { parameterError, InputError } from "../errors.js";
import { MIN_WELCH_SEGMENT_SAMPLES, welchPsd, type WelchAverage, type WelchPsd } from "../noise/welch.js";
import { arrayInput } from "./arrayInput.js";
import { badDataError, describeBadStretch, screenInput } from "./dataQuality.js";
import { nextPowerOfTwo } from "./segmentPlan.js";
import { validIntervals, type ExcludedRange } from "./streamPlan.js";

/** What {@link validDataPsd} estimates from, and how. */
export interface ValidDataPsdOptions {
  /** Welch segment length (s), rounded up to a power of two samples. */
  readonly segmentSeconds: number;
  readonly average: WelchAverage;
  /** Bad stretches (dataQuality.ts): "reject" (default) is an InputError naming the first; "exclude" leaves them out. */
  readonly badData?: "reject" | "exclude";
}

/** A PSD estimated from the valid data of one series, and what was left out. */
export interface ValidDataPsd {
  readonly estimate: WelchPsd;
  /** Samples per Welch segment (a power of two). */
  readonly segmentLength: number;
  /** The bad stretches left out (sample ranges of the series, with their reasons), in order. */
  readonly excluded: readonly ExcludedRange[];
  /** Samples left out (the union of `excluded`). */
  readonly excludedSamples: number;
}

/**
 * The Welch PSD of a series in memory from its valid data only: the series is screened as a search
 * screens its input (screenInput: non-finite samples, runs of ≥ 32 identical samples, corrupt
 * samples); bad stretches are rejected with the search's one-line error, or left out, in which case
 * Welch segments are laid only inside the stretches between them (welchPsd's `intervals`).
 */
export async function validDataPsd(
  series: { readonly file: string; readonly sampleRate: number; readonly startTime: number; readonly data: Float64Array },
  options: ValidDataPsdOptions,
): Promise<ValidDataPsd> {
  const { file, sampleRate: fs, data } = series;
  const seconds = options.segmentSeconds;
  const wanted = Math.round(seconds * fs);
  if (!(wanted >= MIN_WELCH_SEGMENT_SAMPLES)) {
    throw parameterError("segmentSeconds", `${seconds} s is ${wanted} samples at ${fs} Hz; a PSD estimate needs segments of at least ${MIN_WELCH_SEGMENT_SAMPLES} samples`);
  }
  const segmentLength = nextPowerOfTwo(wanted);
  if (segmentLength > data.length) {
    throw parameterError(
      "segmentSeconds",
      `${seconds} s (${segmentLength} samples as a power of two) is longer than the data (${data.length} samples, ${(data.length / fs).toPrecision(4)} s at ${fs} Hz)`,
    );
  }
  const input = arrayInput(data, fs, series.startTime, file);
  const bad = await screenInput(input);
  if (bad.length > 0 && options.badData !== "exclude") throw badDataError(input, bad, "the PSD estimate");
  const excluded: ExcludedRange[] = bad.map((b) => ({ start: b.start, end: b.end, reason: describeBadStretch(b) }));
  const { intervals } = validIntervals(data.length, fs, series.startTime, { badData: excluded });
  if (intervals.length === 0) throw new InputError(`${file}: nothing is left after leaving out bad data; there is no PSD to estimate`);
  const longest = intervals.reduce((m, iv) => Math.max(m, iv.end - iv.start), 0);
  if (longest < segmentLength) {
    throw parameterError(
      "segmentSeconds",
      `${seconds} s (${segmentLength} samples as a power of two) is longer than every stretch of valid data in ${file} ` +
        `(the longest: ${longest} samples, ${(longest / fs).toPrecision(4)} s at ${fs} Hz)`,
    );
  }
  const estimate = welchPsd(data, fs, { segmentLength, average: options.average, intervals });
  const excludedSamples = data.length - intervals.reduce((sum, iv) => sum + (iv.end - iv.start), 0);
  return { estimate, segmentLength, excluded, excludedSamples };
}

// Limits on a series' time base: its sample rate and the times its samples can be given.
import { InputError, parameterError } from "../errors.js";

/**
 * Highest sample rate (Hz) chirpsieve reads, writes or simulates: 8 × 16384 Hz, the highest rate
 * at which ground-based detectors record strain (common practice, no source). Higher rates only
 * add band above every chirp's ISCO frequency for components of 0.1 M_sun or more, at a memory cost
 * proportional to the rate; resample such data before analysing it.
 */
export const MAX_SAMPLE_RATE_HZ = 131_072;

/** The float64 spacing of the times must be at most this fraction of a sample step. */
export const TIME_RESOLUTION_PER_STEP = 1 / 16;

/**
 * Why a time base is unusable, or undefined when it is fine: a sample rate above
 * {@link MAX_SAMPLE_RATE_HZ}, or times so large that float64 cannot resolve a 16th of a sample
 * step there (every sample time would collapse onto a few values; sub-sample peak times need the
 * 16th). The spacing of float64 at |t| is at most |t|·2^−52 (IEEE 754).
 */
export function timeBaseProblem(sampleRate: number, startTime: number, samples: number): { what: "sampleRate" | "startTime"; detail: string } | undefined {
  if (sampleRate > MAX_SAMPLE_RATE_HZ) {
    return { what: "sampleRate", detail: `${sampleRate} Hz is above the highest sample rate chirpsieve handles, ${MAX_SAMPLE_RATE_HZ} Hz; resample the data first` };
  }
  const end = Math.max(Math.abs(startTime), Math.abs(startTime + samples / sampleRate));
  const spacing = end * Number.EPSILON;
  const step = 1 / sampleRate;
  if (!(spacing <= TIME_RESOLUTION_PER_STEP * step)) {
    const largest = (TIME_RESOLUTION_PER_STEP * step) / Number.EPSILON;
    return {
      what: "startTime",
      detail:
        `${startTime} s cannot time samples ${step.toPrecision(3)} s apart: float64 resolves only ${spacing.toPrecision(3)} s there ` +
        `(times must stay within ±${largest.toPrecision(3)} s at ${sampleRate} Hz); shift the time origin`,
    };
  }
  return undefined;
}

/** Throws an InputError naming `file` when its time base is unusable (see {@link timeBaseProblem}). */
export function checkFileTimeBase(file: string, sampleRate: number, startTime: number, samples: number): void {
  const p = timeBaseProblem(sampleRate, startTime, samples);
  if (p) throw new InputError(`${file}: ${p.what} ${p.detail}`);
}

/** Throws a parameterError on `sampleRate` or `startTime` when a time base asked for is unusable. */
export function checkTimeBaseParameters(sampleRate: number, startTime: number, samples: number): void {
  const p = timeBaseProblem(sampleRate, startTime, samples);
  if (p) throw parameterError(p.what, p.detail);
}

// Where gates go in whitened data, and the inverse Tukey window they cut with (gating.ts runs them).
import { selectInPlace } from "./welch.js";

/** One gate: whitened data zeroed over [centre − half-width, centre + half-width], tapered beyond. */
export interface Gate {
  /** Sample (of the segment) of the loudest whitened excursion. */
  readonly peakSample: number;
  /** First and one-past-last sample of the zeroed stretch (of the segment; tapers lie outside). */
  readonly zeroStart: number;
  readonly zeroEnd: number;
  /** Loudest |whitened sample| in robust standard deviations. */
  readonly peakSigma: number;
}

/** A run of loud samples: the first and last beyond the limit, and the loudest of them. */
export interface ExcursionRun {
  readonly first: number;
  readonly last: number;
  readonly peak: number;
}

/** Median absolute deviation of Gaussian data is 0.6745 σ (common practice, no source). */
const MAD_TO_SIGMA = 1 / 0.6744897501960817;

/**
 * Robust standard deviation of y[0..length): the median of |y| over every stride-th sample (stride
 * the smallest that fits `scratch`), times 1/0.6745. `scratch` is overwritten.
 */
export function robustSigma(y: Float64Array, length: number, scratch: Float64Array): number {
  const stride = Math.max(1, Math.ceil(length / scratch.length));
  let m = 0;
  for (let i = 0; i < length; i += stride) scratch[m++] = Math.abs(y[i]);
  return selectInPlace(scratch.subarray(0, m), m >> 1) * MAD_TO_SIGMA;
}

/**
 * The runs of samples of y[0..length) with |y| > limit, in order; a loud sample within
 * `joinSamples` of the previous one joins its run.
 */
export function excursionRuns(y: Float64Array, length: number, limit: number, joinSamples: number): ExcursionRun[] {
  const runs: ExcursionRun[] = [];
  let i = 0;
  while (i < length) {
    if (!(Math.abs(y[i]) > limit)) {
      i++;
      continue;
    }
    const first = i;
    let last = i;
    let peak = i;
    for (let j = i + 1; j < length && j <= last + joinSamples; j++) {
      if (Math.abs(y[j]) > limit) {
        last = j;
        if (Math.abs(y[j]) > Math.abs(y[peak])) peak = j;
      }
    }
    runs.push({ first, last, peak });
    i = last + 1;
  }
  return runs;
}

/**
 * The gates of excursion runs in data of `length` samples: each run's zeroed stretch is the run
 * widened by `halfWidth` samples each side (clipped to the data), and a run whose stretch starts
 * within 2·taper of the previous gate's end (their tapers would overlap) extends that gate, which
 * keeps the louder peak. Peaks are given in units of `sigma`.
 */
export function mergeGateWindows(runs: readonly ExcursionRun[], y: Float64Array, sigma: number, length: number, halfWidth: number, taper: number): Gate[] {
  const gates: Gate[] = [];
  for (const run of runs) {
    const prev = gates[gates.length - 1];
    const zeroStart = Math.max(0, run.first - halfWidth);
    const zeroEnd = Math.min(length, run.last + halfWidth + 1);
    if (prev && zeroStart <= prev.zeroEnd + 2 * taper) {
      const p = Math.abs(y[run.peak]) > prev.peakSigma * sigma ? run.peak : prev.peakSample;
      gates[gates.length - 1] = { peakSample: p, zeroStart: prev.zeroStart, zeroEnd, peakSigma: Math.abs(y[p]) / sigma };
    } else {
      gates.push({ peakSample: run.peak, zeroStart, zeroEnd, peakSigma: Math.abs(y[run.peak]) / sigma });
    }
  }
  return gates;
}

/**
 * Weight of the cosine taper `distance` samples (1…taper) outside a zeroed stretch:
 * ½(1 + cos(π·distance/(taper + 1))), falling from 1 at the stretch to 0 one sample past the taper,
 * i.e. the rising half of a Hann window ½(1 − cos(πt/T)) with T = taper + 1 and t = T − distance
 * (common practice, no source).
 */
export function gateTaperWeight(distance: number, taper: number): number {
  return 0.5 * (1 + Math.cos((Math.PI * distance) / (taper + 1)));
}

/**
 * Multiplies y[0..size) in place by the inverse Tukey window of `gates`: 1 inside each zeroed
 * stretch, the cosine taper of `taper` samples on each side, 0 elsewhere — what gating removes.
 */
export function keepGatedPart(y: Float64Array, size: number, gates: readonly Gate[], taper: number): void {
  let at = 0;
  for (const g of gates) {
    const a = Math.max(0, g.zeroStart - taper);
    const b = Math.min(size, g.zeroEnd + taper);
    y.fill(0, at, a);
    for (let j = a; j < b; j++) {
      let w = 1;
      if (j < g.zeroStart) w = gateTaperWeight(g.zeroStart - j, taper);
      else if (j >= g.zeroEnd) w = gateTaperWeight(j - g.zeroEnd + 1, taper);
      y[j] *= w;
    }
    at = b;
  }
  y.fill(0, at, size);
}

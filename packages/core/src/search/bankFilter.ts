import { createComplexPlan } from "../fft/create.js";
import type { ComplexPlan, FftBackendName } from "../fft/types.js";
import type { Trigger } from "../filter/peaks.js";
import { taylorF2Amplitude, taylorF2BinRange } from "../waveform/taylorf2.js";
import type { SegmentWeights } from "./segmentWeights.js";
import { findWindowPeaks } from "../filter/peaks.js";
import { createTaylorF2Phasor, type TaylorF2Phasor } from "../waveform/taylorF2Phasor.js";

/** What a {@link BankFilter} needs to know about the segments it filters. */
export interface BankFilterConfig {
  /** Samples per segment N (a power of two). */
  size: number;
  sampleRate: number;
  /** Low-frequency cutoff of the templates (Hz). */
  fMinHz: number;
  /** High-frequency cutoff of the inner product (Hz). */
  fMaxHz: number;
  backend: FftBackendName;
  /** Phase-error bound of the fast phase path (rad); default DEFAULT_PHASOR_PHASE_ERROR. */
  maxPhaseError?: number;
}

/** Where to look for peaks in a segment's SNR series and how to report them. */
export interface PeakWindow {
  /** Searched samples [start, end) of the segment. */
  start: number;
  end: number;
  threshold: number;
  /** Window (samples) of the windowed-maximum peak finder. */
  window: number;
}

/**
 * Filters templates against one segment's {@link SegmentWeights}: per template the fast phase
 * product written straight into the inverse-FFT plan's input, one inverse FFT, and peak finding
 * that touches each searched SNR sample once. Owns one complex plan; nothing is allocated per
 * template. Used alike by the main thread (threads = 1) and by each worker thread, so both give
 * the same numbers.
 */
export interface BankFilter {
  readonly backend: FftBackendName;
  /** Complex SNR of the last filtered template (interleaved, N samples; the plan's output). */
  readonly snr: Float32Array | Float64Array;
  /**
   * Complex SNR series of one template (masses in solar masses, at 1 Mpc) into `snr`; returns
   * σ (s, at 1 Mpc) and the template's kEnd, or σ = 0 when it has no power in the band (then
   * `snr` is not written). Aligned spins chi1, chi2 ∈ (−1, 1), default 0 (non-spinning).
   */
  filter(weights: SegmentWeights, m1Solar: number, m2Solar: number, chi1?: number, chi2?: number): { sigma: number; kEnd: number };
  /**
   * Filters templates from..to−1 of `masses` (m1, m2 pairs, solar masses), writes each σ into
   * sigmas[index] and appends the windowed peaks above threshold to `triggers`. `spins`, when
   * given, holds each template's aligned spins (χ1, χ2 pairs, the same layout as `masses`).
   */
  scan(
    weights: SegmentWeights,
    masses: Float64Array,
    from: number,
    to: number,
    peaks: PeakWindow,
    sigmas: Float64Array,
    triggers: Trigger[],
    spins?: Float64Array,
  ): void;
  /**
   * Makes the FFT plan and runs one transform of zeros, so that the first template does not pay
   * for the first touch of the plan's memory (~0.2 s for 2^21 points in a fresh thread).
   */
  warmUp(): void;
  dispose(): void;
}

export function createBankFilter(config: BankFilterConfig): BankFilter {
  const n = config.size;
  const nBins = n / 2 + 1;
  const df = config.sampleRate / n;
  const phasor: TaylorF2Phasor = createTaylorF2Phasor(df, { maxPhaseError: config.maxPhaseError });
  let plan: ComplexPlan | undefined;
  // The input holds non-zero values only in [dirtyLo, dirtyHi) (interleaved indices); a fresh
  // WebAssembly buffer is not zeroed, so at first everything is dirty.
  let dirtyLo = 0;
  let dirtyHi = 2 * n;
  const result = { sigma: 0, kEnd: 0 };
  const getPlan = (): ComplexPlan => (plan ??= createComplexPlan(n, config.backend));

  function filter(weights: SegmentWeights, m1: number, m2: number, chi1 = 0, chi2 = 0): { sigma: number; kEnd: number } {
    const { kStart, kEnd } = taylorF2BinRange(nBins, df, config.fMinHz, m1, m2, config.fMaxHz);
    result.kEnd = kEnd;
    result.sigma = 0;
    const kFrom = Math.max(kStart, weights.kLow);
    const kTo = Math.min(kEnd, weights.kHigh);
    if (kEnd === 0 || kTo <= kFrom || !(weights.scale > 0)) return result;
    const dC = weights.cumulative[kTo] - weights.cumulative[kFrom];
    if (!(dC > 0)) return result;
    const p = getPlan();
    const input = p.input;
    if (dirtyLo < 2 * kFrom) input.fill(0, dirtyLo, 2 * kFrom);
    if (dirtyHi > 2 * kTo) input.fill(0, 2 * kTo, dirtyHi);
    dirtyLo = 2 * kFrom;
    dirtyHi = 2 * kTo;
    phasor.multiply(weights.u, input, kFrom, kTo, m1, m2, Math.sqrt((4 * df) / dC), chi1, chi2);
    p.inverse();
    result.sigma = (taylorF2Amplitude(m1, m2, 1) * Math.sqrt(4 * df * dC)) / weights.scale;
    return result;
  }

  return {
    backend: config.backend,
    get snr() {
      return getPlan().output;
    },
    filter,
    scan(weights, masses, from, to, peaks, sigmas, triggers, spins) {
      for (let ti = from; ti < to; ti++) {
        const { sigma } = spins
          ? filter(weights, masses[2 * ti], masses[2 * ti + 1], spins[2 * ti], spins[2 * ti + 1])
          : filter(weights, masses[2 * ti], masses[2 * ti + 1]);
        sigmas[ti] = sigma;
        if (sigma > 0) findWindowPeaks(getPlan().output, peaks.start, peaks.end, peaks.threshold, peaks.window, ti, triggers);
      }
    },
    warmUp() {
      const p = getPlan();
      p.input.fill(0);
      dirtyLo = 0;
      dirtyHi = 0;
      p.inverse();
    },
    dispose() {
      plan?.dispose();
      plan = undefined;
      dirtyLo = 0;
      dirtyHi = 2 * n;
    },
  };
}

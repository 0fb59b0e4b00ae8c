import { createComplexPlan } from "../fft/create.js";
import type { ComplexPlan, FftBackendName } from "../fft/types.js";
import type { Trigger } from "../filter/peaks.js";
import { taylorF2Amplitude, taylorF2BinRange } from "../waveform/taylorf2.js";
import type { SegmentWeights } from "./segmentWeights.js";
import { findWindowPeaks } from "../filter/peaks.js";
import { findBandLimitedPeaks, type ReducedSeries } from "../filter/bandLimitedPeaks.js";
import { bandSpreadHz, chooseOutputRate, type OutputRate } from "./outputRate.js";
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
  /**
   * ε of the per-template output rate (search/outputRate.ts): each template's band is cut where it
   * keeps 1 − ε of its SNR² and it is filtered by a shorter inverse FFT. Absent: every template
   * at the full rate (one N-point inverse FFT each).
   */
  bandPowerLoss?: number;
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
  /**
   * Complex SNR of the last filtered template (interleaved; the plan's output): N samples, or
   * with a per-template rate `length` samples, z at every (N/length)-th sample.
   */
  readonly snr: Float32Array | Float64Array;
  /**
   * Complex SNR series of one template (masses in solar masses, at 1 Mpc) into `snr`; returns
   * σ (s, at 1 Mpc) of the band filtered, the template's kEnd and the series length (N at the
   * full rate), or σ = 0 when it has no power in the band (then `snr` is not written). Aligned
   * spins chi1, chi2 ∈ (−1, 1), default 0 (non-spinning).
   */
  filter(weights: SegmentWeights, m1Solar: number, m2Solar: number, chi1?: number, chi2?: number): { sigma: number; kEnd: number; length: number };
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

/**
 * How far below the threshold a reduced-rate series is searched for seeds: the expected fall of
 * |z| half a reduced sample s from its peak is about ½(2π σ_f s)² for an RMS bandwidth σ_f (the
 * curvature of the normalised autocorrelation at zero lag; common practice, no source), taken
 * SEED_MARGIN times over and at most half the threshold.
 */
const SEED_MARGIN = 4;

export function createBankFilter(config: BankFilterConfig): BankFilter {
  const n = config.size;
  const nBins = n / 2 + 1;
  const df = config.sampleRate / n;
  const loss = config.bandPowerLoss;
  const phasor: TaylorF2Phasor = createTaylorF2Phasor(df, { maxPhaseError: config.maxPhaseError });
  // One plan per inverse-FFT length (index log2 of the length), made on first use. The input of
  // each holds non-zero values only in [dirtyLo, dirtyHi) (interleaved indices); a fresh
  // WebAssembly buffer is not zeroed, so at first everything is dirty.
  const plans: (ComplexPlan | undefined)[] = [];
  const dirtyLo: number[] = [];
  const dirtyHi: number[] = [];
  let last: ComplexPlan | undefined;
  const result = { sigma: 0, kEnd: 0, length: n };
  const rate: OutputRate = { kUse: 0, length: n };
  const reduced: ReducedSeries = { series: new Float32Array(0), length: 0, factor: 1, centreBin: 0 };
  let spreadHz = 0;
  const getPlan = (size: number): ComplexPlan => {
    const e = Math.round(Math.log2(size));
    let p = plans[e];
    if (!p) {
      p = plans[e] = createComplexPlan(size, config.backend);
      dirtyLo[e] = 0;
      dirtyHi[e] = 2 * size;
    }
    return p;
  };

  function filter(weights: SegmentWeights, m1: number, m2: number, chi1 = 0, chi2 = 0): { sigma: number; kEnd: number; length: number } {
    const { kStart, kEnd } = taylorF2BinRange(nBins, df, config.fMinHz, m1, m2, config.fMaxHz);
    result.kEnd = kEnd;
    result.sigma = 0;
    const kFrom = Math.max(kStart, weights.kLow);
    let kTo = Math.min(kEnd, weights.kHigh);
    if (kEnd === 0 || kTo <= kFrom || !(weights.scale > 0)) return result;
    const cum = weights.cumulative;
    if (!(cum[kTo] - cum[kFrom] > 0)) return result;
    let size = n;
    if (loss !== undefined) {
      chooseOutputRate(cum, kFrom, kTo, loss, n, rate);
      size = rate.length;
      kTo = rate.kUse;
      if (size < n) spreadHz = bandSpreadHz(cum, kFrom, kTo, df);
    }
    const dC = cum[kTo] - cum[kFrom];
    if (!(dC > 0)) return result;
    const p = getPlan(size);
    const e = Math.round(Math.log2(size));
    const input = p.input;
    if (dirtyLo[e] < 2 * kFrom) input.fill(0, dirtyLo[e], 2 * kFrom);
    if (dirtyHi[e] > 2 * kTo) input.fill(0, 2 * kTo, dirtyHi[e]);
    dirtyLo[e] = 2 * kFrom;
    dirtyHi[e] = 2 * kTo;
    phasor.multiply(weights.u, input, kFrom, kTo, m1, m2, Math.sqrt((4 * df) / dC), chi1, chi2);
    p.inverse();
    last = p;
    result.length = size;
    result.sigma = (taylorF2Amplitude(m1, m2, 1) * Math.sqrt(4 * df * dC)) / weights.scale;
    reduced.length = size;
    reduced.factor = n / size;
    reduced.centreBin = 0.5 * (kFrom + kTo);
    return result;
  }

  return {
    backend: config.backend,
    get snr() {
      return (last ?? getPlan(n)).output;
    },
    filter,
    scan(weights, masses, from, to, peaks, sigmas, triggers, spins) {
      for (let ti = from; ti < to; ti++) {
        const { sigma, length } = spins
          ? filter(weights, masses[2 * ti], masses[2 * ti + 1], spins[2 * ti], spins[2 * ti + 1])
          : filter(weights, masses[2 * ti], masses[2 * ti + 1]);
        sigmas[ti] = sigma;
        if (!(sigma > 0)) continue;
        if (length === n) {
          findWindowPeaks(last!.output, peaks.start, peaks.end, peaks.threshold, peaks.window, ti, triggers);
        } else {
          // Half a reduced sample, in seconds, and the expected fall of |z| over it.
          const half = reduced.factor / (2 * config.sampleRate);
          const x = 2 * Math.PI * spreadHz * half;
          const seed = peaks.threshold * Math.max(0.5, 1 - SEED_MARGIN * 0.5 * x * x);
          reduced.series = last!.output;
          findBandLimitedPeaks(reduced, peaks.start, peaks.end, peaks.threshold, seed, peaks.window, ti, triggers);
        }
      }
    },
    warmUp() {
      // At a per-template rate the lengths a segment needs are not known yet: plans are made on first use.
      if (loss !== undefined) return;
      const p = getPlan(n);
      p.input.fill(0);
      dirtyLo[Math.round(Math.log2(n))] = 0;
      dirtyHi[Math.round(Math.log2(n))] = 0;
      p.inverse();
    },
    dispose() {
      for (const p of plans) p?.dispose();
      plans.length = 0;
      dirtyLo.length = 0;
      dirtyHi.length = 0;
      last = undefined;
    },
  };
}

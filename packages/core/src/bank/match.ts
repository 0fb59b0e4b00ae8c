// The match between two frequency-domain waveforms, maximised over time and phase.
import { InputError } from "../errors.js";
import { createComplexFft } from "../fft/create.js";
import type { ComplexFft } from "../fft/types.js";
import type { PsdModel } from "../noise/psdModel.js";
import { goldenSectionMax } from "./goldenSection.js";

/** A frequency grid f_k = k·dfHz, k = 0..nBins−1, and the size of the inverse FFT over it. */
export interface MatchGrid {
  dfHz: number;
  nBins: number;
  fftSize: number;
}

export interface MatchGridOptions {
  /** Highest frequency that any waveform reaches (Hz), e.g. the ISCO of the lightest binary. */
  fMaxHz: number;
  /**
   * The span of relative time shifts (s) the correlation must represent without wrapping; the grid
   * spacing is df = 1 / (the next power of two ≥ this, in seconds). For two waveforms that nearly
   * match, a b* / S varies slowly in frequency (its "duration" is the spread of their time offsets
   * t_a(f) − t_b(f), tens of ms for neighbours in a bank), so this can be far shorter than the
   * waveforms themselves; pass the longest waveform duration for an exact-as-continuous grid.
   */
  lagSpanS: number;
  /** Time-domain oversampling of the inverse FFT relative to 1/fHigh (default 2). */
  oversample?: number;
}

/** The grid for matches of waveforms up to `fMaxHz` with time offsets within `lagSpanS`. */
export function chooseMatchGrid(options: MatchGridOptions): MatchGrid {
  const { fMaxHz, lagSpanS } = options;
  const oversample = options.oversample ?? 2;
  if (!(fMaxHz > 0) || !Number.isFinite(fMaxHz)) throw new InputError(`match grid: fMaxHz must be a positive number (got ${fMaxHz})`);
  if (!(lagSpanS > 0) || !Number.isFinite(lagSpanS)) throw new InputError(`match grid: lagSpanS must be a positive number (got ${lagSpanS})`);
  if (!(oversample >= 1)) throw new InputError(`match grid: oversample must be ≥ 1 (got ${oversample})`);
  const span = Math.pow(2, Math.ceil(Math.log2(lagSpanS)));
  const dfHz = 1 / span;
  const nBins = Math.floor(fMaxHz / dfHz) + 2;
  const fftSize = Math.pow(2, Math.ceil(Math.log2(nBins * oversample)));
  return { dfHz, nBins, fftSize };
}

/** Options of {@link createMatchComputer}. */
export interface MatchComputerOptions extends MatchGrid {
  psd: PsdModel;
  /** Lower end of the inner-product integrals, Hz. */
  fMinHz: number;
  /** Upper end of the inner-product integrals, Hz (default: the grid's last bin). */
  fMaxHz?: number;
  /** Refine the time of the correlation peak between samples (default true). */
  refinePeak?: boolean;
}

/** Result of one match: the value and the lag (s) at which the correlation peaks. */
export interface MatchResult {
  match: number;
  lagS: number;
}

/** Computes matches on one grid and noise curve. Not thread-safe (reuses scratch arrays). */
export interface MatchComputer {
  readonly grid: MatchGrid;
  /**
   * (a|a) up to `cutHz` (the waveform's own end, e.g. its ISCO; default the upper end of the
   * integrals), in units of 4·df (the same units as the overlaps below).
   */
  normSquared(a: Float64Array, cutHz?: number): number;
  /**
   * The match max_{t,φ} (a|b e^{2πift+iφ}) / sqrt((a|a)(b|b)) of two interleaved complex spectra on
   * the grid. `cutA`/`cutB` are where the waveforms end (Hz; default the upper end); precomputed
   * squared norms may be passed to save work.
   */
  match(a: Float64Array, b: Float64Array, cutA?: number, cutB?: number, normA2?: number, normB2?: number): MatchResult;
}

/**
 * Creates a match computer. The noise-weighted inner product is (a|b) = 4 Re ∫ a b* / S_n df (the
 * project's convention), maximised over phase by the modulus of the complex correlation and over time
 * by an inverse FFT: z(t_j) = Σ_k a_k b_k* w_k e^{2πi k j / N}, t_j = j/(N df); the match is
 * max_j |z(t_j)| / sqrt((a|a)(b|b)) (common practice; e.g. Owen, Phys. Rev. D 53, 6749 (1996),
 * Sec. II; Allen et al., Phys. Rev. D 85, 122006 (2012), Sec. IV). The peak is then refined between
 * samples by a golden-section search on |z(t)| evaluated directly from the sum.
 *
 * The integrals are midpoint sums over bins; each bin is weighted by the fraction of its cell
 * [f_k − df/2, f_k + df/2] that lies inside the band (the first bin, and the last bin of a waveform
 * whose end falls between bins, get fractional weights, the last one extrapolating the bin's value),
 * so a waveform's abrupt end at its ISCO is integrated to O(df²) instead of O(df).
 */
export function createMatchComputer(options: MatchComputerOptions): MatchComputer {
  const { psd, dfHz, nBins, fftSize, fMinHz } = options;
  if (!(dfHz > 0) || !Number.isInteger(nBins) || nBins < 2) throw new InputError(`match: invalid grid (dfHz ${dfHz}, nBins ${nBins})`);
  if (!Number.isInteger(fftSize) || fftSize < nBins) throw new InputError(`match: fftSize ${fftSize} must be an integer ≥ nBins ${nBins}`);
  const fMaxHz = Math.min(options.fMaxHz ?? Infinity, (nBins - 1) * dfHz);
  if (!(fMinHz > 0) || !(fMaxHz > fMinHz)) throw new InputError(`match: need 0 < fMinHz < fMaxHz (got ${fMinHz}, ${fMaxHz})`);
  const refine = options.refinePeak ?? true;
  const kLow = Math.max(1, Math.round(fMinHz / dfHz));
  // Base weights 1/S(f_k) on [kLow, kTop]; the first bin's cell is cut at fLow.
  const w = new Float64Array(nBins);
  for (let k = kLow; k < nBins; k++) {
    const s = psd.evaluate(k * dfHz);
    w[k] = s > 0 && Number.isFinite(s) ? 1 / s : 0;
  }
  w[kLow] *= Math.min(1, Math.max(0, (kLow + 0.5) - fMinHz / dfHz));
  const fft: ComplexFft = createComplexFft(fftSize);
  const prod = new Float64Array(2 * fftSize);
  const corr = new Float64Array(2 * fftSize);

  /** Last bin index and its weight factor for a band ending at cutHz. */
  const endOf = (cutHz: number): { kLast: number; frac: number } => {
    const c = Math.min(cutHz, fMaxHz) / dfHz;
    let kLast = Math.floor(c);
    if (kLast > nBins - 1) kLast = nBins - 1;
    // The cell of bin kLast is [kLast − ½, kLast + ½]; the band covers it up to c (extrapolated past ½).
    const frac = c - kLast + 0.5;
    return { kLast, frac };
  };

  const normSquared = (a: Float64Array, cutHz = Infinity): number => {
    const { kLast, frac } = endOf(cutHz);
    let s = 0;
    for (let k = kLow; k <= kLast; k++) {
      const re = a[2 * k];
      const im = a[2 * k + 1];
      const term = (re * re + im * im) * w[k];
      s += k === kLast ? term * frac : term;
    }
    return s;
  };

  // |z(t)|² evaluated directly from the product held in `prod` (bins kLow..kLast).
  let curLast = 0;
  const modulusAt = (t: number): number => {
    const theta = 2 * Math.PI * dfHz * t;
    const cr = Math.cos(theta);
    const ci = Math.sin(theta);
    let er = Math.cos(theta * kLow);
    let ei = Math.sin(theta * kLow);
    let zr = 0;
    let zi = 0;
    for (let k = kLow; k <= curLast; k++) {
      const pr = prod[2 * k];
      const pi = prod[2 * k + 1];
      zr += pr * er - pi * ei;
      zi += pr * ei + pi * er;
      const nr = er * cr - ei * ci;
      ei = er * ci + ei * cr;
      er = nr;
    }
    return zr * zr + zi * zi;
  };

  const match = (a: Float64Array, b: Float64Array, cutA = Infinity, cutB = Infinity, normA2?: number, normB2?: number): MatchResult => {
    const na = normA2 ?? normSquared(a, cutA);
    const nb = normB2 ?? normSquared(b, cutB);
    if (!(na > 0) || !(nb > 0)) return { match: 0, lagS: 0 };
    const { kLast, frac } = endOf(Math.min(cutA, cutB));
    prod.fill(0);
    for (let k = kLow; k <= kLast; k++) {
      const ar = a[2 * k];
      const ai = a[2 * k + 1];
      const br = b[2 * k];
      const bi = b[2 * k + 1];
      const wk = k === kLast ? w[k] * frac : w[k];
      // a b*
      prod[2 * k] = (ar * br + ai * bi) * wk;
      prod[2 * k + 1] = (ai * br - ar * bi) * wk;
    }
    fft.inverse(prod, corr);
    let best = -1;
    let jBest = 0;
    for (let j = 0; j < fftSize; j++) {
      const re = corr[2 * j];
      const im = corr[2 * j + 1];
      const m2 = re * re + im * im;
      if (m2 > best) {
        best = m2;
        jBest = j;
      }
    }
    const dt = 1 / (fftSize * dfHz);
    let tBest = jBest * dt;
    if (refine) {
      curLast = kLast;
      // Golden-section search for the maximum of |z(t)|² on [t_{j−1}, t_{j+1}].
      const peak = goldenSectionMax(modulusAt, tBest - dt, tBest + dt, 18);
      if (peak.value > best) {
        best = peak.value;
        tBest = peak.x;
      }
    }
    let lag = tBest;
    const period = 1 / dfHz;
    if (lag > period / 2) lag -= period;
    return { match: Math.sqrt(best / (na * nb)), lagS: lag };
  };

  return { grid: { dfHz, nBins, fftSize }, normSquared, match };
}

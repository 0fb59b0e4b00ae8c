import { createRealFft } from "../fft/create.js";
import type { FftBackendName, RealFft } from "../fft/types.js";
import { excursionRuns, keepGatedPart, mergeGateWindows, robustSigma, type Gate } from "./gateWindows.js";
import { createRealInverseFft, type RealInverseFft } from "./realInverseFft.js";

export type { Gate } from "./gateWindows.js";

/** When and how loud transients are cut out of the data before filtering. */
export interface GateSettings {
  /** A whitened sample beyond this many robust standard deviations opens a gate. */
  readonly thresholdSigma: number;
  /** Half-width of the zeroed stretch around the excursion (s). */
  readonly halfWidthSeconds: number;
  /** Length of the cosine taper on each side of the zeroed stretch (s). */
  readonly taperSeconds: number;
}

/**
 * Default gating. 20 σ in whitened data: Gaussian noise exceeds it with probability
 * erfc(20/√2) ≈ 6e-89 per sample, so it never gates stationary noise, while a sine-Gaussian
 * glitch of matched-filter SNR ≳ 150 in the bucket crosses it; an astrophysical inspiral spreads
 * its SNR over many cycles and stays far below (a 30+30 M☉ chirp would need SNR ≳ 200). The trade
 * often uses thresholds of tens of σ (common practice, no source); ours is at the low end of that
 * to catch glitches the chi-squared test would otherwise have to carry. Zeroing ±0.25 s with
 * 0.25 s tapers: ours, common practice, no source.
 */
export const DEFAULT_GATE_SETTINGS: GateSettings = { thresholdSigma: 20, halfWidthSeconds: 0.25, taperSeconds: 0.25 };

/** Taper (s) at each end of the data before whitening for the search of excursions. */
const EDGE_SECONDS = 0.5;

/** Most samples the robust σ is taken from (evenly strided). */
const SIGMA_SAMPLES = 65536;

/**
 * Finds and removes loud transients in one segment: whitens the data by its PSD inside the band
 * [fMinHz, fMaxHz] (Y = X/√S), measures the robust σ of the whitened samples (1.4826 × median |y|),
 * and for every run of samples beyond thresholdSigma·σ zeroes the whitened data over the run
 * widened by halfWidthSeconds on each side, with a Hann (cosine) taper of taperSeconds beyond
 * that — an inverse Tukey window. The segment is then re-coloured: only the removed whitened part,
 * coloured by √S inside the band, is subtracted from `data`, so data without gates is untouched.
 * A whitened-domain gate leaves a clean hole the matched filter sees as missing data.
 * (Gating with an inverse Tukey window: common practice, no source.)
 */
export interface Gater {
  readonly size: number;
  /**
   * Gates `data` (length `size`, real samples in [0, dataLength), zero padding after) in place with
   * `psd` (size/2 + 1 bins, 1/Hz); returns the gates, in time order (none: data unchanged).
   */
  apply(data: Float64Array, dataLength: number, psd: Float64Array, fMinHz: number, fMaxHz: number, settings: GateSettings): Gate[];
}

/** The FFT plans and buffers one gater owns and every stage reuses. */
interface GaterBuffers {
  readonly forward: RealFft;
  readonly inverse: RealInverseFft;
  /** Interleaved spectrum, N + 2. */
  readonly spec: Float64Array;
  /** Time series, N: the whitened data, then the removed part, then its re-coloured form. */
  readonly time: Float64Array;
  /** Whitening gain per bin, N/2 + 1. */
  readonly gain: Float64Array;
}

/** gain[k] = 1/√S[k] on the bins k ∈ [kLow, kHigh) where S is positive and finite, 0 elsewhere. */
export function bandWhiteningGain(psd: Float64Array, kLow: number, kHigh: number, gain: Float64Array): void {
  gain.fill(0);
  for (let k = kLow; k < kHigh; k++) {
    const s = psd[k];
    if (s > 0 && Number.isFinite(s)) gain[k] = 1 / Math.sqrt(s);
  }
}

/**
 * Copies data[0..dataLength) into out (zero after), tapered over `edge` samples at both ends by
 * the half-Hann ½(1 − cos(π(j + ½)/edge)) (common practice, no source): the circular jump between
 * the data's end and start would otherwise whiten into spikes at the edges.
 */
export function edgeTaperedCopy(data: Float64Array, dataLength: number, edge: number, out: Float64Array): void {
  out.fill(0);
  for (let j = 0; j < dataLength; j++) out[j] = data[j];
  for (let j = 0; j < edge; j++) {
    const w = 0.5 * (1 - Math.cos((Math.PI * (j + 0.5)) / edge));
    out[j] *= w;
    out[dataLength - 1 - j] *= w;
  }
}

/** b.time ← IFFT(FFT(b.time)·gain): whitened (by N, unnormalised; only ratios to σ are used). */
function whitenInPlace(b: GaterBuffers, nBins: number): void {
  const { spec, gain } = b;
  b.forward.forward(b.time, spec);
  for (let k = 0; k < nBins; k++) {
    spec[2 * k] *= gain[k];
    spec[2 * k + 1] *= gain[k];
  }
  b.inverse.inverse(spec, b.time);
}

/**
 * Re-colours the removed whitened part in b.time inside the band and subtracts it from data:
 * d ← d − IFFT(FFT(r)·√S)/N², the N² undoing the two unnormalised inverse transforms.
 */
function subtractRecoloured(b: GaterBuffers, n: number, nBins: number, data: Float64Array, dataLength: number): void {
  const { spec, gain, time } = b;
  b.forward.forward(time, spec);
  for (let k = 0; k < nBins; k++) {
    const g = gain[k];
    const c = g > 0 ? 1 / (g * n * n) : 0;
    spec[2 * k] *= c;
    spec[2 * k + 1] *= c;
  }
  b.inverse.inverse(spec, time);
  for (let j = 0; j < dataLength; j++) data[j] -= time[j];
}

export function createGater(size: number, sampleRate: number, backend: FftBackendName = "fftjs"): Gater {
  const n = size;
  const nBins = n / 2 + 1;
  const df = sampleRate / n;
  let buffers: GaterBuffers | undefined;
  const mags = new Float64Array(Math.min(SIGMA_SAMPLES, n));
  return {
    size,
    apply(data, dataLength, psd, fMinHz, fMaxHz, settings) {
      const b = (buffers ??= {
        forward: createRealFft(n, backend),
        inverse: createRealInverseFft(n, backend),
        spec: new Float64Array(n + 2),
        time: new Float64Array(n),
        gain: new Float64Array(nBins),
      });
      const kLow = Math.max(1, Math.ceil(fMinHz / df));
      const kHigh = Math.min(nBins - 1, Math.floor(fMaxHz / df) + 1);
      bandWhiteningGain(psd, kLow, kHigh, b.gain);
      edgeTaperedCopy(data, dataLength, Math.min(Math.round(EDGE_SECONDS * sampleRate), dataLength >> 2), b.time);
      whitenInPlace(b, nBins);
      const sigma = robustSigma(b.time, dataLength, mags);
      if (!(sigma > 0)) return [];
      const hw = Math.max(0, Math.round(settings.halfWidthSeconds * sampleRate));
      const taper = Math.max(0, Math.round(settings.taperSeconds * sampleRate));
      // Excursions closer than the zeroed width join one run; runs whose tapers overlap, one gate.
      const runs = excursionRuns(b.time, dataLength, settings.thresholdSigma * sigma, 2 * hw + 1);
      const gates = mergeGateWindows(runs, b.time, sigma, dataLength, hw, taper);
      if (gates.length === 0) return gates;
      keepGatedPart(b.time, n, gates, taper);
      subtractRecoloured(b, n, nBins, data, dataLength);
      return gates;
    },
  };
}

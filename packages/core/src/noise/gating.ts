import { createRealFft } from "../fft/create.js";
import type { FftBackendName, RealFft } from "../fft/types.js";
import { selectInPlace } from "./welch.js";
import { createRealInverseFft, type RealInverseFft } from "./realInverseFft.js";

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

/** Taper (s) at each end of the data before whitening for the search of excursions. */
const EDGE_SECONDS = 0.5;

/** Most samples the robust σ is taken from (evenly strided). */
const SIGMA_SAMPLES = 65536;

/** Median absolute deviation of Gaussian data is 0.6745 σ (common practice, no source). */
const MAD_TO_SIGMA = 1 / 0.6744897501960817;

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

export function createGater(size: number, sampleRate: number, backend: FftBackendName = "fftjs"): Gater {
  const n = size;
  const nBins = n / 2 + 1;
  const df = sampleRate / n;
  let forward: RealFft | undefined;
  let inverse: RealInverseFft | undefined;
  let spec: Float64Array | undefined;
  let time: Float64Array | undefined;
  let gain: Float64Array | undefined;
  const mags = new Float64Array(Math.min(SIGMA_SAMPLES, n));
  return {
    size,
    apply(data, dataLength, psd, fMinHz, fMaxHz, settings) {
      forward ??= createRealFft(n, backend);
      inverse ??= createRealInverseFft(n, backend);
      spec ??= new Float64Array(n + 2);
      time ??= new Float64Array(n);
      gain ??= new Float64Array(nBins);
      const kLow = Math.max(1, Math.ceil(fMinHz / df));
      const kHigh = Math.min(nBins - 1, Math.floor(fMaxHz / df) + 1);
      gain.fill(0);
      for (let k = kLow; k < kHigh; k++) {
        const s = psd[k];
        if (s > 0 && Number.isFinite(s)) gain[k] = 1 / Math.sqrt(s);
      }
      // Whiten a copy tapered over EDGE_SECONDS at both ends of the data: the circular jump between
      // the data's end and start would otherwise whiten into spikes at the edges.
      const edge = Math.min(Math.round(EDGE_SECONDS * sampleRate), dataLength >> 2);
      time.fill(0);
      for (let j = 0; j < dataLength; j++) time[j] = data[j];
      for (let j = 0; j < edge; j++) {
        const w = 0.5 * (1 - Math.cos((Math.PI * (j + 0.5)) / edge));
        time[j] *= w;
        time[dataLength - 1 - j] *= w;
      }
      forward.forward(time, spec);
      for (let k = 0; k < nBins; k++) {
        spec[2 * k] *= gain[k];
        spec[2 * k + 1] *= gain[k];
      }
      inverse.inverse(spec, time);
      // Robust σ of the whitened samples (strided median of |y|).
      const stride = Math.max(1, Math.ceil(dataLength / mags.length));
      let m = 0;
      for (let i = 0; i < dataLength; i += stride) mags[m++] = Math.abs(time[i]);
      const sigma = selectInPlace(mags.subarray(0, m), m >> 1) * MAD_TO_SIGMA;
      if (!(sigma > 0)) return [];
      const limit = settings.thresholdSigma * sigma;
      const hw = Math.max(0, Math.round(settings.halfWidthSeconds * sampleRate));
      const taper = Math.max(0, Math.round(settings.taperSeconds * sampleRate));
      const gates: Gate[] = [];
      let i = 0;
      while (i < dataLength) {
        if (!(Math.abs(time[i]) > limit)) {
          i++;
          continue;
        }
        // A run of excursions: those closer than the zeroed width join one gate.
        const first = i;
        let last = i;
        let peak = i;
        for (let j = i + 1; j < dataLength && j <= last + 2 * hw + 1; j++) {
          if (Math.abs(time[j]) > limit) {
            last = j;
            if (Math.abs(time[j]) > Math.abs(time[peak])) peak = j;
          }
        }
        const prev = gates[gates.length - 1];
        const zeroStart = Math.max(0, first - hw);
        const zeroEnd = Math.min(dataLength, last + hw + 1);
        if (prev && zeroStart <= prev.zeroEnd + 2 * taper) {
          // Overlapping tapers: one gate.
          const p = Math.abs(time[peak]) > prev.peakSigma * sigma ? peak : prev.peakSample;
          gates[gates.length - 1] = { peakSample: p, zeroStart: prev.zeroStart, zeroEnd, peakSigma: Math.abs(time[p]) / sigma };
        } else {
          gates.push({ peakSample: peak, zeroStart, zeroEnd, peakSigma: Math.abs(time[peak]) / sigma });
        }
        i = last + 1;
      }
      if (gates.length === 0) return gates;
      // The removed part r = y·w (w = 1 inside a gate, a cosine taper outside, 0 elsewhere).
      let at = 0;
      for (const g of gates) {
        const a = Math.max(0, g.zeroStart - taper);
        const b = Math.min(n, g.zeroEnd + taper);
        time.fill(0, at, a);
        for (let j = a; j < b; j++) {
          let w = 1;
          if (j < g.zeroStart) w = 0.5 * (1 + Math.cos((Math.PI * (g.zeroStart - j)) / (taper + 1)));
          else if (j >= g.zeroEnd) w = 0.5 * (1 + Math.cos((Math.PI * (j - g.zeroEnd + 1)) / (taper + 1)));
          time[j] *= w;
        }
        at = b;
      }
      time.fill(0, at);
      // Re-colour the removed part inside the band and subtract it: d ← d − IFFT(FFT(r)·√S)/N.
      forward.forward(time, spec);
      for (let k = 0; k < nBins; k++) {
        const g = gain[k];
        const c = g > 0 ? 1 / (g * n * n) : 0;
        spec[2 * k] *= c;
        spec[2 * k + 1] *= c;
      }
      inverse.inverse(spec, time);
      for (let j = 0; j < dataLength; j++) data[j] -= time[j];
      return gates;
    },
  };
}

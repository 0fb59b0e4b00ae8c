import { createRealFft } from "../fft/create.js";
import type { FftBackendName, RealFft } from "../fft/types.js";
import { computeSegmentSpectrum, type SegmentSpectrum } from "../filter/segmentSpectrum.js";
import { taylorF2Amplitude, taylorF2BinRange } from "../waveform/taylorf2.js";
import { createBankFilter, type BankFilter } from "./bankFilter.js";
import { segmentPsd } from "./segmentPsd.js";
import { allocateSegmentWeights, amplitudeLaw, fillSegmentWeights, type SegmentWeights } from "./segmentWeights.js";
import { createTaylorF2Phasor } from "../waveform/taylorF2Phasor.js";
import type { PsdMethod, SearchTemplate } from "./types.js";

/**
 * The reusable machinery that filters one segment with many templates: FFT plans, the template
 * generator for the segment's frequency grid and all buffers, allocated once per segment length
 * so the per-template loop allocates nothing.
 */
export interface SegmentFilter {
  readonly size: number;
  readonly sampleRate: number;
  readonly backend: FftBackendName;
  /** Complex SNR of the last filtered template (interleaved, `size` samples). */
  readonly snr: Float32Array | Float64Array;
  /** The template buffer (h̃ at 1 Mpc on the segment's bins, interleaved) of the last `generate`. */
  readonly template: Float64Array;
  /** PSD (1/Hz) on the segment's bins from the last `load`. */
  readonly psd: Float64Array;
  /** The template-independent filter weights of the last `load` (shared memory if asked for). */
  readonly weights: SegmentWeights;
  /**
   * Loads a segment (zero-padded to `size`): PSD, data spectrum weighted by 1/S, filter weights.
   * `psd` (N/2 + 1 bins, 1/Hz), when given, is used instead of computing it here (it must be
   * segmentPsd of the same data; the search computes it ahead, while workers filter).
   */
  load(data: Float64Array, dataLength: number, psd?: Float64Array): SegmentSpectrum;
  /**
   * Writes h̃ of a template at 1 Mpc into `template` (for the chi-squared test), by the fast phase
   * path (phase within DEFAULT_PHASOR_PHASE_ERROR of taylorF2Into, zero outside the band);
   * returns kEnd.
   */
  generate(t: SearchTemplate): number;
  /**
   * Filters one template against the loaded segment by the fast phase path (writes `snr`, not
   * `template`); returns σ at 1 Mpc (0: no band) and kEnd.
   */
  filter(t: SearchTemplate): { sigma: number; kEnd: number };
  dispose(): void;
}

export interface SegmentFilterOptions {
  size: number;
  sampleRate: number;
  fMinHz: number;
  fMaxHz: number;
  psd: PsdMethod;
  truncationSamples: number;
  backend: FftBackendName;
  /** Put the filter weights in SharedArrayBuffers (for worker threads). Default false. */
  shared?: boolean;
  /** Phase-error bound of the fast phase path (rad). */
  maxPhaseError?: number;
}

export function createSegmentFilter(o: SegmentFilterOptions): SegmentFilter {
  const n = o.size;
  const nBins = n / 2 + 1;
  const df = o.sampleRate / n;
  const realFft: RealFft = createRealFft(n, o.backend);
  // The template buffer serves only the chi-squared test of the few clustered peaks: made on first use.
  let template: Float64Array | undefined;
  const phasor = createTaylorF2Phasor(df, { maxPhaseError: o.maxPhaseError });
  // A model PSD is the same for every segment: evaluated once.
  let modelPsd: Float64Array | undefined;
  const buffers = { weighted: new Float64Array(n + 2), inversePsd: new Float64Array(nBins), spectrum: new Float64Array(n + 2) };
  const law = amplitudeLaw(nBins, df);
  const weights = allocateSegmentWeights(n, o.sampleRate, o.shared ?? false);
  // The complex plan is made on first use: with worker threads the main thread never needs it.
  const bank: BankFilter = createBankFilter({
    size: n,
    sampleRate: o.sampleRate,
    fMinHz: o.fMinHz,
    fMaxHz: o.fMaxHz,
    backend: o.backend,
    maxPhaseError: o.maxPhaseError,
  });
  let spec: SegmentSpectrum | null = null;
  let psd: Float64Array = new Float64Array(nBins);
  return {
    size: n,
    sampleRate: o.sampleRate,
    backend: o.backend,
    get snr() {
      return bank.snr;
    },
    get template() {
      return (template ??= new Float64Array(2 * nBins));
    },
    get psd() {
      return psd;
    },
    weights,
    load(data, dataLength, given) {
      if (given) psd = given;
      else if (o.psd.kind === "model") psd = modelPsd ??= segmentPsd(o.psd, data, dataLength, o.sampleRate, n, o.fMinHz, o.truncationSamples);
      else psd = segmentPsd(o.psd, data, dataLength, o.sampleRate, n, o.fMinHz, o.truncationSamples);
      spec = computeSegmentSpectrum(data, psd, o.sampleRate, o.fMinHz, o.fMaxHz, realFft, buffers);
      fillSegmentWeights(spec, law, weights);
      return spec;
    },
    generate(t) {
      const out = (template ??= new Float64Array(2 * nBins));
      const { kStart, kEnd } = taylorF2BinRange(nBins, df, o.fMinHz, t.primaryMassSolar, t.secondaryMassSolar, o.fMaxHz);
      out.fill(0, 0, 2 * kStart);
      out.fill(0, 2 * kEnd);
      phasor.template(law, out, kStart, kEnd, t.primaryMassSolar, t.secondaryMassSolar, taylorF2Amplitude(t.primaryMassSolar, t.secondaryMassSolar, 1), t.primarySpin ?? 0, t.secondarySpin ?? 0);
      return kEnd;
    },
    filter(t) {
      if (!spec) throw new Error("SegmentFilter.filter called before load");
      const { sigma, kEnd } = bank.filter(weights, t.primaryMassSolar, t.secondaryMassSolar, t.primarySpin ?? 0, t.secondarySpin ?? 0);
      return { sigma, kEnd };
    },
    dispose() {
      bank.dispose();
    },
  };
}

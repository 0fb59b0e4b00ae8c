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
  /**
   * A second filter for the same segment length sharing this one's plans, template generator and
   * scratch spectrum, with its own weighted spectrum, PSD and weights: one segment can be loaded
   * into it while workers still read the other's weights (the search's double buffer). Loads of
   * the two must not run at the same time (they share the scratch spectrum).
   */
  twin(): SegmentFilter;
  /** Frees the plans (a twin's dispose does nothing: dispose the filter it came from). */
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
  // The complex plan is made on first use: with worker threads the main thread never needs it.
  const bank: BankFilter = createBankFilter({
    size: n,
    sampleRate: o.sampleRate,
    fMinHz: o.fMinHz,
    fMaxHz: o.fMaxHz,
    backend: o.backend,
    maxPhaseError: o.maxPhaseError,
  });
  const common: SharedMachinery = {
    realFft: createRealFft(n, o.backend),
    phasor: createTaylorF2Phasor(df, { maxPhaseError: o.maxPhaseError }),
    law: amplitudeLaw(nBins, df),
    spectrum: new Float64Array(n + 2),
    bank,
  };
  return segmentFilterOn(o, common, true);
}

/** What the two filters of a double buffer share (see SegmentFilter.twin). */
interface SharedMachinery {
  realFft: RealFft;
  phasor: ReturnType<typeof createTaylorF2Phasor>;
  law: Float64Array;
  /** Scratch for the forward FFT of a load. */
  spectrum: Float64Array;
  bank: BankFilter;
  /** The template buffer serves only the chi-squared test of the few clustered peaks: made on first use. */
  template?: Float64Array;
  /** A model PSD is the same for every segment: evaluated once. */
  modelPsd?: Float64Array;
}

/** `owner`: this filter frees the shared machinery on dispose (a twin's dispose does nothing). */
function segmentFilterOn(o: SegmentFilterOptions, common: SharedMachinery, owner: boolean): SegmentFilter {
  const n = o.size;
  const nBins = n / 2 + 1;
  const df = o.sampleRate / n;
  const { realFft, phasor, law, bank } = common;
  const buffers = { weighted: new Float64Array(n + 2), inversePsd: new Float64Array(nBins), spectrum: common.spectrum };
  const weights = allocateSegmentWeights(n, o.sampleRate, o.shared ?? false);
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
      return (common.template ??= new Float64Array(2 * nBins));
    },
    get psd() {
      return psd;
    },
    weights,
    load(data, dataLength, given) {
      if (given) psd = given;
      else if (o.psd.kind === "model") psd = common.modelPsd ??= segmentPsd(o.psd, data, dataLength, o.sampleRate, n, o.fMinHz, o.truncationSamples, o.backend);
      else psd = segmentPsd(o.psd, data, dataLength, o.sampleRate, n, o.fMinHz, o.truncationSamples, o.backend);
      spec = computeSegmentSpectrum(data, psd, o.sampleRate, o.fMinHz, o.fMaxHz, realFft, buffers);
      fillSegmentWeights(spec, law, weights);
      return spec;
    },
    generate(t) {
      const out = (common.template ??= new Float64Array(2 * nBins));
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
    twin() {
      return segmentFilterOn(o, common, false);
    },
    dispose() {
      if (owner) bank.dispose();
    },
  };
}

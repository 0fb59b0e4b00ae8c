import { createComplexPlan, createRealFft } from "../fft/create.js";
import type { ComplexPlan, FftBackendName, RealFft } from "../fft/types.js";
import { computeSegmentSpectrum, type SegmentSpectrum } from "../filter/segmentSpectrum.js";
import { snrSeries } from "../filter/snrSeries.js";
import { createTaylorF2Generator, type TaylorF2Generator } from "../waveform/taylorf2.js";
import { segmentPsd } from "./segmentPsd.js";
import type { PsdSource, SearchTemplate } from "./types.js";

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
  /** The template buffer (h̃ at 1 Mpc on the segment's bins) of the last generated template. */
  readonly template: Float64Array;
  /** PSD (1/Hz) on the segment's bins from the last `load`. */
  readonly psd: Float64Array;
  /** Loads a segment (zero-padded to `size`): PSD, data spectrum weighted by 1/S. */
  load(data: Float64Array, dataLength: number): SegmentSpectrum;
  /** Writes h̃ of a template into `template`; returns kEnd. */
  generate(t: SearchTemplate): number;
  /** Generates and filters one template against the loaded segment; returns σ at 1 Mpc (0: no band). */
  filter(t: SearchTemplate): { sigma: number; kEnd: number };
  dispose(): void;
}

export interface SegmentFilterOptions {
  size: number;
  sampleRate: number;
  fMinHz: number;
  fMaxHz: number;
  psd: PsdSource;
  truncationSamples: number;
  backend: FftBackendName;
}

export function createSegmentFilter(o: SegmentFilterOptions): SegmentFilter {
  const n = o.size;
  const nBins = n / 2 + 1;
  const df = o.sampleRate / n;
  const realFft: RealFft = createRealFft(n, o.backend);
  const plan: ComplexPlan = createComplexPlan(n, o.backend);
  const generator: TaylorF2Generator = createTaylorF2Generator(nBins, df);
  const template = new Float64Array(2 * nBins);
  const buffers = { weighted: new Float64Array(n + 2), inversePsd: new Float64Array(nBins), spectrum: new Float64Array(n + 2) };
  const state = { dirtyEnd: 2 * n };
  let spec: SegmentSpectrum | null = null;
  let psd: Float64Array = new Float64Array(nBins);
  return {
    size: n,
    sampleRate: o.sampleRate,
    backend: plan.backend,
    get snr() {
      return plan.output;
    },
    template,
    get psd() {
      return psd;
    },
    load(data, dataLength) {
      psd = segmentPsd(o.psd, data, dataLength, o.sampleRate, n, o.fMinHz, o.truncationSamples);
      spec = computeSegmentSpectrum(data, psd, o.sampleRate, o.fMinHz, o.fMaxHz, realFft, buffers);
      return spec;
    },
    generate(t) {
      return generator.generate(template, o.fMinHz, t.primaryMass, t.secondaryMass, 1, o.fMaxHz);
    },
    filter(t) {
      const kEnd = generator.generate(template, o.fMinHz, t.primaryMass, t.secondaryMass, 1, o.fMaxHz);
      if (!spec) throw new Error("SegmentFilter.filter called before load");
      return { sigma: snrSeries(spec, template, kEnd, plan, state), kEnd };
    },
    dispose() {
      plan.dispose();
    },
  };
}

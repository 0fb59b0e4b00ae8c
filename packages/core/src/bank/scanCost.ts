// An estimate of what scanning an hour of data with a bank costs on this machine.
import { InputError } from "../errors.js";
import { resolveFftBackend } from "../fft/backends.js";
import { createComplexFft } from "../fft/create.js";
import { createTaylorF2Generator } from "../waveform/taylorf2.js";
import type { FftBackendName } from "../fft/types.js";

/** The measured cost of filtering one segment with one template. */
export interface TemplateCostMeasurement {
  /** Segment duration (s) and sample rate (Hz) assumed for the scan. */
  segmentSeconds: number;
  sampleRate: number;
  /** Complex inverse-FFT size (= segment samples). */
  fftSize: number;
  /** Median wall time (s) of one template generation + product + inverse FFT, over `repeats` runs. */
  secondsPerTemplateSegment: number;
  repeats: number;
  backend: FftBackendName;
  /** Segments per hour of data with half-overlapping segments: 3600 / (segmentSeconds / 2). */
  segmentsPerHour: number;
  /** One line saying how the figure was obtained. */
  method: string;
}

export interface TemplateCostOptions {
  /** Longest template duration (s): the segment is the next power of two ≥ 2× this (at least 8 s). */
  longestTemplateSeconds: number;
  /** Highest template frequency (Hz): the sample rate is the next power of two ≥ 2× this (at most 16384). */
  highestFrequencyHz: number;
  fMinHz: number;
  /** Timed runs (default 5; the median is kept). */
  repeats?: number;
  backend?: FftBackendName;
}

/**
 * Times, on this machine, what a scan repeats for every (template, segment) pair: generating a
 * TaylorF2 template on the segment's frequency grid, multiplying it into the data spectrum and one
 * complex inverse FFT of the segment length (createComplexFft). The cost of a search is dominated by
 * those inverse FFTs (templates × segments of them; design notes); the rest is small beside them.
 */
export function measureTemplateCost(options: TemplateCostOptions): TemplateCostMeasurement {
  const { longestTemplateSeconds, highestFrequencyHz, fMinHz } = options;
  const repeats = options.repeats ?? 5;
  const backend = options.backend ?? resolveFftBackend("auto");
  if (!(longestTemplateSeconds > 0)) throw new InputError(`scan cost: longestTemplateSeconds must be positive (got ${longestTemplateSeconds})`);
  if (!(highestFrequencyHz > fMinHz)) throw new InputError(`scan cost: highestFrequencyHz must exceed fMinHz`);
  if (!Number.isInteger(repeats) || repeats < 1) throw new InputError(`scan cost: repeats must be a positive integer (got ${repeats})`);
  const segmentSeconds = Math.max(8, Math.pow(2, Math.ceil(Math.log2(2 * longestTemplateSeconds))));
  const sampleRate = Math.min(16384, Math.pow(2, Math.ceil(Math.log2(2 * highestFrequencyHz))));
  const n = Math.round(segmentSeconds * sampleRate);
  const nBins = n / 2 + 1;
  const df = 1 / segmentSeconds;
  const fft = createComplexFft(n, backend);
  const gen = createTaylorF2Generator(nBins, df);
  const tmpl = new Float64Array(2 * nBins);
  const data = new Float64Array(2 * nBins);
  for (let k = 0; k < 2 * nBins; k++) data[k] = Math.sin(0.37 * k) * 1e-3;
  const prod = new Float64Array(2 * n);
  const out = new Float64Array(2 * n);
  const times: number[] = [];
  // One warm-up run, then the timed ones (masses vary a little so nothing is cached).
  for (let rep = -1; rep < repeats; rep++) {
    const t0 = performance.now();
    gen.generate(tmpl, fMinHz, 1.4 + 0.01 * rep, 1.3, 1, highestFrequencyHz);
    for (let k = 0; k < nBins; k++) {
      const ar = data[2 * k];
      const ai = data[2 * k + 1];
      const br = tmpl[2 * k];
      const bi = tmpl[2 * k + 1];
      prod[2 * k] = ar * br + ai * bi;
      prod[2 * k + 1] = ai * br - ar * bi;
    }
    fft.inverse(prod, out);
    const dt = (performance.now() - t0) / 1000;
    if (rep >= 0) times.push(dt);
  }
  times.sort((a, b) => a - b);
  const median = times[Math.floor(times.length / 2)];
  return {
    segmentSeconds,
    sampleRate,
    fftSize: n,
    secondsPerTemplateSegment: median,
    repeats,
    backend,
    segmentsPerHour: 3600 / (segmentSeconds / 2),
    method:
      `median of ${repeats} timed runs on this machine of one template generation + product + ${n}-point complex inverse FFT ` +
      `(${backend}; ${segmentSeconds} s segments at ${sampleRate} Hz, half-overlapping), one core, scaled by templates × segments per hour`,
  };
}

/** CPU seconds to scan one hour of data with `templates` templates: templates × segments/hour × cost. */
export function scanCpuSecondsPerHour(templates: number, cost: TemplateCostMeasurement): number {
  return templates * cost.segmentsPerHour * cost.secondsPerTemplateSegment;
}

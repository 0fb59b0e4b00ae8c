import type { ComplexPlan } from "../fft/types.js";
import type { SegmentSpectrum } from "./segmentSpectrum.js";

/**
 * Computes the complex matched-filter SNR series of one frequency-domain template (any waveform)
 * against one segment. The search itself uses the TaylorF2-specialised path (search/bankFilter.ts:
 * amplitude law folded into the segment weights, phase by recurrence), which is checked against
 * this general form in test/perf/fastPhase.test.ts. Output goes into `plan.output` (interleaved, N complex samples):
 *
 *   z[j] = (4 Δf / σ) Σ_{k=kLow}^{kEnd−1} d̃[k] h̃*[k] / S[k] · e^{+2πijk/N},
 *   σ² = 4 Δf Σ |h̃[k]|² / S[k],
 *
 * the discrete form of z(t) = 4 ∫₀^∞ d̃ h̃* / S e^{2πift} df normalised by σ = sqrt((h|h)).
 * In stationary Gaussian noise Re z and Im z are independent unit normals, so |z|² is χ² with
 * 2 degrees of freedom (e.g. Allen et al., Phys. Rev. D 85, 122006 (2012), Sec. IV). A template
 * that coalesces at t = 0 gives a peak at the sample where the signal in the data coalesces.
 *
 * Returns σ of the template as given (for a template at 1 Mpc, the effective distance of a peak
 * is σ/|z| Mpc). Returns 0 when the template has no power in the band (the output is then not
 * written). `state.dirtyEnd` tracks how much of the input holds old values so that only that part
 * is cleared: the caller passes the same state object for the same plan.
 */
export function snrSeries(
  spec: SegmentSpectrum,
  template: Float64Array,
  kEnd: number,
  plan: ComplexPlan,
  state: { dirtyEnd: number },
): number {
  const kLow = spec.kLow;
  const kStop = Math.min(kEnd, spec.kHigh);
  const inv = spec.inversePsd;
  const w = spec.weighted;
  let sum = 0;
  for (let k = kLow; k < kStop; k++) {
    const re = template[2 * k];
    const im = template[2 * k + 1];
    sum += (re * re + im * im) * inv[k];
  }
  const sigmaSq = 4 * spec.df * sum;
  if (!(sigmaSq > 0)) return 0;
  const sigma = Math.sqrt(sigmaSq);
  const norm = (4 * spec.df) / sigma;
  const input = plan.input;
  const clearTo = Math.max(state.dirtyEnd, 2 * kStop);
  for (let i = 0; i < 2 * kLow; i++) input[i] = 0;
  for (let i = 2 * kStop; i < clearTo; i++) input[i] = 0;
  for (let k = kLow; k < kStop; k++) {
    const hr = template[2 * k];
    const hi = template[2 * k + 1];
    const wr = w[2 * k];
    const wi = w[2 * k + 1];
    // w · conj(h)
    input[2 * k] = (wr * hr + wi * hi) * norm;
    input[2 * k + 1] = (wi * hr - wr * hi) * norm;
  }
  state.dirtyEnd = 2 * kStop;
  plan.inverse();
  return sigma;
}

import type { SegmentSpectrum } from "../filter/segmentSpectrum.js";

/**
 * What every TaylorF2 template shares in one segment, once the template's amplitude law
 * |h̃(f)| = A f^{−7/6} is taken out (waveform/taylorf2.ts): with w[k] = d̃[k]/S[k] the weighted
 * data spectrum,
 *
 *   u[k] = g · w[k] f_k^{−7/6},          C[k] = g² Σ_{j<k} f_j^{−7/3} / S[j],
 *
 * so that for a template with phase Ψ on the bins [k₀, k₁) the filter input is
 * w[k] h̃*[k] · 4Δf/σ = sqrt(4Δf / (C[k₁] − C[k₀])) · u[k] e^{iΨ(f_k)} and its norm
 * σ = A sqrt(4Δf (C[k₁] − C[k₀])) / g is O(1) per template (σ² = 4Δf Σ |h̃|²/S, as in
 * filter/snrSeries.ts). g = (Σ_band f^{−7/3}/S)^{−1/2} keeps u and C near unity so that u fits in
 * single precision whatever the units of the strain. Zero outside [kLow, kHigh).
 * The arrays may live in SharedArrayBuffers so that worker threads read them without copies.
 */
export interface SegmentWeights {
  /** Samples per segment N. */
  readonly size: number;
  /** Frequency resolution (Hz). */
  readonly df: number;
  /** u[k], interleaved complex, length N + 2. */
  readonly u: Float32Array;
  /** C[k] for k = 0..N/2 + 1 (length N/2 + 2); C[k] is constant outside the band. */
  readonly cumulative: Float64Array;
  /** The band of the last fill: first bin and one past the last. */
  kLow: number;
  kHigh: number;
  /** g of the last fill (0 when the band holds no finite-PSD bin). */
  scale: number;
}

/** Zeroed weights for segments of `size` samples; `shared` puts the arrays in SharedArrayBuffers. */
export function allocateSegmentWeights(size: number, sampleRate: number, shared: boolean): SegmentWeights {
  const nBins = size / 2 + 1;
  const Store = shared ? SharedArrayBuffer : ArrayBuffer;
  return {
    size,
    df: sampleRate / size,
    u: new Float32Array(new Store(4 * 2 * nBins)),
    cumulative: new Float64Array(new Store(8 * (nBins + 1))),
    kLow: 0,
    kHigh: 0,
    scale: 0,
  };
}

/**
 * f_k^{−7/6} for k = 0..nBins−1 (0 at k = 0): the template-independent power of f, computed once
 * per segment length.
 */
export function amplitudeLaw(nBins: number, df: number): Float64Array {
  const out = new Float64Array(nBins);
  for (let k = 1; k < nBins; k++) {
    const f = k * df;
    out[k] = 1 / (f * Math.sqrt(Math.cbrt(f)));
  }
  return out;
}

/**
 * Fills `out` from a loaded segment spectrum (its weighted spectrum and inverse PSD) and the
 * amplitude law of {@link amplitudeLaw} on the same grid. O(N), no allocation.
 */
export function fillSegmentWeights(spec: SegmentSpectrum, law: Float64Array, out: SegmentWeights): void {
  const { kLow, kHigh, weighted: w, inversePsd: inv } = spec;
  const u = out.u;
  const cum = out.cumulative;
  let total = 0;
  for (let k = kLow; k < kHigh; k++) total += law[k] * law[k] * inv[k];
  const g = total > 0 && Number.isFinite(total) ? 1 / Math.sqrt(total) : 0;
  const g2 = g * g;
  u.fill(0, 0, 2 * kLow);
  u.fill(0, 2 * kHigh);
  cum.fill(0, 0, kLow + 1);
  let acc = 0;
  for (let k = kLow; k < kHigh; k++) {
    const a = law[k] * g;
    u[2 * k] = w[2 * k] * a;
    u[2 * k + 1] = w[2 * k + 1] * a;
    acc += law[k] * law[k] * inv[k] * g2;
    cum[k + 1] = acc;
  }
  cum.fill(acc, kHigh + 1);
  out.kLow = kLow;
  out.kHigh = kHigh;
  out.scale = g;
}

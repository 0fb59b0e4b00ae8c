import { InputError } from "../errors.js";
import { taylorF2FrequencySeriesInto } from "./taylorf2.js";

/**
 * Multiplies a complex frequency series by the conjugate TaylorF2 phase factor e^{+iΨ(f)} of one
 * template, bin by bin, at a few floating-point operations per bin and no transcendental call per
 * bin: the search's fast path for w[k]·h̃*[k] (h̃ = A f^{−7/6} e^{−iΨ}; see waveform/taylorf2.ts).
 */
export interface TaylorF2Phasor {
  readonly dfHz: number;
  /** Twice the PN order of the phase (0..7). */
  readonly pnOrder: number;
  /** Bound (rad) on |Ψ_fast(f_k) − Ψ(f_k)| that sets the block lengths. */
  readonly maxPhaseError: number;
  /**
   * out[k] = scale · u[k] · e^{+iΨ(k·dfHz)} for kFrom ≤ k < kTo (interleaved complex arrays; other
   * bins untouched), Ψ the TaylorF2 phase of {@link taylorF2FrequencySeriesInto} (t_c = 0, φ_c = 0,
   * including the −π/4; aligned spins chi1, chi2 ∈ (−1, 1), default 0). kFrom ≥ 1. No allocation.
   * `u` and `out` may be the same array.
   */
  multiply(
    u: Float32Array | Float64Array,
    out: Float32Array | Float64Array,
    kFrom: number,
    kTo: number,
    m1Solar: number,
    m2Solar: number,
    scale: number,
    chi1?: number,
    chi2?: number,
  ): void;
  /**
   * The template itself by the same fast phase: out[k] = scale · amplitude[k] · e^{−iΨ(k·dfHz)}
   * for kFrom ≤ k < kTo (amplitude real, indexed by bin; out interleaved; other bins untouched).
   * With amplitude[k] = f_k^{−7/6} and scale = A this is h̃ of {@link taylorF2Into} to within the
   * phase bound. No allocation.
   */
  template(
    amplitude: Float64Array,
    out: Float64Array,
    kFrom: number,
    kTo: number,
    m1Solar: number,
    m2Solar: number,
    scale: number,
    chi1?: number,
    chi2?: number,
  ): void;
}

/** Default phase-error bound (rad): the mismatch it can cause is below ε²/2 = 2e-6. */
export const DEFAULT_PHASOR_PHASE_ERROR = 2e-3;

/** Longest half-block (bins); beyond it the per-block cost is negligible anyway. */
const MAX_HALF_BLOCK = 2048;
const QUARTER_PI = Math.PI / 4;

/**
 * Piecewise-quadratic phase by recurrence. The band is cut into blocks of 2h bins; in each block
 * Ψ is evaluated exactly at its start, middle and end (bins k₀, k₀+h, k₀+2h), the quadratic
 * P(j) = p₀ + p₁ j + p₂ j² through those three values replaces Ψ(k₀+j), and e^{iP(j)} is produced
 * by two complex multiplications per bin (z ← z·r, r ← r·e^{2ip₂}, with r_j = e^{i(p₁ + p₂(2j+1))}),
 * so only 3 cos/sin pairs are taken per block. The Lagrange remainder of quadratic interpolation
 * through equally spaced nodes, Ψ‴(ξ)/3! · j(j−h)(j−2h), bounds |Ψ(k₀+j) − P(j)| by
 * max|Ψ‴| h³ / (9√3) in bin units (standard numerical analysis; common practice, no source).
 * h is chosen per block from the Newtonian term Ψ ≈ c₀ f^{−5/3}, whose third derivative
 * (440/27)|c₀| f^{−14/3} falls with f so a block's first bin is its worst, with a safety factor
 * 1.5 for the PN corrections. Each block restarts from exact values, so errors do not accumulate
 * across blocks; within a block the recurrence adds rounding of ~1e-16 per step.
 * Accuracy against the exact template (match ≥ 0.9999): test/perf/fastPhase.test.ts.
 */
export function createTaylorF2Phasor(
  dfHz: number,
  options: { pnOrder?: number; maxPhaseError?: number } = {},
): TaylorF2Phasor {
  if (!(dfHz > 0) || !Number.isFinite(dfHz)) throw new InputError(`createTaylorF2Phasor: dfHz must be a positive number (got ${dfHz})`);
  const pnOrder = options.pnOrder ?? 7;
  const maxPhaseError = options.maxPhaseError ?? DEFAULT_PHASOR_PHASE_ERROR;
  if (!(maxPhaseError > 0) || !Number.isFinite(maxPhaseError)) {
    throw new InputError(`createTaylorF2Phasor: maxPhaseError must be a positive number of radians (got ${maxPhaseError})`);
  }
  const c = new Float64Array(8);
  const d = new Float64Array(8);
  /** Walks the band block by block; mode 0 writes scale·u·e^{+iΨ}, mode 1 scale·amplitude·e^{−iΨ}. */
  function run(
    mode: 0 | 1,
    src: Float32Array | Float64Array,
    out: Float32Array | Float64Array,
    kFrom: number,
    kTo: number,
    m1Solar: number,
    m2Solar: number,
    scale: number,
    chi1: number,
    chi2: number,
  ): void {
    taylorF2FrequencySeriesInto(m1Solar, m2Solar, pnOrder, c, d, chi1, chi2);
    if (!(kFrom >= 1) || kTo <= kFrom) return;
    // max|Ψ‴| over a block starting at f, in rad/bin³: 1.5 · (440/27)|c₀| f^{−14/3} df³, so
    // max|Ψ‴| h³ / (9√3) ≤ ε  ⇔  h ≤ hScale · f^{14/9}.
    const third = 1.5 * (440 / 27) * Math.abs(c[0]) * dfHz * dfHz * dfHz;
    const hScale = third > 0 ? Math.cbrt((9 * Math.sqrt(3) * maxPhaseError) / third) : Infinity;
    let k = kFrom;
    let psi0 = phaseAtBin(k, dfHz, c, d);
    while (k < kTo) {
      const remaining = kTo - k;
      let h = Math.floor(hScale * Math.pow(k * dfHz, 14 / 9));
      if (!(h >= 1)) h = 1;
      if (h > MAX_HALF_BLOCK) h = MAX_HALF_BLOCK;
      if (2 * h > remaining) h = Math.ceil(remaining / 2);
      const count = Math.min(2 * h, remaining);
      const psiMid = phaseAtBin(k + h, dfHz, c, d);
      const psi1 = phaseAtBin(k + 2 * h, dfHz, c, d);
      const p2 = (psi0 - 2 * psiMid + psi1) / (2 * h * h);
      const p1 = (psi1 - psi0) / (2 * h) - 2 * h * p2;
      const zr = scale * Math.cos(psi0);
      const zi = scale * Math.sin(psi0);
      const rr = Math.cos(p1 + p2);
      const ri = Math.sin(p1 + p2);
      const qr = Math.cos(2 * p2);
      const qi = Math.sin(2 * p2);
      if (mode === 0) productBlock(src, out, k, count, zr, zi, rr, ri, qr, qi);
      else templateBlock(src, out, k, count, zr, zi, rr, ri, qr, qi);
      k += count;
      psi0 = psi1;
    }
  }
  return {
    dfHz,
    pnOrder,
    maxPhaseError,
    multiply(u, out, kFrom, kTo, m1Solar, m2Solar, scale, chi1 = 0, chi2 = 0) {
      run(0, u, out, kFrom, kTo, m1Solar, m2Solar, scale, chi1, chi2);
    },
    template(amplitude, out, kFrom, kTo, m1Solar, m2Solar, scale, chi1 = 0, chi2 = 0) {
      run(1, amplitude, out, kFrom, kTo, m1Solar, m2Solar, scale, chi1, chi2);
    },
  };
}

/**
 * out[k] = u[k] · z_j for j = 0..count−1, k = k₀ + j, where z_0 = (zr, zi), z_{j+1} = z_j r_j,
 * r_0 = (rr, ri), r_{j+1} = r_j q: the quadratic-phase recurrence of createTaylorF2Phasor.
 */
function productBlock(
  u: Float32Array | Float64Array,
  out: Float32Array | Float64Array,
  k0: number,
  count: number,
  zr: number,
  zi: number,
  rr: number,
  ri: number,
  qr: number,
  qi: number,
): void {
  const stop = 2 * (k0 + count);
  for (let i = 2 * k0; i < stop; i += 2) {
    const ur = u[i];
    const ui = u[i + 1];
    out[i] = ur * zr - ui * zi;
    out[i + 1] = ur * zi + ui * zr;
    const t = zr * rr - zi * ri;
    zi = zr * ri + zi * rr;
    zr = t;
    const s = rr * qr - ri * qi;
    ri = rr * qi + ri * qr;
    rr = s;
  }
}

/** out[k] = a[k] · conj(z_j), the same recurrence as {@link productBlock} with a real amplitude. */
function templateBlock(
  a: Float32Array | Float64Array,
  out: Float32Array | Float64Array,
  k0: number,
  count: number,
  zr: number,
  zi: number,
  rr: number,
  ri: number,
  qr: number,
  qi: number,
): void {
  const stop = k0 + count;
  for (let k = k0; k < stop; k++) {
    const m = a[k];
    out[2 * k] = m * zr;
    out[2 * k + 1] = -m * zi;
    const t = zr * rr - zi * ri;
    zi = zr * ri + zi * rr;
    zr = t;
    const s = rr * qr - ri * qi;
    ri = rr * qi + ri * qr;
    rr = s;
  }
}

/**
 * Ψ(k·df) = −π/4 + f^{−5/3} Σ_j (c_j + d_j ln f) f^{j/3} (taylorF2FrequencySeriesInto; only the
 * 2.5PN and 3PN terms carry ln f).
 */
function phaseAtBin(k: number, dfHz: number, c: Float64Array, d: Float64Array): number {
  const f = k * dfHz;
  const x = Math.cbrt(f);
  const lf = Math.log(f);
  const s = c[0] + x * (c[1] + x * (c[2] + x * (c[3] + x * (c[4] + x * (c[5] + d[5] * lf + x * (c[6] + d[6] * lf + x * c[7]))))));
  return s / (f * x * x) - QUARTER_PI;
}

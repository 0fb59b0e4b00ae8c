import type { Trigger } from "./peaks.js";

/** Half-width (samples of the reduced series) of the interpolation kernel. */
export const INTERPOLATION_HALF_WIDTH = 24;

/**
 * Kaiser window shape parameter for 80 dB stop-band attenuation, β = 0.1102 (A − 8.7)
 * (Kaiser, "Nonrecursive digital filter design using the I0-sinh window function", Proc. IEEE
 * ISCAS 1974; from memory, as quoted in Oppenheim & Schafer, Discrete-Time Signal Processing,
 * Eq. 7.62). With a transition band of 1/8 of the reduced rate (RATE_GUARD = 7/8 of the bins
 * occupied), 80 dB needs ≈ (A − 7.95)/(14.36 · 0.125) ≈ 41 taps (ibid., Eq. 7.63); 48 are used.
 */
const KAISER_BETA = 0.1102 * (80 - 8.7);

/** Modified Bessel function I0(x) by its power series Σ ((x/2)^k / k!)² (Abramowitz & Stegun 9.6.12). */
function besselI0(x: number): number {
  const q = 0.25 * x * x;
  let term = 1;
  let sum = 1;
  for (let k = 1; k < 60; k++) {
    term *= q / (k * k);
    sum += term;
    if (term < 1e-17 * sum) break;
  }
  return sum;
}

const I0_BETA = besselI0(KAISER_BETA);

/** A reduced-rate complex SNR series and what its interpolation needs. */
export interface ReducedSeries {
  /** z at every `factor`-th sample of the full-rate series (interleaved, `length` samples, periodic). */
  series: Float32Array | Float64Array;
  length: number;
  /** Full-rate samples per reduced sample, N/M. */
  factor: number;
  /** Centre of the template's band in bins of the reduced grid (the band lies within ±RATE_GUARD·M/2 of it). */
  centreBin: number;
}

/** Scratch for one evaluation (no allocation per call). */
const point = { re: 0, im: 0 };

/**
 * z at full-rate sample j from the reduced series, by band-limited interpolation: the series is
 * shifted to baseband by the band centre c, interpolated with a Kaiser-windowed sinc (cut-off at
 * half the reduced rate, which passes the band, within ±RATE_GUARD/2 of the rate, and stops its
 * periodic images, ≥ 1 − RATE_GUARD/2 away) and shifted back. Samples on the reduced grid are
 * returned as they are. Writes `point`.
 */
function valueAt(r: ReducedSeries, j: number): void {
  const y = r.series;
  const m = r.length;
  const d = r.factor;
  const rem = j % d;
  const m0 = (j - rem) / d;
  if (rem === 0) {
    const i = 2 * (((m0 % m) + m) % m);
    point.re = y[i];
    point.im = y[i + 1];
    return;
  }
  const x0 = rem / d; // position past reduced sample m0, in (0, 1)
  const w = INTERPOLATION_HALF_WIDTH;
  const omega = (2 * Math.PI * r.centreBin) / m;
  // Kernel at x = x0 − i, i = −w+1..w: sinc(x) · Kaiser(x/w) · e^{iωx}.
  const sinPiX0 = Math.sin(Math.PI * x0);
  // e^{iω(x0 − i)} starting at i = −w + 1, rotated by e^{−iω} per step.
  let er = Math.cos(omega * (x0 + w - 1));
  let ei = Math.sin(omega * (x0 + w - 1));
  const sr = Math.cos(omega);
  const si = -Math.sin(omega);
  let accRe = 0;
  let accIm = 0;
  for (let i = -w + 1; i <= w; i++) {
    const x = x0 - i;
    const sinc = ((i & 1) === 0 ? sinPiX0 : -sinPiX0) / (Math.PI * x);
    const u = x / w;
    const kw = besselI0(KAISER_BETA * Math.sqrt(Math.max(0, 1 - u * u))) / I0_BETA;
    const h = sinc * kw;
    const idx = 2 * ((((m0 + i) % m) + m) % m);
    const yr = y[idx];
    const yi = y[idx + 1];
    // y · h · e^{iωx}
    const kr = h * er;
    const ki = h * ei;
    accRe += yr * kr - yi * ki;
    accIm += yr * ki + yi * kr;
    const ner = er * sr - ei * si;
    ei = er * si + ei * sr;
    er = ner;
  }
  point.re = accRe;
  point.im = accIm;
}

/** |z|² at full-rate sample j (see valueAt). */
function powerAt(r: ReducedSeries, j: number): number {
  valueAt(r, j);
  return point.re * point.re + point.im * point.im;
}

/**
 * The windowed peaks of {@link findWindowPeaks} (filter/peaks.ts) — in samples [start, end) of
 * the full-rate series, the loudest sample of each window of `window` samples aligned to `start`
 * whose |z| exceeds `threshold` — found from a reduced-rate series: each window's loudest reduced
 * sample above `seedThreshold` (lower than `threshold`, to allow for the peak falling between
 * reduced samples) seeds a climb over full-rate samples inside the window, starting where a
 * parabola through the three reduced samples puts the peak and stepping to the larger neighbour
 * until neither is larger. The trigger reports the full-rate index, z there and |z| at its two
 * full-rate neighbours, exactly as the full-rate finder does. The work per window without a seed
 * is the reduced samples' |z|² alone.
 */
export function findBandLimitedPeaks(
  r: ReducedSeries,
  start: number,
  end: number,
  threshold: number,
  seedThreshold: number,
  window: number,
  templateIndex: number,
  out: Trigger[],
): void {
  const y = r.series;
  const m = r.length;
  const d = r.factor;
  const thr2 = threshold * threshold;
  const seed2 = seedThreshold * seedThreshold;
  for (let w0 = start; w0 < end; w0 += window) {
    const wEnd = Math.min(end, w0 + window);
    // Reduced samples from the one at or before the window's start to the one at or after its end.
    const mA = Math.floor(w0 / d);
    const mB = Math.ceil((wEnd - 1) / d);
    let best = -1;
    let bestP = seed2;
    for (let mi = mA; mi <= mB; mi++) {
      const i = 2 * (mi % m);
      const p = y[i] * y[i] + y[i + 1] * y[i + 1];
      if (p > bestP) {
        bestP = p;
        best = mi;
      }
    }
    if (best < 0) continue;
    // Parabola through |z| at the reduced samples around the seed.
    const ib = 2 * (((best - 1) % m + m) % m);
    const ia = 2 * ((best + 1) % m);
    const yb = Math.hypot(y[ib], y[ib + 1]);
    const y0 = Math.sqrt(bestP);
    const ya = Math.hypot(y[ia], y[ia + 1]);
    const denom = yb - 2 * y0 + ya;
    let offset = denom < 0 ? (0.5 * (yb - ya)) / denom : 0;
    if (offset > 1) offset = 1;
    else if (offset < -1) offset = -1;
    let j = Math.round((best + offset) * d);
    if (j < w0) j = w0;
    else if (j >= wEnd) j = wEnd - 1;
    let p0 = powerAt(r, j);
    let pb = powerAt(r, j - 1);
    let pa = powerAt(r, j + 1);
    // Climb to a local maximum of the full-rate samples inside the window (at most 2d steps).
    for (let steps = 0; steps < 2 * d; steps++) {
      if (pb > p0 && j - 1 >= w0 && pb >= pa) {
        pa = p0;
        p0 = pb;
        j--;
        pb = powerAt(r, j - 1);
      } else if (pa > p0 && j + 1 < wEnd) {
        pb = p0;
        p0 = pa;
        j++;
        pa = powerAt(r, j + 1);
      } else break;
    }
    if (!(p0 > thr2)) continue;
    valueAt(r, j);
    out.push({ index: j, snr: Math.sqrt(p0), re: point.re, im: point.im, before: Math.sqrt(pb), after: Math.sqrt(pa), templateIndex });
  }
}

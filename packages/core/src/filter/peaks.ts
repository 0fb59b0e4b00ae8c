/** A local maximum of |z| in one template's SNR series. */
export interface Trigger {
  /** Sample index in the segment. */
  index: number;
  /** |z| at that sample. */
  snr: number;
  /** z at that sample. */
  re: number;
  im: number;
  /** |z| at the neighbouring samples (for sub-sample interpolation); 0 at an edge. */
  before: number;
  after: number;
  templateIndex: number;
}

/**
 * Finds, in samples [start, end) of a complex SNR series (interleaved), the loudest sample of each
 * window of `window` samples (windows aligned to `start`; the first of equal maxima) whose |z|
 * exceeds `threshold`, and appends them to `out`. Each sample is read once and |z|² is compared, so
 * no square root is taken below threshold; the samples are taken four at a time and examined one by
 * one only when one of the four exceeds the window's running maximum (rare in noise above a
 * detection threshold), ~⅓ faster than one per step. The plain one-sample-per-step definition is
 * the reference in test/filter/peaks.test.ts. (Windowed maximum clustering: common practice, no source.)
 */
export function findWindowPeaks(
  z: Float32Array | Float64Array,
  start: number,
  end: number,
  threshold: number,
  window: number,
  templateIndex: number,
  out: Trigger[],
): void {
  const thr2 = threshold * threshold;
  const n = z.length >> 1;
  for (let w0 = start; w0 < end; w0 += window) {
    const stop = 2 * Math.min(end, w0 + window);
    let best = -1;
    let bestP = thr2;
    let i = 2 * w0;
    for (; i + 8 <= stop; i += 8) {
      const a0 = z[i], a1 = z[i + 1], b0 = z[i + 2], b1 = z[i + 3];
      const c0 = z[i + 4], c1 = z[i + 5], d0 = z[i + 6], d1 = z[i + 7];
      const pa = a0 * a0 + a1 * a1;
      const pb = b0 * b0 + b1 * b1;
      const pc = c0 * c0 + c1 * c1;
      const pd = d0 * d0 + d1 * d1;
      if (pa > bestP || pb > bestP || pc > bestP || pd > bestP) {
        // In order, so that the first of equal maxima wins, as one sample per step would.
        if (pa > bestP) {
          bestP = pa;
          best = i;
        }
        if (pb > bestP) {
          bestP = pb;
          best = i + 2;
        }
        if (pc > bestP) {
          bestP = pc;
          best = i + 4;
        }
        if (pd > bestP) {
          bestP = pd;
          best = i + 6;
        }
      }
    }
    for (; i < stop; i += 2) {
      const re = z[i];
      const im = z[i + 1];
      const p = re * re + im * im;
      if (p > bestP) {
        bestP = p;
        best = i;
      }
    }
    if (best >= 0) {
      const j = best >> 1;
      out.push({
        index: j,
        snr: Math.sqrt(bestP),
        re: z[best],
        im: z[best + 1],
        before: j > 0 ? Math.hypot(z[best - 2], z[best - 1]) : 0,
        after: j + 1 < n ? Math.hypot(z[best + 2], z[best + 3]) : 0,
        templateIndex,
      });
    }
  }
}

/**
 * Sub-sample offset (in samples, within ±0.5) and peak value of a parabola through three
 * equally spaced values y₋, y₀, y₊ with y₀ the largest (common practice, no source).
 */
export function parabolicPeak(yBefore: number, y0: number, yAfter: number): { offset: number; value: number } {
  const denom = yBefore - 2 * y0 + yAfter;
  if (!(denom < 0) || yBefore === 0 || yAfter === 0) return { offset: 0, value: y0 };
  let offset = (0.5 * (yBefore - yAfter)) / denom;
  if (offset > 0.5) offset = 0.5;
  else if (offset < -0.5) offset = -0.5;
  return { offset, value: y0 - 0.25 * (yBefore - yAfter) * offset };
}

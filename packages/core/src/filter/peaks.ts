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
 * Finds, in samples [start, end) of a complex SNR series (interleaved), the loudest sample of
 * each window of `window` samples (windows aligned to `start`) whose |z| exceeds `threshold`, and
 * appends them to `out`. Touches each sample once and compares |z|² so no square root is taken
 * below threshold. (Windowed maximum clustering: common practice, no source.)
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
    const w1 = Math.min(end, w0 + window);
    let best = -1;
    let bestP = thr2;
    for (let j = w0; j < w1; j++) {
      const re = z[2 * j];
      const im = z[2 * j + 1];
      const p = re * re + im * im;
      if (p > bestP) {
        bestP = p;
        best = j;
      }
    }
    if (best >= 0) {
      const jb = best > 0 ? best - 1 : -1;
      const ja = best + 1 < n ? best + 1 : -1;
      out.push({
        index: best,
        snr: Math.sqrt(bestP),
        re: z[2 * best],
        im: z[2 * best + 1],
        before: jb >= 0 ? Math.hypot(z[2 * jb], z[2 * jb + 1]) : 0,
        after: ja >= 0 ? Math.hypot(z[2 * ja], z[2 * ja + 1]) : 0,
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

/**
 * Time slides on a ring. The analysed span [start, start + L) is treated as a ring: a trigger at
 * ring time t (s since the start) moved by a shift s lands at (t + s) mod L, so every slide keeps
 * all the triggers and all the livetime. In slide k (k = ±1, ±2, …, ±K; k = 0 is the foreground)
 * the site at position j of the network list (j = 0 is the reference site, never moved) is moved
 * by k · j · step: with two sites the second slides by k · step; with three, the second by k · step
 * and the third by 2k · step, so every pair of sites is offset by a non-zero multiple of the step
 * in every slide (the usual scheme of fixed multiples per site; common practice, no source).
 */
export function slideShiftSeconds(slide: number, sitePosition: number, stepSeconds: number): number {
  return slide * sitePosition * stepSeconds;
}

/**
 * Largest K for which slides ±1…±K of {@link slideShiftSeconds} are all distinct on a ring of
 * `ringSeconds` and every relative shift between two sites stays at least one step away from zero
 * (mod L): the largest relative shift between two slides is 2K (N − 1) step, so
 * K = ⌊(L − step) / (2 (N − 1) step)⌋ for N sites.
 */
export function maxSlidesPerSide(ringSeconds: number, stepSeconds: number, siteCount: number): number {
  if (!(ringSeconds > stepSeconds) || siteCount < 2) return 0;
  return Math.max(0, Math.floor((ringSeconds - stepSeconds) / (2 * (siteCount - 1) * stepSeconds)));
}

/**
 * Moves ascending ring times by `shiftSeconds` on a ring of length `ringSeconds`: writes the moved
 * times, again ascending, to `outTimes` and, for each, the index of the original trigger to
 * `outIndex`. The shift is a rotation of the sorted order, so no sort is needed. `times` must be
 * ascending and inside [0, ringSeconds).
 */
export function slideOnRing(
  times: Float64Array,
  shiftSeconds: number,
  ringSeconds: number,
  outTimes: Float64Array,
  outIndex: Int32Array,
): void {
  const n = times.length;
  let s = shiftSeconds % ringSeconds;
  if (s < 0) s += ringSeconds;
  // First index whose moved time wraps past the end of the ring.
  const edge = ringSeconds - s;
  let lo = 0;
  let hi = n;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (times[mid] < edge) lo = mid + 1;
    else hi = mid;
  }
  let w = 0;
  for (let i = lo; i < n; i++, w++) {
    let t = times[i] + s - ringSeconds;
    if (t < 0) t = 0;
    outTimes[w] = t;
    outIndex[w] = i;
  }
  for (let i = 0; i < lo; i++, w++) {
    let t = times[i] + s;
    if (t >= ringSeconds) t = ringSeconds * (1 - Number.EPSILON);
    outTimes[w] = t;
    outIndex[w] = i;
  }
}

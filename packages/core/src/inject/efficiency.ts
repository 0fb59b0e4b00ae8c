import { InputError } from "../errors.js";

/** A binomial proportion with its confidence interval. */
export interface BinomialEstimate {
  found: number;
  total: number;
  /** found / total (null when total is 0). */
  efficiency: number | null;
  lower: number | null;
  upper: number | null;
}

/** The interval used for every efficiency error bar (see {@link wilsonInterval}). */
export const EFFICIENCY_INTERVAL = "Wilson score interval, z = 1 (68.3%)";

/**
 * Wilson score interval of a binomial proportion k/n (Wilson, J. Am. Stat. Assoc. 22, 209 (1927)):
 * centre (p̂ + z²/2n)/(1 + z²/n), half-width z/(1 + z²/n) · sqrt(p̂(1 − p̂)/n + z²/4n²), p̂ = k/n.
 * Unlike the normal approximation it stays inside [0, 1] and is not empty at k = 0 or k = n.
 * z = 1 gives the 68.3% interval used for error bars here.
 */
export function wilsonInterval(found: number, total: number, z = 1): BinomialEstimate {
  if (!Number.isInteger(total) || total < 0) throw new InputError(`total must be a non-negative integer (got ${total})`);
  if (!Number.isInteger(found) || found < 0 || found > total) throw new InputError(`found must be an integer in [0, total] (got ${found})`);
  if (!(z > 0)) throw new InputError(`z must be positive (got ${z})`);
  if (total === 0) return { found, total, efficiency: null, lower: null, upper: null };
  const p = found / total;
  const z2n = (z * z) / total;
  const centre = (p + z2n / 2) / (1 + z2n);
  const half = (z / (1 + z2n)) * Math.sqrt((p * (1 - p)) / total + (z * z) / (4 * total * total));
  // Exact ends at k = 0 and k = n (the formula gives them up to rounding).
  const lower = found === 0 ? 0 : Math.max(0, centre - half);
  const upper = found === total ? 1 : Math.min(1, centre + half);
  return { found, total, efficiency: p, lower, upper };
}

/** One bin of an efficiency curve: [low, high) of some quantity (the last bin includes high). */
export interface EfficiencyBin extends BinomialEstimate {
  low: number;
  high: number;
}

/**
 * Bins (x_i, found_i) by the edges e_0 < e_1 < … < e_m into [e_j, e_{j+1}) (the last bin closed)
 * and gives each bin's found fraction with its Wilson interval ({@link wilsonInterval}); points
 * outside [e_0, e_m] are left out. Empty bins are kept (efficiency null).
 */
export function binnedEfficiency(x: ArrayLike<number>, found: ArrayLike<boolean>, edges: readonly number[], z = 1): EfficiencyBin[] {
  if (x.length !== found.length) throw new InputError(`binnedEfficiency: x and found differ in length (${x.length} vs ${found.length})`);
  if (edges.length < 2) throw new InputError("binnedEfficiency: need at least two bin edges");
  for (let j = 1; j < edges.length; j++) {
    if (!(edges[j] > edges[j - 1])) throw new InputError("binnedEfficiency: bin edges must increase");
  }
  const m = edges.length - 1;
  const k = new Array<number>(m).fill(0);
  const n = new Array<number>(m).fill(0);
  for (let i = 0; i < x.length; i++) {
    const v = x[i];
    if (!(v >= edges[0] && v <= edges[m])) continue;
    let j = 0;
    while (j < m - 1 && v >= edges[j + 1]) j++;
    n[j]++;
    if (found[i]) k[j]++;
  }
  return k.map((kj, j) => ({ low: edges[j], high: edges[j + 1], ...wilsonInterval(kj, n[j], z) }));
}

/**
 * Bin edges for an efficiency curve over [min, max]: whole numbers from floor(min) to ceil(max)
 * in steps of a whole number chosen to give at most `maxBins` bins (common practice, no source).
 */
export function integerBinEdges(min: number, max: number, maxBins = 20): number[] {
  if (!Number.isFinite(min) || !Number.isFinite(max) || max < min) throw new InputError(`integerBinEdges: need finite min ≤ max (got ${min}, ${max})`);
  const lo = Math.floor(min);
  let hi = Math.ceil(max);
  if (hi === lo) hi = lo + 1;
  const step = Math.max(1, Math.ceil((hi - lo) / maxBins));
  const edges: number[] = [];
  for (let e = lo; e < hi; e += step) edges.push(e);
  edges.push(edges[edges.length - 1] + step);
  return edges;
}

/** `bins` equal-width bin edges over [min, max]. */
export function linearBinEdges(min: number, max: number, bins: number): number[] {
  if (!Number.isFinite(min) || !Number.isFinite(max) || !(max > min)) throw new InputError(`linearBinEdges: need finite min < max (got ${min}, ${max})`);
  if (!Number.isInteger(bins) || bins < 1) throw new InputError(`linearBinEdges: bins must be a positive integer (got ${bins})`);
  return Array.from({ length: bins + 1 }, (_, j) => (j === bins ? max : min + ((max - min) * j) / bins));
}

/**
 * Where a binned efficiency curve crosses 50%, by linear interpolation in efficiency between
 * the centres of neighbouring non-empty bins (common practice, no source). `direction` "falling"
 * finds the first bin pair going from ≥ 0.5 to < 0.5 (efficiency against distance); "rising" the
 * first going from < 0.5 to ≥ 0.5 (against SNR). Null when the curve does not cross in range.
 */
export function fiftyPercentCrossing(bins: readonly EfficiencyBin[], direction: "rising" | "falling"): number | null {
  const pts = bins.filter((b) => b.efficiency !== null).map((b) => ({ x: (b.low + b.high) / 2, e: b.efficiency as number }));
  for (let j = 1; j < pts.length; j++) {
    const a = pts[j - 1];
    const b = pts[j];
    const crosses = direction === "falling" ? a.e >= 0.5 && b.e < 0.5 : a.e < 0.5 && b.e >= 0.5;
    if (crosses) return a.x + ((0.5 - a.e) / (b.e - a.e)) * (b.x - a.x);
  }
  return null;
}

/** Median and 5%/95% quantiles of a sample, and the median of its absolute values. */
export interface ErrorSpread {
  median: number;
  p05: number;
  p95: number;
  medianAbsolute: number;
}

/**
 * Quantile q of a sample by linear interpolation between order statistics at position
 * (n − 1)·q (Hyndman & Fan, Am. Stat. 50, 361 (1996), definition 7).
 */
export function quantile(values: readonly number[], q: number): number {
  if (values.length === 0) throw new InputError("quantile: the sample is empty");
  if (!(q >= 0 && q <= 1)) throw new InputError(`quantile: q must be in [0, 1] (got ${q})`);
  const s = [...values].sort((a, b) => a - b);
  const h = (s.length - 1) * q;
  const i = Math.floor(h);
  return i + 1 < s.length ? s[i] + (h - i) * (s[i + 1] - s[i]) : s[i];
}

/** {@link ErrorSpread} of a sample, or null when it is empty. */
export function errorSpread(values: readonly number[]): ErrorSpread | null {
  if (values.length === 0) return null;
  return {
    median: quantile(values, 0.5),
    p05: quantile(values, 0.05),
    p95: quantile(values, 0.95),
    medianAbsolute: quantile(values.map(Math.abs), 0.5),
  };
}

/** How the distances of a population were drawn. */
export type DistanceDistribution = "volume" | "uniform";

/**
 * Monte Carlo estimate of the sensitive volume V = ∫ ε(r) 4πr² dr (Mpc³) from injections whose
 * distances were drawn from a known density p(r) on [rMin, rMax]: V ≈ (1/N) Σ_i found_i ·
 * 4π r_i² / p(r_i) (importance sampling), plus the ball inside rMin counted as fully efficient.
 * For p uniform in volume the weight is (4π/3)(rMax³ − rMin³) for every injection; for p uniform
 * in distance it is 4π r_i² (rMax − rMin). The standard error is sqrt(Var(w·found) / N).
 * (Monte Carlo integration with importance sampling; e.g. Press et al., Numerical Recipes, 3rd ed.,
 * Sec. 7.9.)
 */
export function sensitiveVolume(
  distancesMpc: readonly number[],
  found: readonly boolean[],
  rangeMpc: readonly [number, number],
  distribution: DistanceDistribution,
): { volumeMpc3: number; errorMpc3: number } | null {
  const n = distancesMpc.length;
  if (n === 0) return null;
  if (found.length !== n) throw new InputError(`sensitiveVolume: distances and found differ in length (${n} vs ${found.length})`);
  const [lo, hi] = rangeMpc;
  if (!(lo >= 0) || !(hi > lo)) throw new InputError(`sensitiveVolume: need 0 ≤ rMin < rMax (got ${lo}, ${hi})`);
  let sum = 0;
  let sum2 = 0;
  for (let i = 0; i < n; i++) {
    const r = distancesMpc[i];
    const w = distribution === "volume" ? ((4 * Math.PI) / 3) * (hi ** 3 - lo ** 3) : 4 * Math.PI * r * r * (hi - lo);
    const v = found[i] ? w : 0;
    sum += v;
    sum2 += v * v;
  }
  const mean = sum / n;
  const variance = Math.max(0, sum2 / n - mean * mean);
  return { volumeMpc3: ((4 * Math.PI) / 3) * lo ** 3 + mean, errorMpc3: Math.sqrt(variance / n) };
}

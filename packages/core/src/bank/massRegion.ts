// The region of non-spinning binaries a bank must cover, described in chirp-time coordinates.
import { InputError, parameterError } from "../errors.js";
import { chirpTimesFromComponents, chirpTimesFromMassEta, componentsFromMassEta, massEtaFromChirpTimes } from "./chirpTimeCoordinates.js";
import { T_SUN } from "../physics/constants.js";

/** Limits of the component masses, solar masses (m1 ≥ m2 by convention). */
export interface MassRegionLimits {
  /** Lightest and heaviest component mass. */
  minMassSolar: number;
  maxMassSolar: number;
  /** Largest total mass m1 + m2 (optional). */
  totalMassCapSolar?: number;
  /** Largest mass ratio m1/m2 ≥ 1 (optional). */
  massRatioCap?: number;
}

/** One edge of the region's boundary in the (m1, m2) plane, from `from` to `to` (solar masses). */
export interface MassEdge {
  from: [number, number];
  to: [number, number];
}

/**
 * A region {mMin ≤ m2 ≤ m1 ≤ mMax, m1 + m2 ≤ Mmax, m1/m2 ≤ qmax} with chirp times measured from fLow.
 *
 * Shape used throughout the bank code: at fixed τ0 the total mass and the component masses are
 * monotonic in η (M ∝ η^{−3/5}, m1 and m1/m2 fall and m2 rises as η grows), so every limit reads
 * "η ≥ something" and the region is {τ0 ∈ [τ0Min, τ0Max], η_low(τ0) ≤ η ≤ 1/4}: in the (τ0, τ3)
 * plane it lies between the equal-mass curve (η = 1/4) and an upper chain of edges (m2 = mMin, then
 * m1/m2 = qmax, m1 = mMax or m1 + m2 = Mmax), along each of which τ0 decreases monotonically.
 */
export interface MassRegion {
  readonly limits: Required<Pick<MassRegionLimits, "minMassSolar" | "maxMassSolar">> & MassRegionLimits;
  readonly fMinHz: number;
  /** τ0 range (s): from the heaviest equal-mass binary to the lightest. */
  readonly tau0Min: number;
  readonly tau0Max: number;
  /** Total masses of the equal-mass end points (solar masses): lightest 2·mMin, heaviest. */
  readonly equalMassTotalMin: number;
  readonly equalMassTotalMax: number;
  /** Edges of the upper chain in mass space, from the lightest corner (mMin, mMin) on. */
  readonly upperChain: MassEdge[];
  /** τ0 (s) at the vertices of the upper chain (decreasing), including both ends. */
  readonly chainTau0: number[];
  /** True when the component masses (any order) satisfy every limit (relative tolerance 1e-9). */
  containsMasses(mA: number, mB: number): boolean;
  /** True when (τ0, τ3) is a physical point (η ≤ 1/4) inside the region. */
  contains(tau0: number, tau3: number): boolean;
  /** The lowest η of the region at this τ0 (> 1/4 when τ0 is outside [τ0Min, τ0Max]). */
  etaLow(tau0: number): number;
  /** τ3 of the point (τ0, η). */
  tau3At(tau0: number, eta: number): number;
  /** η of the point (τ0, τ3). */
  etaAt(tau0: number, tau3: number): number;
}

/** Total mass (solar) of the binary with chirp time τ0 from fLow and symmetric mass ratio η. */
export function totalMassFromTau0Eta(tau0: number, eta: number, fMinHz: number): number {
  // τ0 = 5 / (256 π f0 η) (π M f0)^{−5/3}  ⇒  π M f0 = (5 / (256 π f0 η τ0))^{3/5} (Sathyaprakash 1994).
  const x = Math.pow(5 / (256 * Math.PI * fMinHz * eta * tau0), 0.6);
  return x / (Math.PI * fMinHz * T_SUN);
}

/** Validates the limits and builds the region; throws InputError naming the offending limit. */
export function createMassRegion(limits: MassRegionLimits, fMinHz: number): MassRegion {
  const { minMassSolar: mMin, maxMassSolar: mMax } = limits;
  const totalMax = limits.totalMassCapSolar ?? Infinity;
  const qMax = limits.massRatioCap ?? Infinity;
  if (!(mMin > 0) || !Number.isFinite(mMin)) throw new InputError(`mass range: the minimum component mass must be a positive number (got ${mMin})`);
  if (!(mMax > 0) || !Number.isFinite(mMax)) throw new InputError(`mass range: the maximum component mass must be a positive number (got ${mMax})`);
  if (!(mMin < mMax)) throw new InputError(`mass range: the minimum ${mMin} must be below the maximum ${mMax}`);
  if (!(totalMax > 2 * mMin)) throw new InputError(`the total-mass cap ${totalMax} must exceed twice the minimum component mass (${2 * mMin})`);
  if (!(qMax > 1)) throw new InputError(`the mass-ratio cap must be a number above 1 (got ${limits.massRatioCap})`);
  if (!(fMinHz > 0) || !Number.isFinite(fMinHz)) throw parameterError("fMinHz", `must be a positive number (got ${fMinHz})`);

  const tol = 1e-9;
  const containsMasses = (mA: number, mB: number): boolean => {
    const m1 = Math.max(mA, mB);
    const m2 = Math.min(mA, mB);
    return (
      m2 >= mMin * (1 - tol) &&
      m1 <= mMax * (1 + tol) &&
      m1 + m2 <= totalMax * (1 + tol) &&
      m1 <= qMax * m2 * (1 + tol)
    );
  };

  // The heaviest equal-mass binary: m = min(mMax, Mmax/2).
  const mEqHi = Math.min(mMax, totalMax / 2);
  const equalMassTotalMin = 2 * mMin;
  const equalMassTotalMax = 2 * mEqHi;

  // Upper chain in mass space: the convex polygon {m2 ≥ mMin, m1 ≤ mMax, m1+m2 ≤ Mmax, m1 ≤ q m2,
  // m1 ≥ m2}, walked from (mMin, mMin) away from the equal-mass line to (mEqHi, mEqHi).
  const poly = clipPolygon(
    [
      [mMin, mMin],
      [mMax, mMin],
      [mMax, mMax],
    ],
    [
      (p) => totalMax - (p[0] + p[1]),
      (p) => (Number.isFinite(qMax) ? qMax * p[1] - p[0] : 1),
    ],
  );
  // Rotate so the chain starts at (mMin, mMin); the polygon is counter-clockwise in (m1, m2).
  const start = poly.findIndex((p) => Math.abs(p[0] - mMin) < 1e-12 * mMin && Math.abs(p[1] - mMin) < 1e-12 * mMin);
  const chainPts: [number, number][] = [];
  for (let i = 0; i < poly.length; i++) {
    const p = poly[(start + i) % poly.length];
    chainPts.push(p);
    if (i > 0 && Math.abs(p[0] - p[1]) < 1e-12 * p[0]) break;
  }
  const upperChain: MassEdge[] = [];
  for (let i = 0; i + 1 < chainPts.length; i++) upperChain.push({ from: chainPts[i], to: chainPts[i + 1] });
  const chainTau0 = chainPts.map((p) => chirpTimesFromComponents(p[0], p[1], fMinHz).tau0);
  const tau0Max = chainTau0[0];
  const tau0Min = chainTau0[chainTau0.length - 1];

  const etaAt = (tau0: number, tau3: number): number => massEtaFromChirpTimes(tau0, tau3, fMinHz).eta;
  const tau3At = (tau0: number, eta: number): number => {
    const m = totalMassFromTau0Eta(tau0, eta, fMinHz);
    return chirpTimesFromMassEta(m, eta, fMinHz).tau3;
  };
  const inside = (tau0: number, eta: number): boolean => {
    if (!(eta <= 0.25 * (1 + 1e-12))) return false;
    const c = componentsFromMassEta(totalMassFromTau0Eta(tau0, eta, fMinHz), Math.min(eta, 0.25));
    return containsMasses(c.m1, c.m2);
  };
  const etaLow = (tau0: number): number => {
    if (!(tau0 >= tau0Min * (1 - 1e-12) && tau0 <= tau0Max * (1 + 1e-12))) return Infinity;
    if (!inside(tau0, 0.25)) return 0.25;
    // inside(τ0, η) is monotonic in η (see the interface comment): bisect for the lowest η inside.
    let lo = 1e-6;
    let hi = 0.25;
    if (inside(tau0, lo)) return lo;
    for (let it = 0; it < 60; it++) {
      const mid = 0.5 * (lo + hi);
      if (inside(tau0, mid)) hi = mid;
      else lo = mid;
    }
    return hi;
  };
  const contains = (tau0: number, tau3: number): boolean => {
    if (!(tau0 > 0) || !(tau3 > 0)) return false;
    const { totalMassSolar, eta } = massEtaFromChirpTimes(tau0, tau3, fMinHz);
    if (!(eta <= 0.25 * (1 + 1e-12))) return false;
    const c = componentsFromMassEta(totalMassSolar, Math.min(eta, 0.25));
    return containsMasses(c.m1, c.m2);
  };

  return {
    limits: { ...limits },
    fMinHz,
    tau0Min,
    tau0Max,
    equalMassTotalMin,
    equalMassTotalMax,
    upperChain,
    chainTau0,
    containsMasses,
    contains,
    etaLow,
    tau3At,
    etaAt,
  };
}

/** Sutherland–Hodgman clipping of a convex polygon by half-planes {p : h(p) ≥ 0} (h affine). */
function clipPolygon(poly: [number, number][], halfPlanes: ((p: [number, number]) => number)[]): [number, number][] {
  let out = poly;
  for (const h of halfPlanes) {
    const next: [number, number][] = [];
    for (let i = 0; i < out.length; i++) {
      const p = out[i];
      const q = out[(i + 1) % out.length];
      const hp = h(p);
      const hq = h(q);
      if (hp >= 0) next.push(p);
      if ((hp >= 0) !== (hq >= 0)) {
        const t = hp / (hp - hq);
        next.push([p[0] + t * (q[0] - p[0]), p[1] + t * (q[1] - p[1])]);
      }
    }
    out = next;
  }
  return out;
}

import { InputError } from "../errors.js";
import { C, T_SUN } from "../physics/constants.js";
import { requireAlignedSpins } from "./alignedSpinPhase.js";
import { taylorT4SpinCorrections } from "./alignedSpinEnergyFlux.js";

/** Euler–Mascheroni constant γ_E (appears in the 3PN flux). */
const EULER_GAMMA = 0.5772156649015329;

/** Highest power of v kept in the TaylorT4 series (7 = 3.5PN). */
export const TAYLOR_T4_MAX_ORDER = 7;

/**
 * The orbital evolution of a quasi-circular binary (spins aligned with the orbital angular momentum,
 * or none) in the TaylorT4 approximant:
 * the energy-balance equation dv/dt = −F(v) / (dE/dv) with the ratio re-expanded as one PN series,
 * plus the orbital phase dφ/dt = v³ / M (M = G M_total / c³ in seconds, v = (M ω)^{1/3}).
 */
export interface TaylorT4Evolution {
  /** Component masses, solar masses. */
  readonly massSolar1: number;
  readonly massSolar2: number;
  /** Aligned dimensionless spins χ1, χ2 ∈ (−1, 1) (0 = non-spinning). */
  readonly chi1: number;
  readonly chi2: number;
  /** Total mass as a time, G M / c³, s. */
  readonly totalMassSeconds: number;
  /** Symmetric mass ratio η = m1 m2 / M². */
  readonly eta: number;
  /** Highest power of v kept in the series (0 = Newtonian … 7 = 3.5PN). */
  readonly pnOrder: number;
  /** Orbital velocity parameter at the Schwarzschild ISCO, 1/√6. */
  readonly vIsco: number;
  /** GW frequency at the ISCO, Hz: f = v³ / (π M). */
  readonly fIscoHz: number;
  /** dv/dt in 1/s at velocity parameter v. */
  dvdt(v: number): number;
  /** GW frequency (twice the orbital frequency) in Hz at velocity parameter v. */
  frequencyHz(v: number): number;
  /** Velocity parameter v = (π M f)^{1/3} for a GW frequency in Hz. */
  velocity(fHz: number): number;
  /**
   * Time (s) and orbital phase (rad) elapsed while v grows from vFrom to vTo (both in (0, vIsco]),
   * by Simpson quadrature of dt/dv = 1/v̇ and dφ/dv = v³/(M v̇) in ln v.
   */
  interval(vFrom: number, vTo: number): { time: number; orbitalPhase: number };
}

/**
 * TaylorT4 expansion coefficients a_k (k = 0..7) of
 *   dv/dt = (32 η / 5M) v⁹ [ Σ a_k v^k ],
 * where the v⁶ coefficient's ln v part is returned separately as `a6Log` (multiplying ln(16 v²)).
 *   a2 = −(743/336 + 11η/4), a3 = 4π, a4 = 34103/18144 + 13661η/2016 + 59η²/18,
 *   a5 = −(4159/672 + 189η/8) π,
 *   a6 = 16447322263/139708800 − 1712γ_E/105 + 16π²/3 + (−56198689/217728 + 451π²/48) η
 *        + 541η²/896 − 5605η³/2592,  a6Log = −856/105,
 *   a7 = (−4415/4032 + 358675η/6048 + 91495η²/1512) π.
 * Source: Buonanno, Iyer, Ochsner, Pan & Sathyaprakash, Phys. Rev. D 80, 084043 (2009), Eq. (3.6)
 * (the TaylorT4 table); equal to the series quotient of the 3.5PN flux (Blanchet, Living Rev.
 * Relativ. 17, 2 (2014), Eq. (314)) by dE/dv of the 3PN energy (ibid., Eq. (233)), which the tests
 * re-derive independently.
 */
export function taylorT4Coefficients(eta: number): { a: Float64Array; a6Log: number } {
  const pi = Math.PI;
  const pi2 = pi * pi;
  const e2 = eta * eta;
  const e3 = e2 * eta;
  const a = new Float64Array(8);
  a[0] = 1;
  a[1] = 0;
  a[2] = -(743 / 336 + (11 / 4) * eta);
  a[3] = 4 * pi;
  a[4] = 34103 / 18144 + (13661 / 2016) * eta + (59 / 18) * e2;
  a[5] = -(4159 / 672 + (189 / 8) * eta) * pi;
  a[6] =
    16447322263 / 139708800 -
    (1712 / 105) * EULER_GAMMA +
    (16 / 3) * pi2 +
    (-56198689 / 217728 + (451 / 48) * pi2) * eta +
    (541 / 896) * e2 -
    (5605 / 2592) * e3;
  a[7] = (-4415 / 4032 + (358675 / 6048) * eta + (91495 / 1512) * e2) * pi;
  return { a, a6Log: -856 / 105 };
}

/** Simpson panels used by `interval` (in ln v; the integrand varies like v⁻⁸). */
const SIMPSON_PANELS = 4096;

/**
 * Builds the TaylorT4 orbital evolution of a binary with component masses in solar masses and
 * aligned spins chi1, chi2 ∈ (−1, 1) (default 0). `pnOrder` is the highest power of v kept (0, 2, 3,
 * …, 7; default 7 = 3.5PN). Spins add {@link taylorT4SpinCorrections} to the non-spinning table
 * (not evaluated at all when both are zero). Throws InputError for non-positive masses, spins
 * outside (−1, 1), or if dv/dt is not positive up to the ISCO.
 */
export function taylorT4Evolution(
  massSolar1: number,
  massSolar2: number,
  pnOrder = TAYLOR_T4_MAX_ORDER,
  chi1 = 0,
  chi2 = 0,
): TaylorT4Evolution {
  if (!(massSolar1 > 0) || !Number.isFinite(massSolar1)) {
    throw new InputError(`primary mass must be a positive number of solar masses (got ${massSolar1})`);
  }
  if (!(massSolar2 > 0) || !Number.isFinite(massSolar2)) {
    throw new InputError(`secondary mass must be a positive number of solar masses (got ${massSolar2})`);
  }
  if (!Number.isInteger(pnOrder) || pnOrder < 0 || pnOrder > TAYLOR_T4_MAX_ORDER) {
    throw new InputError(`TaylorT4 pnOrder must be an integer 0..${TAYLOR_T4_MAX_ORDER} (got ${pnOrder})`);
  }
  requireAlignedSpins("taylorT4Evolution", chi1, chi2);
  const mTotal = massSolar1 + massSolar2;
  const m = T_SUN * mTotal;
  const eta = (massSolar1 * massSolar2) / (mTotal * mTotal);
  const { a: coef, a6Log: a6LogFull } = taylorT4Coefficients(eta);
  if (chi1 !== 0 || chi2 !== 0) {
    const spin = taylorT4SpinCorrections(massSolar1, massSolar2, chi1, chi2);
    for (let k = 0; k < 8; k++) coef[k] += spin[k];
  }
  for (let k = pnOrder + 1; k < 8; k++) coef[k] = 0;
  const a6Log = pnOrder >= 6 ? a6LogFull : 0;
  const [, , a2, a3, a4, a5, a6, a7] = coef;
  const prefactor = (32 * eta) / (5 * m);
  const vIsco = 1 / Math.sqrt(6);

  const dvdt = (v: number): number => {
    const v2 = v * v;
    const v4 = v2 * v2;
    const v8 = v4 * v4;
    const series =
      1 + v2 * (a2 + v * (a3 + v * (a4 + v * (a5 + v * (a6 + a6Log * Math.log(16 * v2) + v * a7)))));
    return prefactor * v8 * v * series;
  };

  const interval = (vFrom: number, vTo: number): { time: number; orbitalPhase: number } => {
    if (vFrom === vTo) return { time: 0, orbitalPhase: 0 };
    const s0 = Math.log(vFrom);
    const h = (Math.log(vTo) - s0) / SIMPSON_PANELS;
    let t = 0;
    let p = 0;
    for (let i = 0; i <= SIMPSON_PANELS; i++) {
      const v = Math.exp(s0 + i * h);
      const g = dvdt(v);
      if (!(g > 0)) {
        throw new InputError(
          `TaylorT4: dv/dt is not positive at v = ${v.toPrecision(4)} for masses ${massSolar1}+${massSolar2}` +
            (chi1 !== 0 || chi2 !== 0 ? ` with spins ${chi1}, ${chi2}` : ""),
        );
      }
      const w = i === 0 || i === SIMPSON_PANELS ? 1 : i % 2 === 1 ? 4 : 2;
      const dt = v / g; // dt/d(ln v)
      t += w * dt;
      p += (w * dt * v * v * v) / m;
    }
    return { time: (t * h) / 3, orbitalPhase: (p * h) / 3 };
  };

  return {
    massSolar1,
    massSolar2,
    chi1,
    chi2,
    totalMassSeconds: m,
    eta,
    pnOrder,
    vIsco,
    fIscoHz: (vIsco * vIsco * vIsco) / (Math.PI * m),
    dvdt,
    frequencyHz: (v) => (v * v * v) / (Math.PI * m),
    velocity: (fHz) => Math.cbrt(Math.PI * m * fHz),
    interval,
  };
}

/**
 * Duration (s) of the TaylorT4 inspiral from GW frequency fStartHz to fEndHz (default: the ISCO),
 * with aligned spins chi1, chi2 (default 0).
 * Throws InputError if fStartHz is not below the end frequency.
 */
export function taylorT4Duration(
  massSolar1: number,
  massSolar2: number,
  fStartHz: number,
  fEndHz?: number,
  chi1 = 0,
  chi2 = 0,
): number {
  const ev = taylorT4Evolution(massSolar1, massSolar2, TAYLOR_T4_MAX_ORDER, chi1, chi2);
  const [vs, ve] = velocityRange(ev, fStartHz, fEndHz);
  return ev.interval(vs, ve).time;
}

/** Number of GW cycles (GW phase / 2π = orbital phase / π) of the TaylorT4 inspiral from fStartHz to fEndHz (default ISCO), aligned spins chi1, chi2 (default 0). */
export function taylorT4Cycles(
  massSolar1: number,
  massSolar2: number,
  fStartHz: number,
  fEndHz?: number,
  pnOrder = TAYLOR_T4_MAX_ORDER,
  chi1 = 0,
  chi2 = 0,
): number {
  const ev = taylorT4Evolution(massSolar1, massSolar2, pnOrder, chi1, chi2);
  const [vs, ve] = velocityRange(ev, fStartHz, fEndHz);
  return ev.interval(vs, ve).orbitalPhase / Math.PI;
}

function velocityRange(ev: TaylorT4Evolution, fStartHz: number, fEndHz?: number): [number, number] {
  const fEnd = fEndHz ?? ev.fIscoHz;
  if (!(fEnd > 0) || fEnd > ev.fIscoHz * (1 + 1e-12)) {
    throw new InputError(`end frequency must be in (0, ${ev.fIscoHz.toFixed(1)}] Hz, the ISCO of ${ev.massSolar1}+${ev.massSolar2} M_sun (got ${fEndHz})`);
  }
  if (!(fStartHz > 0) || !(fStartHz < fEnd)) {
    throw new InputError(`start frequency must be positive and below the end frequency ${fEnd.toFixed(1)} Hz (got ${fStartHz})`);
  }
  return [ev.velocity(fStartHz), Math.min(ev.velocity(fEnd), ev.vIsco)];
}

/**
 * Restricted-PN (Newtonian-amplitude) polarisation amplitude A(v) = 2 G μ v² / (c² D), in strain,
 * so that h+ = −A (1 + cos²ι) cos 2φ and h× = −2 A cos ι sin 2φ; at ι = 0 the amplitude 2A equals
 * the quadrupole h0 = 4 (G Mc)^{5/3} (π f)^{2/3} / (c⁴ D).
 * Source: leading (Newtonian) term of Blanchet, Living Rev. Relativ. 17, 2 (2014), Eqs. (237)–(240);
 * h0 from Peters & Mathews, Phys. Rev. 131, 435 (1963).
 */
export function restrictedAmplitude(eta: number, totalMassSeconds: number, v: number, distanceMetres: number): number {
  return (2 * eta * totalMassSeconds * C * v * v) / distanceMetres;
}

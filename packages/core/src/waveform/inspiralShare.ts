// How much of a binary's matched-filter SNR an inspiral-only template, cut at the ISCO, can carry
// when the real signal goes on through merger and ringdown.
import { InputError } from "../errors.js";
import { M_SUN } from "../physics/constants.js";
import { iscoGwFrequency } from "../physics/isco.js";
import { remnantOfMerger } from "../physics/remnant.js";
import { ringdownFrequencyHz } from "../physics/ringdown.js";
import type { PsdModel } from "../noise/psdModel.js";

/** The inspiral's share of the SNR, and the frequencies that bound it. */
export interface InspiralShare {
  /** ρ_inspiral / ρ_total ∈ [0, 1]. */
  readonly share: number;
  /** Schwarzschild ISCO GW frequency of the total mass (Hz): where the templates stop. */
  readonly fIscoHz: number;
  /** Dominant ringdown frequency of the remnant (Hz): where the extended signal is taken to stop. */
  readonly fRingdownHz: number;
}

/** Simpson panels in ln f per interval (the integrand is smooth in ln f). */
const PANELS = 256;

/** ∫_{fa}^{fb} f^{−7/3} / S(f) df by Simpson's rule in ln f; 0 when fb ≤ fa. */
function weightedIntegral(psd: PsdModel, fa: number, fb: number): number {
  if (!(fb > fa)) return 0;
  const la = Math.log(fa);
  const h = (Math.log(fb) - la) / PANELS;
  let sum = 0;
  for (let i = 0; i <= PANELS; i++) {
    const f = Math.exp(la + i * h);
    const s = psd.evaluate(f);
    const value = s > 0 && Number.isFinite(s) ? Math.pow(f, -4 / 3) / s : 0; // f · f^{−7/3} / S
    sum += (i === 0 || i === PANELS ? 1 : i % 2 === 1 ? 4 : 2) * value;
  }
  return (sum * h) / 3;
}

/**
 * Share of the optimal SNR of a binary (masses m1Solar, m2Solar; aligned spins chi1, chi2, default 0)
 * that an inspiral template ending at the Schwarzschild ISCO of the total mass carries, when the
 * signal continues with the inspiral's amplitude law |h̃| ∝ f^{−7/6} up to the dominant ringdown
 * frequency of the remnant:
 *   share = √( ∫_{fLow}^{f_isco} f^{−7/3}/S df / ∫_{fLow}^{f_ring} f^{−7/3}/S df ),
 * both limits capped at fMaxHz (default: none). The remnant comes from {@link remnantOfMerger}
 * (Barausse, Morozova & Rezzolla 2012; Rezzolla et al. 2008), f_ring from {@link ringdownFrequencyHz}
 * (Berti, Cardoso & Will 2006). The extension is a rough stand-in for merger and ringdown (it ignores
 * their different amplitude law), good for finding where an inspiral-only search stops being
 * trustworthy, not for SNR predictions. For neutron stars the remnant is not a black hole, so the
 * figure is only indicative; there the ISCO lies far above the sensitive band and the share is ≈ 1.
 */
export function inspiralSnrShare(
  m1Solar: number,
  m2Solar: number,
  psd: PsdModel,
  fMinHz: number,
  options: { chi1?: number; chi2?: number; fMaxHz?: number } = {},
): InspiralShare {
  const where = "inspiralSnrShare";
  if (!(fMinHz > 0) || !Number.isFinite(fMinHz)) throw new InputError(`${where}: fMinHz must be a positive finite number (got ${fMinHz})`);
  const fHigh = options.fMaxHz ?? Infinity;
  if (!(fHigh > 0)) throw new InputError(`${where}: fMaxHz must be a positive number or Infinity (got ${fHigh})`);
  const remnant = remnantOfMerger(m1Solar, m2Solar, options.chi1 ?? 0, options.chi2 ?? 0);
  const mTotal = m1Solar + m2Solar;
  const fIscoHz = iscoGwFrequency(mTotal * M_SUN);
  const fRingdownHz = ringdownFrequencyHz(remnant.massFraction * mTotal, remnant.spin);
  const top = Math.min(fIscoHz, fHigh);
  const inspiral = weightedIntegral(psd, fMinHz, top);
  const total = inspiral + weightedIntegral(psd, top, Math.min(Math.max(fRingdownHz, top), fHigh));
  const share = total > 0 ? Math.sqrt(inspiral / total) : 0;
  return { share, fIscoHz, fRingdownHz };
}

/** A template as far as the inspiral share is concerned: masses in M_sun, optional aligned spins. */
export interface ShareTemplate {
  primaryMassSolar: number;
  secondaryMassSolar: number;
  primarySpin?: number;
  secondarySpin?: number;
}

/** Which templates of a bank carry less than a given share of their signal's SNR in the inspiral. */
export interface InspiralEdge {
  /** The share below which a template counts (e.g. 0.9). */
  readonly threshold: number;
  /** Number of templates checked. */
  readonly templates: number;
  /** Number of them whose inspiral share is below the threshold. */
  readonly below: number;
  /** Smallest share found (1 for an empty bank). */
  readonly lowestShare: number;
  /** [lightest, heaviest] total mass (M_sun) of the templates below the threshold; null if none. */
  readonly totalMassRangeSolar: [number, number] | null;
  /** Lightest total mass (M_sun) below the threshold: binaries from here up are not trustworthy. */
  readonly lightestBelowSolar: number | null;
}

/** Points per e-fold of the tabulated integral (its interpolation error is far below 1e-4 in the share). */
const TABLE_PER_EFOLD = 400;

/**
 * {@link inspiralSnrShare} for every template of a bank at once: ∫ f^{−7/3}/S df is tabulated once
 * from fMinHz on a logarithmic grid (trapezoids in ln f, linear interpolation between nodes), then
 * each template's share is √(C(f_isco)/C(f_ring)) from the table, with f_isco, f_ring as there
 * (remnant fits of Barausse, Morozova & Rezzolla 2012 and Rezzolla et al. 2008; ringdown of Berti,
 * Cardoso & Will 2006). Reports how many fall below `threshold` (default 0.9) and their total-mass range.
 */
export function inspiralEdgeOfBank(
  templates: readonly ShareTemplate[],
  psd: PsdModel,
  fMinHz: number,
  options: { threshold?: number; fMaxHz?: number } = {},
): InspiralEdge {
  const where = "inspiralEdgeOfBank";
  const threshold = options.threshold ?? 0.9;
  if (!(threshold > 0 && threshold <= 1)) throw new InputError(`${where}: threshold must be in (0, 1] (got ${threshold})`);
  if (!(fMinHz > 0) || !Number.isFinite(fMinHz)) throw new InputError(`${where}: fMinHz must be a positive finite number (got ${fMinHz})`);
  const fHigh = options.fMaxHz ?? Infinity;
  const bounds = templates.map((t) => {
    const m = t.primaryMassSolar + t.secondaryMassSolar;
    const r = remnantOfMerger(t.primaryMassSolar, t.secondaryMassSolar, t.primarySpin ?? 0, t.secondarySpin ?? 0);
    const fIsco = Math.min(iscoGwFrequency(m * M_SUN), fHigh);
    return { m, fIsco, fRing: Math.min(Math.max(ringdownFrequencyHz(r.massFraction * m, r.spin), fIsco), fHigh) };
  });
  let fTop = fMinHz;
  for (const b of bounds) fTop = Math.max(fTop, b.fRing);
  const lnLow = Math.log(fMinHz);
  const nodes = Math.max(2, Math.ceil((Math.log(fTop) - lnLow) * TABLE_PER_EFOLD) + 1);
  const step = nodes > 1 ? (Math.log(fTop) - lnLow) / (nodes - 1) : 0;
  const cumulative = new Float64Array(nodes);
  let previous = 0;
  for (let i = 0; i < nodes; i++) {
    const f = Math.exp(lnLow + i * step);
    const s = psd.evaluate(f);
    const value = s > 0 && Number.isFinite(s) ? Math.pow(f, -4 / 3) / s : 0;
    if (i > 0) cumulative[i] = cumulative[i - 1] + 0.5 * step * (previous + value);
    previous = value;
  }
  const at = (f: number): number => {
    if (!(f > fMinHz) || step === 0) return 0;
    const x = (Math.log(f) - lnLow) / step;
    const i = Math.min(nodes - 2, Math.floor(x));
    const w = x - i;
    return cumulative[i] * (1 - w) + cumulative[i + 1] * w;
  };
  let below = 0;
  let lowest = 1;
  let lo = Infinity;
  let hi = -Infinity;
  for (const b of bounds) {
    const total = at(b.fRing);
    const share = total > 0 ? Math.sqrt(at(b.fIsco) / total) : 0;
    lowest = Math.min(lowest, share);
    if (share < threshold) {
      below++;
      lo = Math.min(lo, b.m);
      hi = Math.max(hi, b.m);
    }
  }
  return {
    threshold,
    templates: templates.length,
    below,
    lowestShare: lowest,
    totalMassRangeSolar: below > 0 ? [lo, hi] : null,
    lightestBelowSolar: below > 0 ? lo : null,
  };
}

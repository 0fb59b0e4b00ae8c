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
 * both limits capped at fHighHz (default: none). The remnant comes from {@link remnantOfMerger}
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
  fLowHz: number,
  options: { chi1?: number; chi2?: number; fHighHz?: number } = {},
): InspiralShare {
  const where = "inspiralSnrShare";
  if (!(fLowHz > 0) || !Number.isFinite(fLowHz)) throw new InputError(`${where}: fLowHz must be a positive finite number (got ${fLowHz})`);
  const fHigh = options.fHighHz ?? Infinity;
  if (!(fHigh > 0)) throw new InputError(`${where}: fHighHz must be a positive number or Infinity (got ${fHigh})`);
  const remnant = remnantOfMerger(m1Solar, m2Solar, options.chi1 ?? 0, options.chi2 ?? 0);
  const mTotal = m1Solar + m2Solar;
  const fIscoHz = iscoGwFrequency(mTotal * M_SUN);
  const fRingdownHz = ringdownFrequencyHz(remnant.massFraction * mTotal, remnant.spin);
  const top = Math.min(fIscoHz, fHigh);
  const inspiral = weightedIntegral(psd, fLowHz, top);
  const total = inspiral + weightedIntegral(psd, top, Math.min(Math.max(fRingdownHz, top), fHigh));
  const share = total > 0 ? Math.sqrt(inspiral / total) : 0;
  return { share, fIscoHz, fRingdownHz };
}

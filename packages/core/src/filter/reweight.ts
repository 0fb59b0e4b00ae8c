/**
 * Reweighted SNR that down-ranks peaks whose chi-squared is too large for a signal:
 *
 *   ρ̂ = ρ                                  if χ²_r ≤ 1,
 *   ρ̂ = ρ / [ (1 + (χ²_r)³) / 2 ]^{1/6}     otherwise,   χ²_r = χ² / dof,
 *
 * Babak et al., Phys. Rev. D 87, 024033 (2013), Eq. 6 (the "new SNR" of the first joint searches).
 */
export function reweightedSnr(snr: number, chi2: number, dof: number): number {
  if (!(dof > 0)) return snr;
  const r = chi2 / dof;
  if (r <= 1) return snr;
  return snr / Math.pow((1 + r * r * r) / 2, 1 / 6);
}

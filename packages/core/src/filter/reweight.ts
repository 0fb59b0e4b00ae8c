/**
 * Reweighted SNR that down-ranks peaks whose chi-squared is too large for a signal:
 *
 *   ρ̂ = ρ                                  if χ²_r ≤ 1,
 *   ρ̂ = ρ / [ (1 + (χ²_r)³) / 2 ]^{1/6}     otherwise,   χ²_r = χ² / (dof + δ ρ²),
 *
 * Babak et al., Phys. Rev. D 87, 024033 (2013), Eq. 6 (the "new SNR" of the first joint searches),
 * which is δ = 0. A signal that its template matches only imperfectly (another waveform model, or a
 * point between templates) adds to χ² an amount that grows like ρ² (Allen, Phys. Rev. D 71, 062001
 * (2005), the section on signals that do not exactly match a template, which thresholds on
 * χ² against p + δ ρ²; from memory). The allowance δ ≥ 0 moves that expected excess into the
 * normalisation (our combination of the two), so loud mismatched signals are not down-ranked as
 * glitches are: a glitch's χ² grows like ρ² with a coefficient far above any δ a bank needs.
 */
export function reweightedSnr(snr: number, chi2: number, dof: number, allowance = 0): number {
  if (!(dof > 0)) return snr;
  const r = chi2 / (dof + allowance * snr * snr);
  if (r <= 1) return snr;
  return snr / Math.pow((1 + r * r * r) / 2, 1 / 6);
}

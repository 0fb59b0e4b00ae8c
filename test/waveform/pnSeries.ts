// Post-Newtonian energy and flux of a quasi-circular non-spinning binary, written out here
// independently of the library so its phasing can be checked against them.

export const EULER_GAMMA = 0.5772156649015329;

/**
 * Coefficients e_k of the binding energy E = −(μ v²/2) Σ e_k v^{2k}, k = 0…3 (3PN): Blanchet,
 * Living Rev. Relativ. 17, 2 (2014), Eq. (233) (from memory; see the TaylorT4 test for the cross-check).
 */
export function energySeries(eta: number): number[] {
  const pi = Math.PI;
  return [
    1,
    -3 / 4 - eta / 12,
    -27 / 8 + (19 / 8) * eta - (eta * eta) / 24,
    -675 / 64 + (34445 / 576 - (205 / 96) * pi * pi) * eta - (155 / 96) * eta ** 2 - (35 / 5184) * eta ** 3,
  ];
}

/**
 * Coefficients f_k of the flux F = (32/5) η² v¹⁰ [Σ f_k v^k − (856/105) ln(16 v²) v⁶], k = 0…7 (3.5PN),
 * without the logarithm: Blanchet, Living Rev. Relativ. 17, 2 (2014), Eq. (314) (from memory).
 */
export function fluxSeries(eta: number): number[] {
  const pi = Math.PI;
  return [
    1,
    0,
    -1247 / 336 - (35 / 12) * eta,
    4 * pi,
    -44711 / 9072 + (9271 / 504) * eta + (65 / 18) * eta ** 2,
    (-8191 / 672 - (583 / 24) * eta) * pi,
    6643739519 / 69854400 + (16 / 3) * pi * pi - (1712 / 105) * EULER_GAMMA +
      (-134543 / 7776 + (41 / 48) * pi * pi) * eta - (94403 / 3024) * eta ** 2 - (775 / 324) * eta ** 3,
    (-16285 / 504 + (214745 / 1728) * eta + (193385 / 3024) * eta ** 2) * pi,
  ];
}

/** dE/dv ∝ Σ (k+1) e_k v^{2k}, as a power series in v to v⁷. */
export function energyDerivativeSeries(eta: number): number[] {
  const e = energySeries(eta);
  return [1, 0, 2 * e[1], 0, 3 * e[2], 0, 4 * e[3], 0];
}

/** Power series quotient n(v) / d(v) to the length of n, with d[0] = 1. */
export function seriesQuotient(n: readonly number[], d: readonly number[]): number[] {
  const q: number[] = [];
  for (let k = 0; k < n.length; k++) {
    let s = n[k];
    for (let j = 1; j <= k; j++) s -= d[j] * q[k - j];
    q.push(s);
  }
  return q;
}

// The placement metric where rows run: the patches' sampled metrics interpolated bilinearly.
import type { Metric2 } from "./metric.js";
import type { LatticePatch } from "./patch.js";

/**
 * The metric at τ0 and band fraction `frac` (0 at the band's lower edge, 1 at etaHi) over a run of
 * patches (ordered along τ0): that of the patch holding τ0, bilinear in (τ0, fraction) between its
 * sample grid's points (patchSamples.ts). Not conservative: coverage rests on the row checks' margin
 * (COVER_SAFETY in rowMarch.ts), measured with direct matches. The patch's own (conservative)
 * metric where a neighbouring sample row is missing or the patch has fewer than two rows.
 */
export function bandMetricAt(patches: readonly LatticePatch[], t: number, frac: number): Metric2 {
  let pi = 0;
  let pj = patches.length - 1;
  while (pi < pj) {
    const m = (pi + pj) >> 1;
    if (t > patches[m].tau0Hi) pi = m + 1;
    else pj = m;
  }
  const here = patches[pi];
  const nT = here.sampleTau0.length;
  const rows = here.samples;
  if (nT < 2) return here.metric;
  const i0 = Math.min(nT - 2, Math.max(0, Math.floor(((t - here.tau0Lo) / (here.tau0Hi - here.tau0Lo)) * (nT - 1))));
  const lower = rows[i0];
  const upper = rows[i0 + 1];
  if (!lower || !upper) return here.metric;
  const nE = lower.length;
  const j0 = Math.min(nE - 2, Math.max(0, Math.floor(frac * (nE - 1))));
  const u = Math.min(1, Math.max(0, ((t - here.tau0Lo) / (here.tau0Hi - here.tau0Lo)) * (nT - 1) - i0));
  const v = Math.min(1, Math.max(0, frac * (nE - 1) - j0));
  const c00 = lower[j0];
  const c01 = lower[j0 + 1];
  const c10 = upper[j0];
  const c11 = upper[j0 + 1];
  const w00 = (1 - u) * (1 - v);
  const w01 = (1 - u) * v;
  const w10 = u * (1 - v);
  const w11 = u * v;
  return {
    g00: w00 * c00.g00 + w01 * c01.g00 + w10 * c10.g00 + w11 * c11.g00,
    g01: w00 * c00.g01 + w01 * c01.g01 + w10 * c10.g01 + w11 * c11.g01,
    g11: w00 * c00.g11 + w01 * c01.g11 + w10 * c10.g11 + w11 * c11.g11,
  };
}

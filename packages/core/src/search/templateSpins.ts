// Aligned spins of search templates: the array the bank filter takes, and the effective spin candidates report.
import type { SearchTemplate } from "./types.js";

/** Aligned spins (χ1, χ2 pairs) of the templates, or undefined when none spins (the non-spinning path). */
export function templateSpins(templates: readonly SearchTemplate[]): Float64Array | undefined {
  if (!templates.some((t) => (t.primarySpin ?? 0) !== 0 || (t.secondarySpin ?? 0) !== 0)) return undefined;
  const spins = new Float64Array(2 * templates.length);
  templates.forEach((t, i) => {
    spins[2 * i] = t.primarySpin ?? 0;
    spins[2 * i + 1] = t.secondarySpin ?? 0;
  });
  return spins;
}

/** χ_eff = (m1 χ1 + m2 χ2) / (m1 + m2) (Ajith et al., Phys. Rev. Lett. 106, 241101 (2011)). */
export function effectiveSpin(t: SearchTemplate): number {
  return (t.primaryMassSolar * (t.primarySpin ?? 0) + t.secondaryMassSolar * (t.secondarySpin ?? 0)) / (t.primaryMassSolar + t.secondaryMassSolar);
}

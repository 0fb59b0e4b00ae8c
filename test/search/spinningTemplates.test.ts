// The search filters with the templates' aligned spins (one thread and worker threads), uses them in
// the chi-squared template, and reports each candidate's template spins and effective spin.
// The worker path runs the compiled dist/ (built first, as in test/perf/threads.test.ts).
import { beforeAll, describe, expect, it } from "vitest";
import { buildCoreForWorkers } from "../support/buildCore.js";
import { ajith2011, arrayInput, colouredNoise, loadFftBackends, searchStrain, taylorF2Into, type SearchTemplate } from "@chirpsieve/core";
import { standardSearch, taylorF2Chirp } from "./fixtures.js";

const FS = 2048;
const FMIN = 30;
const SECONDS = 64;

beforeAll(async () => {
  buildCoreForWorkers();
  await loadFftBackends();
});

/** A spinning TaylorF2 chirp (the templates' own family) at optimal SNR `snr` in ajith2011, reaching its ISCO at t0. */
function spinningChirp(m1: number, m2: number, chi: number, t0: number, n: number, snr: number): Float64Array {
  const df = FS / n;
  const h = new Float64Array(2 * n);
  taylorF2Into(h, n / 2 + 1, df, FMIN, m1, m2, 1, Infinity, 7, chi, chi);
  // Optimal SNR² = 4 ∫ |h̃|²/S df (the project's inner product).
  let rho2 = 0;
  for (let k = Math.ceil(FMIN / df); k <= n / 2; k++) rho2 += (4 * (h[2 * k] ** 2 + h[2 * k + 1] ** 2) * df) / ajith2011.evaluate(k * df);
  const x = taylorF2Chirp(m1, m2, t0, n, FS, FMIN, chi, chi);
  const scale = snr / Math.sqrt(rho2);
  for (let i = 0; i < n; i++) x[i] *= scale;
  return x;
}

describe("spinning templates in the search", () => {
  const n = SECONDS * FS;
  const data = colouredNoise(ajith2011, n, FS, "spinning-templates");
  // 10 + 8 M_sun with both spins 0.6 reaching its ISCO at 40.3 s, optimal SNR 20.
  const chirp = spinningChirp(10, 8, 0.6, 40.3, n, 20);
  for (let i = 0; i < n; i++) data[i] += chirp[i];
  const withSpin: SearchTemplate[] = [{ primaryMassSolar: 10, secondaryMassSolar: 8, primarySpin: 0.6, secondarySpin: 0.6 }];
  const without: SearchTemplate[] = [{ primaryMassSolar: 10, secondaryMassSolar: 8 }];

  const run = async (templates: SearchTemplate[], threads: number) =>
    (await searchStrain(arrayInput(data, FS, 0, "spin.f64"), { ...standardSearch(templates, FMIN, 8), psd: { kind: "model", model: ajith2011 }, threads })).candidates;

  it("finds a spinning chirp louder, with a small chi-squared, when the template carries its spins; reports them and χ_eff", async () => {
    const [spun] = await run(withSpin, 1);
    const [flat] = await run(without, 1);
    expect(spun).toBeDefined();
    expect(spun.primarySpin).toBe(0.6);
    expect(spun.secondarySpin).toBe(0.6);
    // χ_eff = (m1 χ1 + m2 χ2)/(m1 + m2) (Ajith et al., Phys. Rev. Lett. 106, 241101 (2011)): 0.6 for equal spins.
    expect(spun.effectiveSpin).toBeCloseTo(0.6, 12);
    expect(spun.snr).toBeGreaterThan(15);
    // The exact template leaves Gaussian-noise chi-squared (mean = dof); the same masses without spins leave far more.
    expect(spun.chi2 / spun.chi2Dof).toBeLessThan(2);
    if (flat) {
      expect(flat.snr).toBeLessThan(0.8 * spun.snr);
      expect(flat.primarySpin).toBe(0);
      expect(flat.effectiveSpin).toBe(0);
    }
  });

  it("gives the same candidates with worker threads as with one thread for spinning templates", async () => {
    const templates: SearchTemplate[] = [
      ...withSpin,
      { primaryMassSolar: 10, secondaryMassSolar: 8, primarySpin: 0.3, secondarySpin: -0.2 },
      { primaryMassSolar: 11, secondaryMassSolar: 7, primarySpin: 0.6, secondarySpin: 0.6 },
    ];
    const one = await run(templates, 1);
    const two = await run(templates, 2);
    expect(two.length).toBe(one.length);
    expect(one.length).toBeGreaterThan(0);
    for (let i = 0; i < one.length; i++) {
      expect(two[i].templateIndex).toBe(one[i].templateIndex);
      expect(Math.abs(two[i].snr - one[i].snr)).toBeLessThan(1e-4 * one[i].snr);
      expect(two[i].effectiveSpin).toBe(one[i].effectiveSpin);
    }
    // χ_eff of the unequal-spin template: (10 · 0.3 + 8 · (−0.2)) / 18.
    const unequal = one.find((c) => c.templateIndex === 1);
    if (unequal) expect(unequal.effectiveSpin).toBeCloseTo((10 * 0.3 - 8 * 0.2) / 18, 12);
  });
});

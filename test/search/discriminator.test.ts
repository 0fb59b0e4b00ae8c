import { beforeAll, describe, expect, it } from "vitest";
import { ajith2011, arrayInput, loadFftBackends, searchStrain, type SearchOptions } from "@chirpsieve/core";
import { atSnr, chirpMassGrid, injectionAt, simulatedData, standardSearch, taylorF2Chirp } from "./fixtures.js";

const FS = 2048;
const FMIN = 30;
const bank = chirpMassGrid(4, 25, 0.01, [1, 0.7, 0.5]);
const opts: SearchOptions = standardSearch(bank, FMIN, 6);

/** A sine-Gaussian burst h(t) = A exp(−(t−t0)²/τ²) sin(2πf0(t−t0)), τ = Q/(√2 π f0) (common practice, no source). */
function addSineGaussian(data: Float64Array, t0: number, f0: number, q: number, amplitude: number): void {
  const tau = q / (Math.SQRT2 * Math.PI * f0);
  const i0 = Math.floor((t0 - 5 * tau) * FS);
  const i1 = Math.ceil((t0 + 5 * tau) * FS);
  for (let i = i0; i <= i1; i++) {
    const t = i / FS - t0;
    data[i] += amplitude * Math.exp(-(t * t) / (tau * tau)) * Math.sin(2 * Math.PI * f0 * t);
  }
}

async function loudest(data: Float64Array, noiseFree = false, extra: Partial<SearchOptions> = {}) {
  // Noise-free data is mostly exact zeros: the search is told neither to screen it nor to gate it
  // (any signal is a loud excursion over no noise).
  const o: SearchOptions = { ...(noiseFree ? { ...opts, psd: { kind: "model", model: ajith2011 }, badData: "ignore" as const, gating: null } : opts), ...extra };
  const { candidates } = await searchStrain(arrayInput(data, FS), o);
  return candidates.reduce((a, b) => (b.snr > a.snr ? b : a));
}

beforeAll(async () => {
  await loadFftBackends();
});

describe("chi-squared discriminator and reweighted SNR (Allen 2005; Babak et al. 2013)", () => {
  it("a loud sine-Gaussian glitch (SNR 30 in the bank) gets a large chi-squared and a reweighted SNR below threshold", async () => {
    // Scale the glitch so that its loudest SNR in the bank is 30 (SNR is linear in amplitude).
    const probe = new Float64Array(64 * FS);
    addSineGaussian(probe, 40, 120, 9, 1e-21);
    const base = await loudest(probe, true);
    const data = simulatedData({ psd: ajith2011, fs: FS, seconds: 64, seed: "glitch", fMin: FMIN });
    addSineGaussian(data, 40, 120, 9, (1e-21 * 30) / base.snr);
    const c = await loudest(data);
    expect(c.snr).toBeGreaterThan(25);
    expect(c.chi2 / c.chi2Dof).toBeGreaterThan(5);
    expect(c.reweightedSnr).toBeLessThan(opts.snrThreshold);
  });

  it("a chirp of the same SNR keeps its reweighted SNR within 10%", async () => {
    // A chirp from the bank's own waveform family (TaylorF2), at masses between grid points.
    // A TaylorT4 chirp (another waveform model) does not keep it without an allowance: see the
    // chi-squared allowance test below.
    const chirp = taylorF2Chirp(10.3, 7.9, 40.25, 64 * FS, FS, FMIN);
    const probe = await loudest(chirp, true);
    const data = simulatedData({ psd: ajith2011, fs: FS, seconds: 64, seed: "glitch", fMin: FMIN });
    for (let i = 0; i < data.length; i++) data[i] += (chirp[i] * 30) / probe.snr;
    const c = await loudest(data);
    expect(c.snr).toBeGreaterThan(25);
    expect(c.reweightedSnr / c.snr).toBeGreaterThan(0.9);
  });

  it("with a chi-squared allowance, a TaylorT4 chirp at SNR 30 keeps its reweighted SNR and the glitch stays down-ranked", async () => {
    // The bank is TaylorF2; a TaylorT4 10+8 chirp differs from it (another waveform model), which
    // adds χ² ∝ ρ² (Allen 2005, from memory). Dividing χ² by dof + δρ² absorbs that. The allowance
    // also softens glitch rejection: at δ = 0.1 the SNR-30 sine-Gaussian of the first test would keep
    // a reweighted SNR of 8.4, at δ = 0.03 (used here) it stays below the threshold of 6.
    const inj = atSnr(injectionAt(10, 8, 40.25), 30, ajith2011, FS, FMIN);
    const data = simulatedData({ psd: ajith2011, fs: FS, seconds: 64, seed: "t4-allowance", fMin: FMIN, injections: [inj] });
    const plain = await loudest(data);
    const allowed = await loudest(data, false, { chi2Allowance: 0.03 });
    expect(allowed.snr).toBe(plain.snr);
    expect(plain.reweightedSnr / plain.snr).toBeLessThan(0.85);
    expect(allowed.reweightedSnr / allowed.snr).toBeGreaterThan(0.9);
    const probe = new Float64Array(64 * FS);
    addSineGaussian(probe, 40, 120, 9, 1e-21);
    const base = await loudest(probe, true);
    const glitchy = simulatedData({ psd: ajith2011, fs: FS, seconds: 64, seed: "glitch", fMin: FMIN });
    addSineGaussian(glitchy, 40, 120, 9, (1e-21 * 30) / base.snr);
    const glitch = await loudest(glitchy, false, { chi2Allowance: 0.03 });
    expect(glitch.reweightedSnr).toBeLessThan(opts.snrThreshold);
  });

  it("noise alone: no candidate above SNR 8 in 512 s of Gaussian noise with a few hundred templates", async () => {
    const data = simulatedData({ psd: ajith2011, fs: FS, seconds: 512, seed: "quiet", fMin: FMIN });
    const { candidates, summary } = await searchStrain(arrayInput(data, FS), opts);
    expect(bank.length).toBeGreaterThan(200);
    expect(summary.analysedSeconds).toBeGreaterThan(400);
    expect(candidates.filter((c) => c.snr > 8)).toHaveLength(0);
  });
});

// Gating of loud transients in whitened data (noise/gating.ts).
import { beforeAll, describe, expect, it } from "vitest";
import { DEFAULT_GATE_SETTINGS, ajith2011, arrayInput, colouredNoise, loadFftBackends, searchStrain } from "@chirpsieve/core";
import { optimalSnrOfSeries } from "../../packages/core/src/inject/optimalSnr.js";
import { createGater } from "../../packages/core/src/noise/gating.js";
import { interpolatePsd } from "../../packages/core/src/noise/interpolatePsd.js";
import { chirpMassGrid, standardSearch } from "./fixtures.js";

const FS = 2048;
const FMIN = 30;

beforeAll(async () => {
  await loadFftBackends();
});

describe("gating", () => {
  it("cuts a loud blip out of coloured noise and leaves the data elsewhere untouched", () => {
    const n = 1 << 17;
    const data = colouredNoise(ajith2011, n, FS, "gate-blip");
    const psd = interpolatePsd(ajith2011, FS / n, n / 2 + 1);
    const clean = data.slice();
    const at = 40_000;
    for (let i = -20; i <= 20; i++) data[at + i] += 1e-18 * Math.exp(-(i * i) / 40) * Math.sin(i); // ~1000× the noise
    const gates = createGater(n, FS).apply(data, n, psd, FMIN, 0.95 * (FS / 2), DEFAULT_GATE_SETTINGS);
    expect(gates).toHaveLength(1);
    expect(Math.abs(gates[0].peakSample - at)).toBeLessThan(5);
    expect(gates[0].peakSigma).toBeGreaterThan(100);
    const hw = DEFAULT_GATE_SETTINGS.halfWidthSeconds * FS;
    expect(gates[0].zeroStart).toBeLessThanOrEqual(at - hw);
    expect(gates[0].zeroEnd).toBeGreaterThanOrEqual(at + hw);
    // Far from the gate (beyond the taper and the whitening filter's reach) the data is as it was, to
    // float32 FFT rounding of the subtracted part.
    const far = 20_000;
    let maxDiff = 0;
    let maxAbs = 0;
    for (let i = 0; i < at - far; i++) {
      maxDiff = Math.max(maxDiff, Math.abs(data[i] - clean[i]));
      maxAbs = Math.max(maxAbs, Math.abs(clean[i]));
    }
    expect(maxDiff / maxAbs).toBeLessThan(1e-3);
  });

  it("never fires on Gaussian noise, so a scan of clean noise gives the same candidates with gating on or off", async () => {
    // At 20 σ the false-gate probability per sample is erfc(20/√2) ≈ 6e-89 (common practice, no source).
    const data = colouredNoise(ajith2011, 256 * FS, FS, "gate-quiet");
    const o = { ...standardSearch(chirpMassGrid(1.1, 1.3, 0.01, [0.9]), FMIN, 5.5), segmentSeconds: 128 };
    const on = await searchStrain(arrayInput(data, FS), o);
    const off = await searchStrain(arrayInput(data, FS), { ...o, gating: null });
    expect(on.summary.gates).toEqual([]);
    expect(on.candidates.length).toBeGreaterThan(0); // SNR 5.5 is reached by noise alone: the comparison is not empty
    expect(on.candidates).toEqual(off.candidates);
  });
});

describe("glitches from SNR 50 to 500", () => {
  /** Adds a sine-Gaussian (Q ≈ 9 at f0) of optimal SNR `snr` centred at t0. */
  function addGlitch(data: Float64Array, t0: number, f0: number, snr: number): void {
    const tau = 9 / (Math.SQRT2 * Math.PI * f0);
    const g = new Float64Array(data.length);
    for (let i = Math.floor((t0 - 6 * tau) * FS); i <= Math.ceil((t0 + 6 * tau) * FS); i++) {
      const t = i / FS - t0;
      g[i] = Math.exp(-(t * t) / (tau * tau)) * Math.sin(2 * Math.PI * f0 * t);
    }
    const scale = snr / optimalSnrOfSeries(g, ajith2011, FS, FMIN);
    for (let i = 0; i < data.length; i++) data[i] += scale * g[i];
  }

  it("raise no candidate with reweighted SNR above 6 (gated when loud, down-weighted by chi-squared otherwise)", async () => {
    const o = { ...standardSearch(chirpMassGrid(1.1, 1.3, 0.005, [0.9]).concat(chirpMassGrid(6, 9, 0.01, [0.8])), FMIN, 6), segmentSeconds: 128 };
    const data = colouredNoise(ajith2011, 256 * FS, FS, "gate-glitches");
    const glitches = [
      { t: 60, f0: 120, snr: 50 },
      { t: 100, f0: 250, snr: 100 },
      { t: 140, f0: 90, snr: 200 },
      { t: 180, f0: 150, snr: 500 },
    ];
    for (const g of glitches) addGlitch(data, g.t, g.f0, g.snr);
    const { candidates, summary } = await searchStrain(arrayInput(data, FS), o);
    for (const g of glitches) {
      const near = candidates.filter((c) => Math.abs(c.coalescenceTime - g.t) < 2);
      expect(near.filter((c) => c.reweightedSnr > 6), `glitch of SNR ${g.snr} at ${g.t} s`).toEqual([]);
    }
    // The loudest are gated (measured here: SNR 200 and 500 cross 20 σ), and each gate is reported once.
    const gated = summary.gates.map((x) => Math.round(x.time));
    expect(gated).toContain(140);
    expect(gated).toContain(180);
    expect(new Set(gated).size).toBe(gated.length);
  });
});

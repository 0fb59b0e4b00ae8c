// Injections with aligned spins: drawn from a stated prior, injected with spinning TaylorT4,
// recorded in the manifest; a population without spins is drawn exactly as before.
import { describe, expect, it } from "vitest";
import { InputError, ajith2011, drawInjections, injectionManifest } from "@chirpsieve/core";
import { checkInjection, projectInjection } from "../../packages/core/src/inject/injection.js";
import { formatInjectionManifest, parseInjections } from "../../packages/core/src/inject/manifest.js";
import { SITE_A } from "../../packages/core/src/waveform/antenna.js";

const base = { count: 6, massRangeSolar: [5, 15] as [number, number], distanceMpc: [100, 400] as [number, number], seed: "spin", duration: 400, fMinHz: 30 };

describe("drawInjections with a spin range", () => {
  it("draws each aligned spin uniformly inside the range, reproducibly, and leaves every other draw as without spins", () => {
    const plain = drawInjections(base);
    const spun = drawInjections({ ...base, spinRange: [-0.5, 0.8] });
    const again = drawInjections({ ...base, spinRange: [-0.5, 0.8] });
    expect(again).toEqual(spun);
    for (const inj of plain) expect(inj.primarySpin).toBeUndefined();
    for (let k = 0; k < spun.length; k++) {
      for (const chi of [spun[k].primarySpin!, spun[k].secondarySpin!]) {
        expect(chi).toBeGreaterThanOrEqual(-0.5);
        expect(chi).toBeLessThanOrEqual(0.8);
      }
      const { primarySpin, secondarySpin, coalescenceTime, ...rest } = spun[k];
      const { coalescenceTime: t0, ...restPlain } = plain[k];
      expect(rest).toEqual(restPlain); // masses, distance, angles: the same stream
      expect(Number.isFinite(coalescenceTime) && Number.isFinite(t0)).toBe(true);
      void primarySpin;
      void secondarySpin;
    }
  });
  it("has a mean near the middle of the range over many draws (uniform prior; 2000 draws, ±0.03)", () => {
    const many = drawInjections({ ...base, count: 1000, massRangeSolar: [20, 30], duration: 1000 * 6, spinRange: [0, 0.6] });
    const spins = many.flatMap((i) => [i.primarySpin!, i.secondarySpin!]);
    const mean = spins.reduce((a, b) => a + b, 0) / spins.length;
    expect(Math.abs(mean - 0.3)).toBeLessThan(0.03);
  });
  it("rejects a spin range outside (−1, 1) or reversed", () => {
    expect(() => drawInjections({ ...base, spinRange: [0, 1] })).toThrow(InputError);
    expect(() => drawInjections({ ...base, spinRange: [0.5, 0.1] })).toThrow(/spinRange/);
  });
});

describe("spinning injections in the strain and the manifest", () => {
  it("are projected with the spinning TaylorT4: an aligned spin lengthens the chirp (more samples from the same start frequency)", () => {
    const inj = { primaryMassSolar: 10, secondaryMassSolar: 6, coalescenceTime: 100, distanceMpc: 100, inclination: 0.3, rightAscension: 1, declination: 0.2, polarisation: 0.4, phase: 0 };
    const opts = { sampleRate: 2048, fMinHz: 30 };
    const none = projectInjection(inj, SITE_A, opts).data.length;
    const up = projectInjection({ ...inj, primarySpin: 0.7, secondarySpin: 0.7 }, SITE_A, opts).data.length;
    const down = projectInjection({ ...inj, primarySpin: -0.7, secondarySpin: -0.7 }, SITE_A, opts).data.length;
    expect(up).toBeGreaterThan(none);
    expect(down).toBeLessThan(none);
  });
  it("records the spins and the spin range in the manifest, and reads them back", () => {
    const injections = drawInjections({ ...base, count: 2, spinRange: [-0.2, 0.4], psd: ajith2011, sampleRate: 2048 });
    const manifest = injectionManifest(
      { noiseCurve: "ajith2011", noise: true, sampleRate: 2048, startTime: 0, duration: 400, fMinHz: 30, seed: "spin", detector: "site-a", spinRange: [-0.2, 0.4] },
      injections,
    );
    const text = formatInjectionManifest(manifest);
    const parsed = JSON.parse(text);
    expect(parsed.spinRange).toEqual([-0.2, 0.4]);
    const back = parseInjections(text, "m.json");
    expect(back.map((i) => [i.primarySpin, i.secondarySpin])).toEqual(injections.map((i) => [i.primarySpin, i.secondarySpin]));
  });
  it("a non-spinning manifest has no spin fields", () => {
    const injections = drawInjections({ ...base, count: 1 });
    const m = injectionManifest({ noiseCurve: "x", noise: false, sampleRate: 2048, startTime: 0, duration: 400, fMinHz: 30, seed: 1, detector: "site-a" }, injections);
    expect("spinRange" in m).toBe(false);
    expect("primarySpin" in m.injections[0]).toBe(false);
  });
  it("an injection file with a spin outside (−1, 1) is refused, naming the entry and the field", () => {
    const inj = { primaryMassSolar: 10, secondaryMassSolar: 6, coalescenceTime: 100, distanceMpc: 100, inclination: 0.3, rightAscension: 1, declination: 0.2, polarisation: 0.4, phase: 0, secondarySpin: 1.5 };
    expect(() => checkInjection(inj, "f.json: injection 0")).toThrow(/f\.json: injection 0: secondarySpin/);
  });
});

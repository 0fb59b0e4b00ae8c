import { describe, expect, it } from "vitest";
import kstest from "@stdlib/stats-kstest";
import { InputError, ajith2011, drawInjections, optimalSnr } from "@chirpsieve/core";
import { SITE_A } from "../../packages/core/src/waveform/antenna.js";
import { taylorT4Duration } from "../../packages/core/src/waveform/taylorT4Evolution.js";

describe("drawInjections", () => {
  const common = { massRangeSolar: [20, 30] as [number, number], fMinHz: 30, startTime: 1e9, seed: "population-1" };

  it("is reproducible from its seed and different for another seed", () => {
    const a = drawInjections({ ...common, count: 5, distanceMpc: [10, 200], duration: 64 });
    const b = drawInjections({ ...common, count: 5, distanceMpc: [10, 200], duration: 64 });
    const c = drawInjections({ ...common, count: 5, distanceMpc: [10, 200], duration: 64, seed: "population-2" });
    expect(b).toEqual(a);
    expect(c[0].primaryMassSolar).not.toBe(a[0].primaryMassSolar);
  });

  it("stays in its ranges, orders coalescences and keeps chirps apart by duration + gap", () => {
    const duration = 4000;
    const inj = drawInjections({ ...common, count: 400, distanceMpc: [10, 200], duration, marginSeconds: 3, gapSeconds: 2 });
    expect(inj).toHaveLength(400);
    for (let k = 0; k < inj.length; k++) {
      const x = inj[k];
      expect(x.primaryMassSolar).toBeGreaterThanOrEqual(x.secondaryMassSolar);
      expect(x.secondaryMassSolar).toBeGreaterThanOrEqual(20);
      expect(x.primaryMassSolar).toBeLessThanOrEqual(30);
      expect(x.distanceMpc).toBeGreaterThanOrEqual(10);
      expect(x.distanceMpc).toBeLessThanOrEqual(200);
      expect(x.inclination).toBeGreaterThanOrEqual(0);
      expect(x.inclination).toBeLessThanOrEqual(Math.PI);
      expect(Math.abs(x.declination)).toBeLessThanOrEqual(Math.PI / 2);
      expect(x.coalescenceTime).toBeGreaterThanOrEqual(1e9 + 3);
      expect(x.coalescenceTime).toBeLessThanOrEqual(1e9 + duration - 3);
      if (k > 0) {
        const gapNeeded = taylorT4Duration(x.primaryMassSolar, x.secondaryMassSolar, 30) + 2;
        expect(x.coalescenceTime - inj[k - 1].coalescenceTime).toBeGreaterThanOrEqual(gapNeeded);
      }
    }
    // Distance uniform in volume (D³ uniform), cos ι and sin δ uniform in [−1, 1]: Kolmogorov–Smirnov
    // tests (@stdlib/stats-kstest) at the 0.1% level on this fixed seed.
    const d3 = inj.map((x) => x.distanceMpc ** 3);
    expect(kstest(d3, "uniform", 10 ** 3, 200 ** 3).pValue).toBeGreaterThan(1e-3);
    expect(kstest(inj.map((x) => Math.cos(x.inclination)), "uniform", -1, 1).pValue).toBeGreaterThan(1e-3);
    expect(kstest(inj.map((x) => Math.sin(x.declination)), "uniform", -1, 1).pValue).toBeGreaterThan(1e-3);
    expect(kstest(inj.map((x) => x.rightAscension), "uniform", 0, 2 * Math.PI).pValue).toBeGreaterThan(1e-3);
  });

  it("scales distance to hit target SNRs drawn in snrRange", () => {
    const inj = drawInjections({
      ...common,
      massRangeSolar: [5, 15],
      count: 3,
      snrRange: [8, 20],
      duration: 64,
      psd: ajith2011,
      sampleRate: 2048,
    });
    for (const x of inj) {
      expect(x.optimalSnr).toBeGreaterThanOrEqual(8);
      expect(x.optimalSnr).toBeLessThanOrEqual(20);
      const again = optimalSnr(x, ajith2011, 2048, 30, SITE_A);
      expect(Math.abs(again / x.optimalSnr! - 1)).toBeLessThan(1e-9);
      expect(x.distanceMpc).toBeGreaterThan(0);
    }
  });

  it("refuses a series too short for the chirps, naming the duration", () => {
    expect(() => drawInjections({ ...common, massRangeSolar: [1, 1.5], count: 3, distanceMpc: [10, 20], duration: 100 })).toThrow(
      /duration 100 s is too short/,
    );
    expect(() => drawInjections({ ...common, count: 1, duration: 10 })).toThrow(InputError);
    expect(() => drawInjections({ ...common, count: 1, snrRange: [8, 10], duration: 10 })).toThrow(/needs psd/);
  });
});

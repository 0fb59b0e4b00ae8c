// Random injections where a scan can search them, and network SNRs for several sites.
import { describe, expect, it } from "vitest";
import { ajith2011, drawInjections, optimalSnr, unsearchableEdges } from "@chirpsieve/core";
import { SITE_A, SITE_B } from "../../packages/core/src/waveform/antenna.js";

const C = 299792458; // exact (SI)
const GM_SUN = 1.3271244e20; // IAU 2015 Resolution B3, nominal solar mass parameter

/** Newtonian time to coalescence from GW frequency f: (5/256)(G Mc/c³)^{-5/3}(πf)^{-8/3} (Peters 1964). */
function newtonianChirpTime(m1: number, m2: number, f: number): number {
  const mcSeconds = ((Math.pow(m1 * m2, 0.6) / Math.pow(m1 + m2, 0.2)) * GM_SUN) / C ** 3;
  return (5 / 256) * Math.pow(mcSeconds, -5 / 3) * Math.pow(Math.PI * f, -8 / 3);
}

describe("unsearchableEdges", () => {
  it("start: the lightest equal-mass chirp from fmin plus the filter; end: the filter (each + 0.1 s)", () => {
    const e = unsearchableEdges([1.4, 3], 20, 4);
    expect(e.tailSeconds).toBeCloseTo(4.1, 12);
    const chirp = e.leadInSeconds - 4.1;
    // Newtonian chirp time of 1.4+1.4 M_sun from 20 Hz: about 157 s (from memory, ±5%); the
    // template timing uses the longer of it and the 3.5PN duration, a few per cent longer.
    const tau0 = newtonianChirpTime(1.4, 1.4, 20);
    expect(tau0).toBeGreaterThan(150);
    expect(tau0).toBeLessThan(165);
    expect(chirp).toBeGreaterThanOrEqual(tau0 * (1 - 1e-9));
    expect(chirp).toBeLessThan(tau0 * 1.1);
    // Heavier ranges start later in frequency-time: a shorter lead-in.
    expect(unsearchableEdges([8, 12], 20, 4).leadInSeconds).toBeLessThan(e.leadInSeconds / 10);
  });
});

describe("drawInjections edges and network SNR", () => {
  const common = { massRangeSolar: [8, 12] as [number, number], fMinHz: 30, startTime: 1000, seed: "edges-1", psd: ajith2011, sampleRate: 2048 };

  it("keeps every coalescence time out of the lead-in and the tail", () => {
    const inj = drawInjections({ ...common, count: 6, snrRange: [8, 20], duration: 200, leadInSeconds: 30, tailSeconds: 15 });
    for (const x of inj) {
      expect(x.coalescenceTime).toBeGreaterThanOrEqual(1030);
      expect(x.coalescenceTime).toBeLessThanOrEqual(1185);
    }
    // Too short once the clear stretches are counted: the message says so.
    expect(() => drawInjections({ ...common, count: 1, snrRange: [8, 20], duration: 40, leadInSeconds: 30, tailSeconds: 15 })).toThrow(/kept clear at the start/);
  });

  it("with several detectors the drawn SNR is the network SNR: per-site SNRs add in quadrature to it within 1e-9", () => {
    const inj = drawInjections({ ...common, count: 8, snrRange: [12, 20], duration: 400, detectors: [SITE_A, SITE_B] });
    for (const x of inj) {
      expect(x.optimalSnr!).toBeGreaterThanOrEqual(12);
      expect(x.optimalSnr!).toBeLessThanOrEqual(20);
      const a = optimalSnr(x, ajith2011, 2048, 30, SITE_A);
      const b = optimalSnr(x, ajith2011, 2048, 30, SITE_B);
      expect(Math.abs(Math.hypot(a, b) / x.optimalSnr! - 1)).toBeLessThan(1e-9);
      expect(a).toBeLessThan(x.optimalSnr!); // no single site carries the whole network SNR
    }
  });
});

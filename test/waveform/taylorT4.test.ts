import { describe, expect, it } from "vitest";
import { InputError, M_SUN } from "@chirpsieve/core";
import { C, G, MPC, T_SUN } from "../../packages/core/src/physics/constants.js";
import { pnTimeToCoalescence } from "../../packages/core/src/waveform/chirpTimes.js";
import { gwCycleCounts } from "../../packages/core/src/waveform/cycles.js";
import { taylorT4 } from "../../packages/core/src/waveform/taylorT4.js";
import { taylorT4Coefficients, taylorT4Cycles, taylorT4Duration, taylorT4Evolution } from "../../packages/core/src/waveform/taylorT4Evolution.js";

import { energyDerivativeSeries, fluxSeries, seriesQuotient } from "./pnSeries.js";

/** Unwrapped GW phase 2φ of a face-on waveform (h+ = −A cos 2φ, h× = −A sin 2φ). */
function gwPhase(hPlus: Float64Array, hCross: Float64Array): Float64Array {
  const out = new Float64Array(hPlus.length);
  let prev = 0;
  let offset = 0;
  for (let i = 0; i < hPlus.length; i++) {
    let p = Math.atan2(-hCross[i], -hPlus[i]) + offset;
    while (p - prev > Math.PI) {
      p -= 2 * Math.PI;
      offset -= 2 * Math.PI;
    }
    while (p - prev < -Math.PI) {
      p += 2 * Math.PI;
      offset += 2 * Math.PI;
    }
    out[i] = p;
    prev = p;
  }
  return out;
}

/** Newtonian chirp ḟ = (96/5) π^{8/3} (G Mc / c³)^{5/3} f^{11/3} (Peters & Mathews, Phys. Rev. 131, 435 (1963)). */
function newtonianFdot(m1: number, m2: number, f: number): number {
  const mc = Math.pow(m1 * m2, 0.6) / Math.pow(m1 + m2, 0.2);
  return (96 / 5) * Math.pow(Math.PI, 8 / 3) * Math.pow(mc * T_SUN, 5 / 3) * Math.pow(f, 11 / 3);
}

/** Quadrupole amplitude h0 = 4 (G Mc)^{5/3} (π f)^{2/3} / (c⁴ D) (Peters & Mathews 1963). */
function quadrupoleH0(m1: number, m2: number, f: number, distanceMpc: number): number {
  const mc = (Math.pow(m1 * m2, 0.6) / Math.pow(m1 + m2, 0.2)) * M_SUN;
  return (4 * Math.pow(G * mc, 5 / 3) * Math.pow(Math.PI * f, 2 / 3)) / (Math.pow(C, 4) * distanceMpc * MPC);
}

describe("TaylorT4 coefficients", () => {
  it("equal the series quotient −F(v) / (dE/dv) of the 3PN energy and 3.5PN flux", () => {
    // Energy: Blanchet, Living Rev. Relativ. 17, 2 (2014), Eq. (233); flux: ibid., Eq. (314) (from memory;
    // the two recalled series and the recalled TaylorT4 table of Buonanno et al. 2009 agree to rounding).
    for (const eta of [0.25, 0.2, 0.1, 0.01]) {
      const q = seriesQuotient(fluxSeries(eta), energyDerivativeSeries(eta));
      const { a, a6Log } = taylorT4Coefficients(eta);
      for (let k = 0; k < 8; k++) expect(a[k]).toBeCloseTo(q[k], 10);
      expect(a6Log).toBeCloseTo(-856 / 105, 14); // the ln(16 v²) term of the flux passes through unchanged
    }
  });
});

describe("TaylorT4 evolution", () => {
  it("ends at the Schwarzschild ISCO: 1570 Hz for 1.4+1.4 M_sun", () => {
    // f = c³ / (6^{3/2} π G M) ≈ 1570 Hz for M = 2.8 M_sun (common practice, no source).
    expect(taylorT4Evolution(1.4, 1.4).fIscoHz).toBeCloseTo(1570.4, 0);
  });

  it("at Newtonian order reproduces τ0(f) − τ0(f_ISCO) exactly", () => {
    // τ0 = 5M / (256 η v⁸) (Peters 1964, as the Newtonian chirp time).
    const ev = taylorT4Evolution(10, 8, 0);
    const vs = ev.velocity(30);
    const t = ev.interval(vs, ev.vIsco).time;
    const tau = (v: number): number => (5 * ev.totalMassSeconds) / (256 * ev.eta * v ** 8);
    expect(Math.abs(t / (tau(vs) - tau(ev.vIsco)) - 1)).toBeLessThan(1e-9);
  });

  it("takes a time from 20 Hz to the ISCO within 0.5% of the TaylorF2 chirp time", () => {
    for (const [m1, m2] of [
      [1.4, 1.4],
      [10, 1.4],
      [10, 10],
    ]) {
      const t4 = taylorT4Duration(m1, m2, 20);
      const fIsco = taylorT4Evolution(m1, m2).fIscoHz;
      const f2 = pnTimeToCoalescence(20, m1, m2) - pnTimeToCoalescence(fIsco, m1, m2);
      expect(Math.abs(t4 / f2 - 1)).toBeLessThan(0.005); // measured 5e-6 (1.4+1.4), 4.5e-4 (10+1.4), 2.3e-4 (10+10)
      // The 1PN correction lengthens the chirp (+4/3 (743/336 + 11η/4) v² in the chirp time): T4 > Newtonian.
      const newtonian = taylorT4Evolution(m1, m2, 0).interval(taylorT4Evolution(m1, m2, 0).velocity(20), 1 / Math.sqrt(6)).time;
      expect(t4).toBeGreaterThan(newtonian);
    }
  });

  it("counts the published number of GW cycles from 10 Hz to the ISCO", () => {
    // Blanchet, Living Rev. Relativ. 17, 2 (2014), table of cycle counts (from memory):
    // Newtonian ≈ 16031 (1.4+1.4), 3576 (10+1.4), 601 (10+10); full 1.4+1.4 ≈ 16031 + 439 − 208 + 9 − 10 + 2 ≈ 16263.
    expect(Math.abs(taylorT4Cycles(1.4, 1.4, 10, undefined, 0) / 16031 - 1)).toBeLessThan(0.002); // measured 16035
    expect(Math.abs(taylorT4Cycles(10, 1.4, 10, undefined, 0) / 3576 - 1)).toBeLessThan(0.002);
    expect(Math.abs(taylorT4Cycles(10, 10, 10, undefined, 0) / 601 - 1)).toBeLessThan(0.005);
    expect(Math.abs(taylorT4Cycles(1.4, 1.4, 10) / 16263 - 1)).toBeLessThan(0.01);
    // Against the TaylorF2-side 3.5PN cycle count (a different PN re-expansion): within 1%.
    expect(Math.abs(taylorT4Cycles(1.4, 1.4, 10) / gwCycleCounts(1.4, 1.4, 10).total - 1)).toBeLessThan(0.01);
  });

  it("rejects bad masses and a start above the ISCO", () => {
    expect(() => taylorT4Evolution(-1, 1)).toThrow(InputError);
    expect(() => taylorT4Duration(10, 10, 500)).toThrow(/start frequency/);
  });
});

describe("TaylorT4 waveform", () => {
  const base = {
    massSolar1: 1.4,
    massSolar2: 1.4,
    distanceMpc: 100,
    inclination: 0,
    coalescencePhase: 0.3,
    sampleRate: 4096,
    gridStartTime: 0,
  };

  it("has as many cycles between 10 Hz and the ISCO as the quadrature says (zero crossings of h+)", () => {
    const fIsco = taylorT4Evolution(1.4, 1.4).fIscoHz;
    const wf = taylorT4({ ...base, coalescenceTime: 1100.37, fStartHz: 10, fEndHz: fIsco, startTaperCycles: 0, endTaperCycles: 0 });
    let crossings = 0;
    for (let i = 1; i < wf.hPlus.length; i++) if (wf.hPlus[i - 1] < 0 !== wf.hPlus[i] < 0) crossings++;
    const cycles = taylorT4Cycles(1.4, 1.4, 10, fIsco);
    expect(Math.abs(crossings / 2 - cycles)).toBeLessThan(1);
    // The first sample is within one sample of the 10 Hz crossing, which is the T4 duration before t_c.
    const tFirst = wf.startIndex / wf.sampleRate;
    expect(Math.abs(1100.37 - tFirst - taylorT4Duration(1.4, 1.4, 10))).toBeLessThan(1 / wf.sampleRate);
  });

  it("chirps like the Newtonian ḟ(f) at low frequency, within the size of the 1PN correction", () => {
    const wf = taylorT4({ ...base, coalescenceTime: 200, fStartHz: 20 });
    const phase = gwPhase(wf.hPlus, wf.hCross);
    const fs = wf.sampleRate;
    const ev = taylorT4Evolution(1.4, 1.4);
    const tau = Math.round(0.25 * fs);
    for (const i of [Math.round(10 * fs), Math.round(60 * fs)]) {
      const f = (phase[i + tau] - phase[i - tau]) / (2 * Math.PI * (2 * tau / fs));
      const fdot = (phase[i + tau] - 2 * phase[i] + phase[i - tau]) / (2 * Math.PI * (tau / fs) ** 2);
      const v = ev.velocity(f);
      const rel = fdot / newtonianFdot(1.4, 1.4, f) - 1;
      // Size of the 1PN term of ḟ: (743/336 + 11η/4) v² (Blanchet 2014, Eq. (314) over (233)); it lowers ḟ.
      const onePn = (743 / 336 + (11 / 4) * ev.eta) * v * v;
      expect(rel).toBeLessThan(0);
      expect(Math.abs(rel)).toBeLessThan(onePn);
      // And the sampled ḟ matches the TaylorT4 ODE itself, ḟ = 3 v² v̇ / (π M), to 1e-4.
      const analytic = (3 * v * v * ev.dvdt(v)) / (Math.PI * ev.totalMassSeconds);
      expect(Math.abs(fdot / analytic - 1)).toBeLessThan(1e-4);
    }
  });

  it("has face-on amplitude equal to the quadrupole h0 at the same frequency", () => {
    const wf = taylorT4({ ...base, coalescenceTime: 100, fStartHz: 30 });
    const phase = gwPhase(wf.hPlus, wf.hCross);
    const fs = wf.sampleRate;
    for (const i of [Math.round(5 * fs), Math.round(40 * fs), wf.hPlus.length - 2000]) {
      const f = (phase[i + 1] - phase[i - 1]) / (2 * Math.PI * (2 / fs));
      const amp = Math.hypot(wf.hPlus[i], wf.hCross[i]);
      expect(Math.abs(amp / quadrupoleH0(1.4, 1.4, f, 100) - 1)).toBeLessThan(1e-4);
    }
  });

  it("edge-on has no cross polarisation and half the plus amplitude", () => {
    const face = taylorT4({ ...base, coalescenceTime: 20, fStartHz: 60 });
    const edge = taylorT4({ ...base, inclination: Math.PI / 2, coalescenceTime: 20, fStartHz: 60 });
    expect(edge.startIndex).toBe(face.startIndex);
    let maxCross = 0;
    let maxPlus = 0;
    let maxDiff = 0;
    for (let i = 0; i < edge.hPlus.length; i++) {
      maxDiff = Math.max(maxDiff, Math.abs(edge.hPlus[i] - face.hPlus[i] / 2));
      maxCross = Math.max(maxCross, Math.abs(edge.hCross[i]));
      maxPlus = Math.max(maxPlus, Math.abs(edge.hPlus[i]));
    }
    expect(maxDiff).toBeLessThan(1e-14 * maxPlus);
    expect(maxCross).toBeLessThan(1e-15 * maxPlus); // cos(π/2) is 6e-17 in floating point
  });

  it("tapers smoothly in and out and never exceeds 0.9 × Nyquist by default", () => {
    const wf = taylorT4({ ...base, sampleRate: 2048, coalescenceTime: 20, fStartHz: 40 });
    expect(wf.fEndHz).toBeCloseTo(0.45 * 2048, 6);
    expect(Math.abs(wf.hPlus[0])).toBeLessThan(1e-3 * quadrupoleH0(1.4, 1.4, 40, 100));
    expect(Math.abs(wf.hPlus[wf.hPlus.length - 1])).toBeLessThan(0.05 * quadrupoleH0(1.4, 1.4, 900, 100));
    // The samples end before the 921.6 Hz crossing, which is before the coalescence time.
    expect((wf.startIndex + wf.hPlus.length - 1) / 2048).toBeLessThanOrEqual(wf.endTime);
    expect(wf.endTime).toBeLessThan(20);
  });

  it("rejects a distance of zero and an end frequency above the ISCO", () => {
    expect(() => taylorT4({ ...base, distanceMpc: 0, coalescenceTime: 1, fStartHz: 30 })).toThrow(/distance/);
    expect(() => taylorT4({ ...base, coalescenceTime: 1, fStartHz: 30, fEndHz: 3000 })).toThrow(/fEndHz/);
  });
});

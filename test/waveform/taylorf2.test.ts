import { describe, expect, it } from "vitest";
import { InputError } from "@chirpsieve/core";
import { C, MPC, T_SUN } from "../../packages/core/src/physics/constants.js";
import { chirpTimes, massesFromChirpTimes, pnTimeToCoalescence } from "../../packages/core/src/waveform/chirpTimes.js";
import { gwCycleCounts } from "../../packages/core/src/waveform/cycles.js";
import { EULER_GAMMA, orbitalPhaseCoefficients, taylorF2PhaseCoefficients } from "../../packages/core/src/waveform/pnCoefficients.js";
import { createTaylorF2Generator, taylorF2BinRange, taylorF2Into, taylorF2Phase } from "../../packages/core/src/waveform/taylorf2.js";

const fIsco = (mSolar: number) => 1 / (Math.pow(6, 1.5) * Math.PI * mSolar * T_SUN); // common practice

function maxRelDiff(a: Float64Array, b: Float64Array): number {
  let num = 0, den = 0;
  for (let i = 0; i < a.length; i++) {
    num = Math.max(num, Math.abs(a[i] - b[i]));
    den = Math.max(den, Math.abs(b[i]));
  }
  return num / den;
}

describe("createTaylorF2Generator", () => {
  const nBins = 1 << 15;
  const df = 1 / 16; // 16 s segments, up to 2048 Hz
  const cases: [number, number, number, number, number][] = [
    // m1, m2, fLow, distanceMpc, fHigh
    [1.4, 1.4, 30, 1, Infinity],
    [10, 1.4, 20, 40, Infinity],
    [30, 25, 15, 500, Infinity],
    [1, 1, 40, 3, 900],
    [3.3, 2.1, 25.03, 1, 1000.02],
  ];
  for (const pnOrder of [0, 4, 5, 6, 7]) {
    for (const [m1, m2, fLow, dist, fHigh] of cases) {
      it(`equals taylorF2Into to 1e-10 (pnOrder ${pnOrder}, ${m1}+${m2} M_sun from ${fLow} Hz)`, () => {
        const gen = createTaylorF2Generator(nBins, df, { pnOrder });
        const a = new Float64Array(2 * nBins).fill(NaN);
        const b = new Float64Array(2 * nBins).fill(NaN);
        const kA = gen.generate(a, fLow, m1, m2, dist, fHigh);
        const kB = taylorF2Into(b, nBins, df, fLow, m1, m2, dist, fHigh, pnOrder);
        expect(kA).toBe(kB);
        expect(maxRelDiff(a, b)).toBeLessThan(1e-10);
        // Bin by bin relative to that bin's magnitude as well.
        let worst = 0;
        for (let k = 0; k < nBins; k++) {
          const m = Math.hypot(b[2 * k], b[2 * k + 1]);
          if (m > 0) worst = Math.max(worst, Math.hypot(a[2 * k] - b[2 * k], a[2 * k + 1] - b[2 * k + 1]) / m);
        }
        expect(worst).toBeLessThan(1e-9);
      });
    }
  }

  it("reuses one grid for many templates and reports its grid", () => {
    const gen = createTaylorF2Generator(1024, 0.5);
    expect(gen.nBins).toBe(1024);
    expect(gen.dfHz).toBe(0.5);
    expect(gen.pnOrder).toBe(7);
    const out = new Float64Array(2048);
    expect(gen.generate(out, 20, 1.4, 1.4)).toBe(1024); // ISCO 1570 Hz is beyond the grid's 511.5 Hz
    expect(gen.generate(out, 20, 20, 20)).toBe(Math.floor(fIsco(40) / 0.5) + 1);
  });
});

describe("taylorF2Into", () => {
  const nBins = 8193;
  const df = 0.25;
  const m1 = 1.4, m2 = 1.4;

  it("is zero outside [fLow, f_isco], non-zero inside, and kEnd is one past the last non-zero bin", () => {
    const out = new Float64Array(2 * nBins + 6).fill(7); // garbage, plus a tail it must not touch
    const fLow = 30.1;
    const fHigh = 1000;
    const kEnd = taylorF2Into(out, nBins, df, fLow, m1, m2, 1, fHigh);
    expect(kEnd).toBe(4001); // 1000 Hz is bin 4000
    const kStart = 121; // first bin ≥ 30.1 Hz is 30.25 Hz
    expect(taylorF2BinRange(nBins, df, fLow, m1, m2, fHigh)).toEqual({ kStart, kEnd });
    for (let k = 0; k < nBins; k++) {
      const nonZero = out[2 * k] !== 0 || out[2 * k + 1] !== 0;
      expect(nonZero).toBe(k >= kStart && k < kEnd);
    }
    expect(Array.from(out.subarray(2 * nBins))).toEqual([7, 7, 7, 7, 7, 7]);
  });

  it("stops at the ISCO GW frequency of the total mass, c³/(6^{3/2} π G M) (≈1570 Hz for 2.8 M_sun; common practice)", () => {
    const out = new Float64Array(2 * nBins);
    const kEnd = taylorF2Into(out, nBins, df, 20, m1, m2);
    expect(fIsco(2.8)).toBeGreaterThan(1565);
    expect(fIsco(2.8)).toBeLessThan(1575);
    expect(kEnd).toBe(Math.floor(fIsco(2.8) / df) + 1);
  });

  it("returns 0 and writes zeros when fLow is above the ISCO", () => {
    const out = new Float64Array(2 * nBins).fill(1);
    expect(taylorF2Into(out, nBins, df, 1600, m1, m2)).toBe(0);
    expect(out.every((x) => x === 0)).toBe(true);
  });

  it("has |h̃| = sqrt(5/24) π^{−2/3} (c/D) (G Mc/c³)^{5/6} f^{−7/6} (Sathyaprakash & Schutz, Living Rev. Relativ. 12, 2 (2009))", () => {
    const out = new Float64Array(2 * nBins);
    const dist = 40;
    taylorF2Into(out, nBins, df, 20, 10, 1.4, dist);
    const eta = (10 * 1.4) / (11.4 * 11.4);
    const mc = Math.pow(eta, 0.6) * 11.4 * T_SUN;
    for (const k of [80, 400, 1000]) {
      const f = k * df;
      const expected = Math.sqrt(5 / 24) * Math.pow(Math.PI, -2 / 3) * (C / (dist * MPC)) * Math.pow(mc, 5 / 6) * Math.pow(f, -7 / 6);
      expect(Math.hypot(out[2 * k], out[2 * k + 1]) / expected).toBeCloseTo(1, 12);
    }
    // 1.4+1.4 at 1 Mpc, 100 Hz: ≈ 1.7e-22 /Hz·s scale (order-of-magnitude check; common practice, no source).
    const o2 = new Float64Array(2 * nBins);
    taylorF2Into(o2, nBins, df, 20, 1.4, 1.4, 1);
    const a100 = Math.hypot(o2[800], o2[801]);
    expect(a100).toBeGreaterThan(1e-23);
    expect(a100).toBeLessThan(1e-21);
  });

  it("has phase −Ψ(f) with Ψ from taylorF2Phase, i.e. h̃ = |h̃| e^{−iΨ}", () => {
    const out = new Float64Array(2 * nBins);
    taylorF2Into(out, nBins, df, 20, 10, 1.4);
    for (const k of [81, 333, 1234]) {
      const psi = taylorF2Phase(k * df, 10, 1.4);
      const mag = Math.hypot(out[2 * k], out[2 * k + 1]);
      expect(out[2 * k] / mag).toBeCloseTo(Math.cos(psi), 9);
      expect(out[2 * k + 1] / mag).toBeCloseTo(-Math.sin(psi), 9);
    }
  });

  it("scales as 1/distance", () => {
    const a = new Float64Array(2 * nBins);
    const b = new Float64Array(2 * nBins);
    taylorF2Into(a, nBins, df, 20, 5, 5, 1);
    taylorF2Into(b, nBins, df, 20, 5, 5, 250);
    expect(maxRelDiff(b.map((x) => x * 250), a)).toBeLessThan(1e-14);
  });
});

describe("taylorF2Phase and the PN coefficients", () => {
  it("is −π/4 + 3/(128 η v⁵) at Newtonian order", () => {
    const m1 = 10, m2 = 1.4, f = 57;
    const eta = (m1 * m2) / ((m1 + m2) * (m1 + m2));
    const v = Math.cbrt(Math.PI * (m1 + m2) * T_SUN * f);
    expect(taylorF2Phase(f, m1, m2, 0)).toBeCloseTo(-Math.PI / 4 + 3 / (128 * eta * v ** 5), 8);
  });

  it("has the published 1PN and 1.5PN coefficients 20/9 (743/336 + 11η/4) and −16π (Blanchet, Living Rev. Relativ. 17, 2 (2014))", () => {
    const { a, b } = taylorF2PhaseCoefficients(0.2);
    expect(a[2]).toBeCloseTo((20 / 9) * (743 / 336 + (11 / 4) * 0.2), 12);
    expect(a[3]).toBeCloseTo(-16 * Math.PI, 12);
    expect(a[1]).toBe(0);
    expect(b[6]).toBeCloseTo(-6848 / 21, 12);
    expect(b[5]).toBeCloseTo(3 * Math.PI * (38645 / 756 - (65 / 9) * 0.2), 12);
    const trunc = taylorF2PhaseCoefficients(0.2, 3);
    expect(Array.from(trunc.a.subarray(4))).toEqual([0, 0, 0, 0]);
    expect(Array.from(trunc.b)).toEqual([0, 0, 0, 0, 0, 0, 0, 0]);
  });

  it("matches the orbital phase through the SPA identity φ_GW(f) = 2π f t(f) − Ψ(f) − π/4 (two independently typed coefficient sets)", () => {
    // Stationary phase: Ψ(f) = 2π f t_f − φ_GW(t_f) − π/4 with t_f = −τ(f) for t_c = 0; common practice.
    // Cycles from the Blanchet (2014) orbital phase must equal the change of this φ_GW / 2π.
    for (const [m1, m2] of [[1.4, 1.4], [10, 1.4], [30, 3]]) {
      const gwPhase = (f: number) => -2 * Math.PI * f * pnTimeToCoalescence(f, m1, m2) - taylorF2Phase(f, m1, m2) - Math.PI / 4;
      const f1 = 15;
      for (const f2 of [40, 150, 0.9 * fIsco(m1 + m2)]) {
        const fromF2 = (gwPhase(f2) - gwPhase(f1)) / (2 * Math.PI);
        const fromOrbit = gwCycleCounts(m1, m2, f1, f2).total;
        expect(Math.abs(fromF2 - fromOrbit)).toBeLessThan(1e-8 * Math.abs(fromOrbit));
      }
    }
  });

  it("pnTimeToCoalescence equals τ0 at Newtonian order and the 3.5PN chirp-time series (Blanchet, Living Rev. Relativ. 17, 2 (2014); from memory)", () => {
    const m1 = 10, m2 = 1.4, f = 30;
    expect(pnTimeToCoalescence(f, m1, m2, 0)).toBeCloseTo(chirpTimes(m1, m2, f).tau0, 10);
    // Newtonian + 1.5PN of the series is τ0 − τ3 (Sathyaprakash, Phys. Rev. D 50, R7111 (1994)).
    const ct = chirpTimes(m1, m2, f);
    const eta = (m1 * m2) / ((m1 + m2) * (m1 + m2));
    const mS = (m1 + m2) * T_SUN;
    const v = Math.cbrt(Math.PI * mS * f);
    const pi = Math.PI;
    const series =
      1 +
      (743 / 252 + (11 / 3) * eta) * v ** 2 -
      ((32 * pi) / 5) * v ** 3 +
      (3058673 / 508032 + (5429 / 504) * eta + (617 / 72) * eta ** 2) * v ** 4 -
      (7729 / 252 - (13 / 3) * eta) * pi * v ** 5 +
      (-10052469856691 / 23471078400 +
        (128 / 3) * pi ** 2 +
        (6848 / 105) * EULER_GAMMA +
        (3147553127 / 3048192 - (451 / 12) * pi ** 2) * eta -
        (15211 / 1728) * eta ** 2 +
        (25565 / 1296) * eta ** 3 +
        (3424 / 105) * Math.log(16 * v * v)) *
        v ** 6 +
      (-15419335 / 127008 - (75703 / 756) * eta + (14809 / 378) * eta ** 2) * pi * v ** 7;
    const expected = ((5 * mS) / (256 * eta * v ** 8)) * series;
    expect(pnTimeToCoalescence(f, m1, m2, 7) / expected).toBeCloseTo(1, 10);
    const n15 = ((5 * mS) / (256 * eta * v ** 8)) * (1 - ((32 * pi) / 5) * v ** 3);
    expect(ct.tau0 - ct.tau3).toBeCloseTo(n15, 10);
  });

  it("orbital phase coefficients reduce to −1/(32 η v⁵) at Newtonian order", () => {
    const { a } = orbitalPhaseCoefficients(0.25, 0);
    expect(Array.from(a)).toEqual([1, 0, 0, 0, 0, 0, 0, 0]);
  });
});

describe("chirp times", () => {
  it("round-trips masses → (τ0, τ3) → masses, heavier first", () => {
    for (const [m1, m2, f] of [[1.4, 1.4, 40], [10, 1.4, 30], [1.4, 10, 30], [35, 30, 15], [100, 1, 10]]) {
      const { tau0, tau3 } = chirpTimes(m1, m2, f);
      const back = massesFromChirpTimes(tau0, tau3, f);
      expect(back).not.toBeNull();
      expect(back!.m1Solar).toBeCloseTo(Math.max(m1, m2), 8);
      expect(back!.m2Solar).toBeCloseTo(Math.min(m1, m2), 8);
    }
  });

  it("returns null when the chirp times imply η > 1/4", () => {
    const { tau0, tau3 } = chirpTimes(1.4, 1.4, 40);
    expect(massesFromChirpTimes(tau0, tau3 * 0.8, 40)).toBeNull();
  });
});

describe("bad inputs throw InputError (one line naming the parameter)", () => {
  const out = new Float64Array(200);
  const cases: [string, () => unknown, RegExp][] = [
    ["m1 ≤ 0", () => taylorF2Into(out, 100, 1, 20, 0, 1.4), /m1Solar/],
    ["m2 NaN", () => taylorF2Into(out, 100, 1, 20, 1.4, NaN), /m2Solar/],
    ["fLow ≤ 0", () => taylorF2Into(out, 100, 1, 0, 1.4, 1.4), /fMinHz/],
    ["df ≤ 0", () => taylorF2Into(out, 100, -1, 20, 1.4, 1.4), /dfHz/],
    ["out too short", () => taylorF2Into(out, 101, 1, 20, 1.4, 1.4), /out must be/],
    ["nBins not an integer", () => taylorF2Into(out, 10.5, 1, 20, 1.4, 1.4), /nBins/],
    ["distance 0", () => taylorF2Into(out, 100, 1, 20, 1.4, 1.4, 0), /distanceMpc/],
    ["fHigh negative", () => taylorF2Into(out, 100, 1, 20, 1.4, 1.4, 1, -5), /fMaxHz/],
    ["pnOrder 8", () => taylorF2Into(out, 100, 1, 20, 1.4, 1.4, 1, Infinity, 8), /pnOrder/],
    ["generator df", () => createTaylorF2Generator(100, 0), /dfHz/],
    ["generator nBins", () => createTaylorF2Generator(0, 1), /nBins/],
    ["generator pnOrder", () => createTaylorF2Generator(100, 1, { pnOrder: 2.5 }), /pnOrder/],
    ["generate out too short", () => createTaylorF2Generator(101, 1).generate(out, 20, 1.4, 1.4), /out must be/],
    ["generate mass", () => createTaylorF2Generator(100, 1).generate(out, 20, -1, 1.4), /m1Solar/],
    ["phase f", () => taylorF2Phase(-3, 1.4, 1.4), /fHz/],
    ["chirp times fLow", () => chirpTimes(1.4, 1.4, Infinity), /fMinHz/],
    ["masses from chirp times", () => massesFromChirpTimes(0, 1, 40), /tau0/],
    ["time to coalescence", () => pnTimeToCoalescence(30, 1.4, 0), /m2Solar/],
    ["cycles band", () => gwCycleCounts(1.4, 1.4, 100, 50), /fMaxHz/],
    ["eta > 1/4", () => taylorF2PhaseCoefficients(0.3), /eta/],
  ];
  for (const [name, fn, re] of cases) {
    it(name, () => {
      let err: unknown;
      try {
        fn();
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(InputError);
      expect((err as Error).message).toMatch(re);
      expect((err as Error).message).not.toContain("\n");
    });
  }
});

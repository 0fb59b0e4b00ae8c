import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { InputError, M_SUN, chirpMass } from "@chirpsieve/core";
import { chirpMassFromFrequencyDerivative, frequencyDerivative, gwCycleCount, luminosityDistanceFromChirp, timeToCoalescenceFromGwFrequency } from "../../packages/core/src/physics/chirp.js";
import { MPC } from "../../packages/core/src/physics/constants.js";
import { strainAmplitude } from "../../packages/core/src/physics/quadrupole.js";

describe("the leading-order chirp", () => {
  it("ḟ scales as Mc^{5/3} f^{11/3}", () => {
    const mc = 1.2 * M_SUN;
    const d = frequencyDerivative(mc, 50);
    expect(frequencyDerivative(mc, 100) / d).toBeCloseTo(2 ** (11 / 3), 10);
    expect(frequencyDerivative(8 * mc, 50) / d).toBeCloseTo(32, 9);
  });

  it("τ = (3/8) f / ḟ (time to coalescence from the chirp itself)", () => {
    const mc = 20 * M_SUN, f = 40;
    expect(timeToCoalescenceFromGwFrequency(mc, f) / ((3 / 8) * (f / frequencyDerivative(mc, f)))).toBeCloseTo(1, 12);
  });

  it("returns the chirp mass of a known binary from its (f, ḟ)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.5, max: 100, noNaN: true }),
        fc.double({ min: 0.5, max: 100, noNaN: true }),
        fc.double({ min: 1e-4, max: 1e3, noNaN: true }),
        (a, b, f) => {
          const mc = chirpMass(a * M_SUN, b * M_SUN);
          expect(chirpMassFromFrequencyDerivative(f, frequencyDerivative(mc, f)) / mc).toBeCloseTo(1, 11);
        },
      ),
      { seed: 1986, numRuns: 200 },
    );
  });

  it("returns the distance of a known binary from (f, ḟ, h0)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.5, max: 100, noNaN: true }),
        fc.double({ min: 1, max: 1000, noNaN: true }),
        fc.double({ min: 1e-3, max: 1e4, noNaN: true }),
        (mcSolar, f, dMpc) => {
          const mc = mcSolar * M_SUN;
          const d = dMpc * MPC;
          const h = strainAmplitude(mc, f, d);
          expect(luminosityDistanceFromChirp(f, frequencyDerivative(mc, f), h) / d).toBeCloseTo(1, 11);
        },
      ),
      { seed: 310, numRuns: 200 },
    );
  });

  it("counts GW cycles as ∫ f / ḟ df (numerical check with the trapezoid rule in ln f)", () => {
    const mc = chirpMass(10 * M_SUN, 10 * M_SUN);
    const f1 = 20, f2 = 200, n = 20000;
    let sum = 0;
    for (let i = 0; i <= n; i++) {
      const f = f1 * Math.pow(f2 / f1, i / n);
      const g = (f * f) / frequencyDerivative(mc, f); // f/ḟ · df, df = f d(ln f)
      sum += (i === 0 || i === n ? 0.5 : 1) * g;
    }
    const numeric = sum * (Math.log(f2 / f1) / n);
    expect(gwCycleCount(mc, f1, f2) / numeric).toBeCloseTo(1, 6);
  });

  it("rejects bad input with InputError naming the parameter", () => {
    expect(() => frequencyDerivative(M_SUN, 0)).toThrow(/frequencyDerivative: gwFrequency \(Hz\) must be a positive finite number \(got 0\)/);
    expect(() => chirpMassFromFrequencyDerivative(30, -1)).toThrow(/frequencyDerivative \(Hz\/s\)/);
    expect(() => luminosityDistanceFromChirp(30, 1, NaN)).toThrow(/h0/);
    expect(() => timeToCoalescenceFromGwFrequency(-M_SUN, 30)).toThrow(/chirpMass/);
    expect(() => gwCycleCount(M_SUN, 100, 10)).toThrow(/gwCycleCount: f2 must exceed f1/);
    expect(() => gwCycleCount(M_SUN, 0, 10)).toThrow(InputError);
  });
});

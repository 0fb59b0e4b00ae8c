import { describe, expect, it } from "vitest";
import { AU, InputError, M_SUN, PARSEC, chirpMass, describeBinary, describeChirp } from "@chirpsieve/core";
import { frequencyDerivative, timeToCoalescenceFromGwFrequency } from "../../packages/core/src/physics/chirp.js";
import { iscoSeparation } from "../../packages/core/src/physics/isco.js";
import { strainAmplitude } from "../../packages/core/src/physics/quadrupole.js";

describe("describeBinary", () => {
  it("gives the same orbit from separation, GW frequency or orbital period", () => {
    const m1 = 1.4 * M_SUN, m2 = 1.2 * M_SUN;
    const bySep = describeBinary({ m1, m2, separation: 1e6 });
    const byF = describeBinary({ m1, m2, gwFrequency: bySep.gwFrequency });
    const byP = describeBinary({ m1: m2, m2: m1, orbitalPeriod: bySep.orbitalPeriod });
    for (const d of [byF, byP]) {
      expect(d.separation / 1e6).toBeCloseTo(1, 12);
      expect(d.m1).toBe(m1); // sorted heavier first
      expect(d.timeToCoalescence! / bySep.timeToCoalescence!).toBeCloseTo(1, 10);
    }
    expect(bySep.gwFrequency * bySep.orbitalPeriod).toBeCloseTo(2, 12);
    expect(bySep.timeToCoalescence! / timeToCoalescenceFromGwFrequency(bySep.chirpMass, bySep.gwFrequency)).toBeCloseTo(1, 10);
  });

  it("adds the strain at a distance and h+/h× with an inclination", () => {
    const d = describeBinary({ m1: M_SUN, m2: M_SUN, separation: 50 * AU, distance: 10 * PARSEC, inclination: Math.PI / 2 });
    expect(d.strainAmplitude).toBe(strainAmplitude(d.chirpMass, d.gwFrequency, 10 * PARSEC));
    expect(d.strainPlus! / d.strainAmplitude!).toBeCloseTo(0.5, 12);
    expect(d.strainCross!).toBeCloseTo(0, 30);
    expect(d.frequencyDerivative).toBe(frequencyDerivative(d.chirpMass, d.gwFrequency));
  });

  it("applies the eccentricity only to the period derivative", () => {
    const circ = describeBinary({ m1: M_SUN, m2: M_SUN, separation: 1e9 });
    const ecc = describeBinary({ m1: M_SUN, m2: M_SUN, separation: 1e9, eccentricity: 0.5 });
    expect(ecc.orbitalPeriodDerivative! / circ.orbitalPeriodDerivative!).toBeCloseTo(ecc.eccentricityEnhancement, 12);
    expect(ecc.timeToCoalescence).toBe(circ.timeToCoalescence);
    expect(ecc.frequencyDerivative).toBe(circ.frequencyDerivative);
  });

  it("flags a separation inside the ISCO and gives no inspiral quantities", () => {
    const m = 10 * M_SUN;
    const d = describeBinary({ m1: m, m2: m, separation: 0.5 * iscoSeparation(2 * m), distance: PARSEC });
    expect(d.insideIsco).toBe(true);
    expect(d.timeToCoalescence).toBeNull();
    expect(d.frequencyDerivative).toBeNull();
    expect(d.strainAmplitude).toBeNull();
    expect(describeBinary({ m1: m, m2: m, gwFrequency: d.iscoGwFrequency }).insideIsco).toBe(false);
  });

  it("rejects missing or doubled orbital quantities and bad values with InputError", () => {
    expect(() => describeBinary({ m1: M_SUN, m2: M_SUN })).toThrow(/exactly one of separation, gwFrequency, orbitalPeriod \(got none\)/);
    expect(() => describeBinary({ m1: M_SUN, m2: M_SUN, separation: 1, gwFrequency: 1 })).toThrow(/got separation, gwFrequency/);
    expect(() => describeBinary({ m1: -M_SUN, m2: M_SUN, separation: 1e9 })).toThrow(/m1/);
    expect(() => describeBinary({ m1: M_SUN, m2: M_SUN, separation: 1e9, eccentricity: 1 })).toThrow(/eccentricity/);
    expect(() => describeBinary({ m1: M_SUN, m2: M_SUN, separation: 1e9, distance: 0 })).toThrow(/distance/);
    expect(() => describeBinary({ m1: M_SUN, m2: M_SUN, separation: 1e9, inclination: 1 })).toThrow(InputError);
  });
});

describe("describeChirp", () => {
  it("round-trips a binary: chirp mass, distance and coalescence time", () => {
    const mc = chirpMass(36 * M_SUN, 29 * M_SUN);
    const f = 35, d = 4e8 * PARSEC;
    const c = describeChirp({ gwFrequency: f, frequencyDerivative: frequencyDerivative(mc, f), strain: strainAmplitude(mc, f, d) });
    expect(c.chirpMass / mc).toBeCloseTo(1, 11);
    expect(c.luminosityDistance! / d).toBeCloseTo(1, 11);
    expect(c.timeToCoalescence / timeToCoalescenceFromGwFrequency(mc, f)).toBeCloseTo(1, 10);
    expect(c.beyondIsco).toBe(false);
    expect(describeChirp({ gwFrequency: f, frequencyDerivative: 1 }).luminosityDistance).toBeNull();
  });

  it("flags a frequency above every ISCO of that chirp mass", () => {
    const mc = 30 * M_SUN;
    const c = describeChirp({ gwFrequency: 1000, frequencyDerivative: frequencyDerivative(mc, 1000) });
    expect(c.beyondIsco).toBe(true);
  });

  it("rejects bad input with InputError naming the parameter", () => {
    expect(() => describeChirp({ gwFrequency: 30, frequencyDerivative: 0 })).toThrow(/frequencyDerivative/);
    expect(() => describeChirp({ gwFrequency: 30, frequencyDerivative: 1, strain: -1 })).toThrow(/strain/);
  });
});

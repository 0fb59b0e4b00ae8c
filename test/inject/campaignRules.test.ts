import { describe, expect, it } from "vitest";
import { evaluateRequirements, parseRequirement, summariseCampaign, type Candidate, type Injection, type InjectionOutcome } from "@chirpsieve/core";
import { arrivalTimeAt, matchInjections } from "../../packages/core/src/inject/matchInjections.js";
import { SITE_A } from "../../packages/core/src/waveform/antenna.js";

function injection(t: number): Injection {
  return { primaryMassSolar: 1.4, secondaryMassSolar: 1.4, coalescenceTime: t, distanceMpc: 100, inclination: 0.3, rightAscension: 1.1, declination: 0.4, polarisation: 0.2, phase: 0.7 };
}

function candidate(t: number, snr: number): Candidate {
  return {
    coalescenceTime: t,
    snr,
    phase: 0,
    chi2: 0,
    chi2Dof: 0,
    reweightedSnr: snr,
    primaryMassSolar: 1.4,
    secondaryMassSolar: 1.4,
    chirpMassSolar: 1.2188,
    primarySpin: 0,
    secondarySpin: 0,
    effectiveSpin: 0,
    effectiveDistanceMpc: 100,
    templateIndex: 0,
    file: "<memory>",
  };
}

describe("matchInjections", () => {
  it("matches by arrival time at the detector, keeps the loudest match, and counts the rest near no injection as false", () => {
    const injs = [injection(100), injection(200)];
    const a0 = arrivalTimeAt(injs[0], SITE_A);
    const a1 = arrivalTimeAt(injs[1], SITE_A);
    expect(Math.abs(a0 - 100)).toBeLessThan(0.0214); // the plane-wave delay is at most R_earth / c
    const cands = [candidate(a0 + 0.002, 9), candidate(a0 - 0.05, 12), candidate(150, 8), candidate(a1 + 0.2, 10)];
    const m = matchInjections(injs, cands, SITE_A, 0.1);
    expect(m.matched).toEqual([1, -1]);
    expect(m.unmatched).toEqual([2, 3]);
    expect(() => matchInjections(injs, cands, SITE_A, 0)).toThrow(/match window/);
  });
});

function outcome(i: number, snr: number, found: boolean, distanceMpc = 100, mcErr = 0.001, tErr = 0.0005): InjectionOutcome {
  return {
    index: i,
    batch: 0,
    primaryMassSolar: 1.4,
    secondaryMassSolar: 1.4,
    chirpMassSolar: 1.2188,
    primarySpin: 0,
    secondarySpin: 0,
    coalescenceTime: 10 * i,
    arrivalTime: 10 * i,
    distanceMpc,
    inclination: 0,
    rightAscension: 0,
    declination: 0,
    polarisation: 0,
    phase: 0,
    optimalSnr: snr,
    found,
    recoveredSnr: found ? snr : null,
    reweightedSnr: found ? snr : null,
    recoveredChirpMassSolar: found ? 1.2188 * (1 + mcErr) : null,
    chirpMassError: found ? mcErr : null,
    timeError: found ? tErr : null,
  };
}

describe("requirements", () => {
  it("parses the five rule forms (spaces allowed) and rejects anything else naming the grammar", () => {
    expect(parseRequirement("efficiency>=0.95@snr>=10")).toEqual({ kind: "efficiency-snr", rule: "efficiency>=0.95@snr>=10", threshold: 0.95, snrMin: 10 });
    expect(parseRequirement(" efficiency >= .5 @ distance <= 120 ")).toMatchObject({ kind: "efficiency-distance", threshold: 0.5, distanceMaxMpc: 120 });
    expect(parseRequirement("chirp-mass-error<=0.02")).toMatchObject({ kind: "chirp-mass-error", threshold: 0.02 });
    expect(parseRequirement("time-error<=1e-3")).toMatchObject({ kind: "time-error", threshold: 0.001 });
    expect(parseRequirement("false-candidates<=3")).toMatchObject({ kind: "false-candidates", threshold: 3 });
    for (const bad of ["efficiency>0.9@snr>=10", "efficiency>=0.9", "efficiency>=1.5@snr>=10", "snr>=7", "false-candidates<=2.5", "chirp-mass-error<=x", ""]) {
      expect(() => parseRequirement(bad)).toThrow(/requirement/);
    }
  });

  it("evaluates each rule, saying by how much it was met or missed", () => {
    const outs = [outcome(0, 12, true, 50), outcome(1, 11, true, 80), outcome(2, 10.5, false, 150), outcome(3, 6, false, 300)];
    const summary = summariseCampaign(outs, [{ batch: 0, coalescenceTime: 5, snr: 7, reweightedSnr: 6, chirpMassSolar: 1.2 }], { count: 4, massRangeSolar: [1.3, 1.5], snrRange: [5, 15], seed: "x" }, 100);
    const res = evaluateRequirements(
      [
        parseRequirement("efficiency>=0.6@snr>=10"),
        parseRequirement("efficiency>=0.9@distance<=100"),
        parseRequirement("chirp-mass-error<=0.0005"),
        parseRequirement("time-error<=0.001"),
        parseRequirement("false-candidates<=0"),
        parseRequirement("efficiency>=0.5@snr>=50"),
      ],
      outs,
      summary,
    );
    expect(res.map((r) => r.met)).toEqual([true, true, false, true, false, false]);
    expect(res[0].value).toBeCloseTo(2 / 3, 12);
    expect(res[0].detail).toMatch(/2 of 3 injections with optimal SNR ≥ 10/);
    expect(res[2].detail).toMatch(/0\.0005 above 0\.0005/);
    expect(res[4]).toMatchObject({ value: 1, threshold: 0 });
    expect(res[5]).toMatchObject({ value: null, met: false });
  });
});

describe("summariseCampaign", () => {
  it("counts found/missed, bins by SNR over the drawn range and leaves distance figures out for an SNR-drawn population", () => {
    const outs = [outcome(0, 5.5, false), outcome(1, 6.5, false), outcome(2, 7.5, true), outcome(3, 8.5, true), outcome(4, 9.5, true)];
    const s = summariseCampaign(outs, [], { count: 5, massRangeSolar: [1.3, 1.5], snrRange: [5, 10], seed: "x" }, 50);
    expect([s.injections, s.found, s.missed, s.efficiency]).toEqual([5, 3, 2, 0.6]);
    expect(s.efficiencyBySnr.map((b) => [b.snrLow, b.snrHigh, b.found, b.total])).toEqual([
      [5, 6, 0, 1],
      [6, 7, 0, 1],
      [7, 8, 1, 1],
      [8, 9, 1, 1],
      [9, 10, 1, 1],
    ]);
    expect(s.snr50).toBeCloseTo(7, 12);
    expect(s.distance50Mpc).toBeNull();
    expect(s.sensitiveVolumeMpc3).toBeNull();
    expect(s.chirpMassError).toEqual({ median: 0.001, p05: 0.001, p95: 0.001, medianAbsolute: 0.001 });
    expect(Object.keys(s)).toEqual([
      "injections", "found", "missed", "efficiency", "efficiencyLower", "efficiencyUpper", "interval", "efficiencyBySnr", "snr50",
      "efficiencyByDistance", "distance50Mpc", "sensitiveVolumeMpc3", "sensitiveVolumeErrorMpc3", "volumeMethod", "chirpMassError",
      "timeErrorSeconds", "snrRatio", "falseCandidates", "analysedSeconds",
    ]);
  });

  it("gives the 50% distance and a Monte Carlo volume for a distance-drawn population", () => {
    const outs = Array.from({ length: 100 }, (_, i) => outcome(i, 10, 10 + i * 2.9 < 150, 10 + i * 2.9));
    const s = summariseCampaign(outs, [], { count: 100, massRangeSolar: [1.3, 1.5], distanceMpc: [10, 300], seed: "x" }, 50);
    expect(s.efficiencyByDistance).toHaveLength(10);
    expect(s.distance50Mpc!).toBeGreaterThan(125);
    expect(s.distance50Mpc!).toBeLessThan(175);
    expect(s.sensitiveVolumeMpc3!).toBeGreaterThan(0);
  });
});

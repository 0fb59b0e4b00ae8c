import { describe, expect, it } from "vitest";
import { T_SUN, chirpTimes, gwCycleCounts, massesFromChirpTimes, pnTimeToCoalescence } from "@chirpsieve/core";

// Outside checks of the PN phasing behind TaylorF2: cycle counts and chirp times.

describe("GW cycles from 10 Hz to the ISCO against Blanchet, Living Rev. Relativ. 17, 2 (2014), table of cycle counts", () => {
  // Values from memory; tolerances reflect that.
  const table: { masses: [number, number]; newtonian: number; pn1: number; pn15: number }[] = [
    { masses: [1.4, 1.4], newtonian: 16031, pn1: 439, pn15: -208 },
    { masses: [10, 1.4], newtonian: 3576, pn1: 213, pn15: -181 },
    { masses: [10, 10], newtonian: 601, pn1: 59, pn15: -51 },
  ];
  for (const { masses, newtonian, pn1, pn15 } of table) {
    it(`${masses[0]}+${masses[1]} M_sun: Newtonian ≈ ${newtonian} (1%), 1PN ≈ +${pn1} (5%), 1.5PN ≈ ${pn15} (5%)`, () => {
      const c = gwCycleCounts(masses[0], masses[1], 10);
      const [n0, n1, n2, n3, n4, n5, n6, n7] = c.byTwicePnOrder;
      console.log(
        `${masses.join("+")}: N ${n0.toFixed(1)}, 0.5PN ${n1}, 1PN ${n2.toFixed(1)}, 1.5PN ${n3.toFixed(1)}, 2PN ${n4.toFixed(2)}, ` +
          `2.5PN ${n5.toFixed(2)}, 3PN ${n6.toFixed(2)}, 3.5PN ${n7.toFixed(2)}, total ${c.total.toFixed(1)}`,
      );
      expect(Math.abs(n0 / newtonian - 1)).toBeLessThan(0.01);
      expect(n1).toBe(0);
      expect(Math.abs(n2 / pn1 - 1)).toBeLessThan(0.05);
      expect(Math.abs(n3 / pn15 - 1)).toBeLessThan(0.05);
      // Higher orders are small beside these (2PN ≈ +10, 2.5PN ≈ −10…−20, 3PN ≈ +2, 3.5PN ≈ −1 in the
      // same table; from memory, checked only as magnitudes).
      for (const x of [n4, n5, n6, n7]) expect(Math.abs(x)).toBeLessThan(25);
      expect(n4).toBeGreaterThan(0);
      expect(n5).toBeLessThan(0);
    });
  }
});

describe("chirp times (Sathyaprakash, Phys. Rev. D 50, R7111 (1994))", () => {
  it("τ0 of 1.4+1.4 M_sun from 40 Hz ≈ 25 s, computed independently as 5/(256 π f0 η) (π G M f0/c³)^{−5/3}", () => {
    const f0 = 40;
    const m = 2.8 * T_SUN;
    const eta = 0.25;
    const tau0 = (5 / (256 * Math.PI * f0 * eta)) * Math.pow(Math.PI * m * f0, -5 / 3);
    const ct = chirpTimes(1.4, 1.4, f0);
    console.log(`τ0 = ${ct.tau0.toFixed(3)} s, τ3 = ${ct.tau3.toFixed(4)} s, 3.5PN time to coalescence ${pnTimeToCoalescence(f0, 1.4, 1.4).toFixed(3)} s`);
    expect(ct.tau0).toBeCloseTo(tau0, 9);
    expect(Math.abs(ct.tau0 - 25)).toBeLessThan(0.5); // ≈ 25 s, a worked value of the trade (from memory)
    // τ3 = 1/(8 f0 η) (π M f0)^{−2/3}, same source.
    expect(ct.tau3).toBeCloseTo((1 / (8 * f0 * eta)) * Math.pow(Math.PI * m * f0, -2 / 3), 11);
  });

  it("1.4+1.4 M_sun from 30 Hz lasts ≈ 54 s at Newtonian order (brief's figure, from memory)", () => {
    expect(Math.abs(chirpTimes(1.4, 1.4, 30).tau0 - 54)).toBeLessThan(1);
  });

  it("round-trips masses ↔ chirp times over a grid of binaries", () => {
    for (const m1 of [1, 1.4, 3, 10, 50]) {
      for (const m2 of [1, 1.4, 5, 20]) {
        for (const f0 of [10, 40]) {
          const { tau0, tau3 } = chirpTimes(m1, m2, f0);
          const back = massesFromChirpTimes(tau0, tau3, f0)!;
          expect(back.m1Solar / Math.max(m1, m2)).toBeCloseTo(1, 7);
          expect(back.m2Solar / Math.min(m1, m2)).toBeCloseTo(1, 7);
        }
      }
    }
  });
});

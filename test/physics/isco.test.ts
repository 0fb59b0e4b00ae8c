import { describe, expect, it } from "vitest";
import { InputError, M_SUN } from "@chirpsieve/core";
import { C, G } from "../../packages/core/src/physics/constants.js";
import { iscoGwFrequency, iscoSeparation } from "../../packages/core/src/physics/isco.js";
import { gwFrequencyFromSeparation } from "../../packages/core/src/physics/kepler.js";

describe("ISCO of the total mass", () => {
  it("r = 6GM/c² and f_gw(ISCO) is the Kepler GW frequency there", () => {
    const m = 20 * M_SUN;
    expect(iscoSeparation(m) / ((6 * G * m) / C ** 2)).toBeCloseTo(1, 14);
    expect(iscoGwFrequency(m) / gwFrequencyFromSeparation(iscoSeparation(m), m)).toBeCloseTo(1, 12);
  });

  it("scales as 1/M", () => {
    expect(iscoGwFrequency(2 * M_SUN) / iscoGwFrequency(4 * M_SUN)).toBeCloseTo(2, 14);
  });

  it("rejects a non-positive mass with InputError naming it", () => {
    expect(() => iscoGwFrequency(0)).toThrow(/iscoGwFrequency: totalMass \(kg\)/);
    expect(() => iscoSeparation(-1)).toThrow(InputError);
  });
});

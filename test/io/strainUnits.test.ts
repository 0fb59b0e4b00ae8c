import { describe, expect, it } from "vitest";
import { isDimensionlessStrain, openStrain, writeStrain } from "@chirpsieve/core";
import { useTempDir } from "./tempDir.js";

const tmp = useTempDir("units");

describe("strain units", () => {
  it("dimensionless strain (or none stated) has physical amplitudes; counts or volts do not", () => {
    for (const u of [undefined, "strain", " Strain ", "dimensionless", "1", ""]) expect(isDimensionlessStrain(u)).toBe(true);
    for (const u of ["counts", "V", "m", "ADC counts"]) expect(isDimensionlessStrain(u)).toBe(false);
  });

  it("a source exposes the units its file states", async () => {
    const p = tmp.path("counts.f64");
    await writeStrain(p, { data: [1, 2, 3, 4], sampleRate: 4, startTime: 0, units: "counts" });
    const source = await openStrain(p);
    expect(source.units).toBe("counts");
    await source.close();
  });
});

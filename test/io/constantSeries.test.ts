import { writeFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { describeConstantSeries, findConstantSeries, isDimensionlessStrain, openStrain, strainReaderFromSeries, writeStrain } from "@chirpsieve/core";
import { checkNotConstant } from "../../packages/core/src/io/constantSeries.js";
import { inputErrorOf, syntheticStrain, useTempDir } from "./tempDir.js";

const tmp = useTempDir("constant");

function memory(data: number[] | Float64Array, file = "mem") {
  return strainReaderFromSeries({ data: Float64Array.from(data), sampleRate: 16, startTime: 0, file });
}

describe("constant series (no strain to search)", () => {
  it("finds an all-zero, a constant and an all-NaN series; not one that varies anywhere", async () => {
    expect(await findConstantSeries(memory(new Float64Array(100)))).toEqual({ file: "mem", value: 0 });
    expect(await findConstantSeries(memory(new Array(50).fill(3e-21)))).toEqual({ file: "mem", value: 3e-21 });
    expect((await findConstantSeries(memory([NaN, NaN])))!.value).toBeNaN();
    expect(await findConstantSeries(memory([0, 0, NaN, 0]))).toEqual({ file: "mem", value: 0 });
    const lastDiffers = new Float64Array(100);
    lastDiffers[99] = 1e-30;
    expect(await findConstantSeries(memory(lastDiffers))).toBeUndefined();
    expect(await findConstantSeries(memory(syntheticStrain(100)))).toBeUndefined();
  });

  it("reads a long file in chunks: a difference after the first 2^20 samples counts", async () => {
    const data = new Float64Array((1 << 20) + 5);
    data[(1 << 20) + 3] = 1;
    expect(await findConstantSeries(memory(data))).toBeUndefined();
  });

  it("an all-zero file is an InputError naming the file", async () => {
    const p = tmp.path("zeros.f32");
    await writeStrain(p, { data: new Float64Array(4096), sampleRate: 1024, startTime: 0 });
    const source = await openStrain(p);
    try {
      const msg = await inputErrorOf(checkNotConstant(source));
      expect(msg).toBe(`${p}: every sample is zero; there is no strain to search`);
    } finally {
      await source.close();
    }
    expect(describeConstantSeries({ file: "a.txt", value: 2 })).toBe("a.txt: every sample is 2 (a constant series); there is no strain to search");
  });

  it("a varying file passes", async () => {
    const p = tmp.path("ok.txt");
    writeFileSync(p, "0 1e-21\n1 -2e-21\n2 0\n");
    const source = await openStrain(p);
    await expect(checkNotConstant(source)).resolves.toBeUndefined();
    await source.close();
  });
});

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

import { mkdirSync, writeFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { InputError, openStrain, readStrain, strainFormatOf, strainReaderFromSeries, writeStrain } from "@chirpsieve/core";
import { useTempDir, inputErrorOf } from "./tempDir.js";

const tmp = useTempDir("file");


describe("strain file format and writer checks", () => {
  it("tells the format from the extension, case-insensitively, or from the option", () => {
    expect(strainFormatOf("a.F32")).toBe("f32");
    expect(strainFormatOf("dir.v2/a.f64")).toBe("f64");
    expect(["x.txt", "x.dat", "x.CSV"].map((p) => strainFormatOf(p))).toEqual(["text", "text", "text"]);
    expect(["x.h5", "x.hdf5", "x.hdf"].map((p) => strainFormatOf(p))).toEqual(["hdf5", "hdf5", "hdf5"]);
    expect(strainFormatOf("x.bin", "f32")).toBe("f32");
    expect(() => strainFormatOf("x.bin")).toThrow(InputError);
    expect(() => strainFormatOf("x.bin")).toThrow(/x\.bin: cannot tell the strain format from the extension "\.bin"/);
    expect(() => strainFormatOf("noext")).toThrow(/extension \(none\)/);
    expect(() => strainFormatOf("x.f32", "f16" as never)).toThrow(/format must be one of f32, f64, text, hdf5 \(got "f16"\)/);
  });

  it("a missing file of every format is `<path>: no such file`", async () => {
    for (const name of ["m.f32", "m.f64", "m.txt", "m.h5"]) {
      const p = tmp.path(name);
      expect(await inputErrorOf(readStrain(p, { rate: 1, start: 0 }))).toBe(`${p}: no such file`);
    }
  });

  it("the writer checks the series and the output directory", async () => {
    const p = tmp.path("w.f64");
    const ok = { data: [1, 2], sampleRate: 4, startTime: 0 };
    expect(await inputErrorOf(writeStrain(p, { ...ok, sampleRate: 0 }))).toBe(`${p}: sampleRate must be a positive number (got 0)`);
    expect(await inputErrorOf(writeStrain(p, { ...ok, startTime: Number.NaN }))).toContain("startTime must be a finite number");
    expect(await inputErrorOf(writeStrain(p, { ...ok, data: [] }))).toBe(`${p}: no samples to write`);
    expect(await inputErrorOf(writeStrain(p, { ...ok, label: "two\nlines" }))).toContain("label must be a one-line string");
    const q = tmp.path("no/such/dir/w.f64");
    expect(await inputErrorOf(writeStrain(q, ok))).toContain("does not exist");
    expect(await inputErrorOf(writeStrain(tmp.path("w.xyz"), ok))).toContain("cannot tell the strain format");
    const asDir = tmp.path("taken.f32");
    mkdirSync(asDir);
    expect(await inputErrorOf(writeStrain(asDir, ok))).toBe(`${asDir}: is a directory; name a file to write`);
    for (const format of ["f32", "f64", "text", "hdf5"] as const) {
      const out = tmp.path(`any-${format}.out`);
      await writeStrain(out, { data: new Float32Array([0.5, -0.25]), sampleRate: 2, startTime: 1 }, { format });
      expect([...(await readStrain(out, { format })).data]).toEqual([0.5, -0.25]);
    }
  });

  it("bad open options are InputErrors naming the option", async () => {
    const p = tmp.path("opts.txt");
    writeFileSync(p, "1\n");
    expect(await inputErrorOf(openStrain(p, { rate: 1, nonFinite: "skip" as never }))).toContain('nonFinite must be "error" or "allow"');
    expect(await inputErrorOf(openStrain(p, { rate: 1, dataset: "" }))).toContain("dataset: must be a non-empty name");
    expect(await inputErrorOf(openStrain(p, { rate: 1, dataset: "/strain" }))).toBe(`dataset: ${p}: a dataset (/strain) applies only to HDF5 files; this is a text file`);
    expect(await inputErrorOf(openStrain("", {}))).toContain("path must be a non-empty string");
    const d = tmp.path("folder.txt");
    mkdirSync(d);
    expect(await inputErrorOf(openStrain(d, { rate: 1 }))).toBe(`${d}: is a directory, not a file`);
  });

  it("strainReaderFromSeries serves copies of an in-memory series in chunks", async () => {
    const data = new Float64Array([1, 2, 3, 4, 5]);
    const src = strainReaderFromSeries({ data, sampleRate: 10, startTime: 2, file: "(memory)", label: "synthetic" });
    expect(src).toMatchObject({ length: 5, sampleRate: 10, startTime: 2, file: "(memory)", label: "synthetic" });
    const chunk = await src.read(1, 3);
    expect([...chunk]).toEqual([2, 3, 4]);
    chunk[0] = 99;
    expect(data[1]).toBe(2);
    await expect(src.read(4, 2)).rejects.toBeInstanceOf(RangeError);
    await src.close();
    expect(() => strainReaderFromSeries({ data, sampleRate: -1, startTime: 0, file: "m" })).toThrow(/m: sampleRate must be a positive number/);
  });
});

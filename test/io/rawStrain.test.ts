import { mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { InputError, openStrain, readStrain, writeStrain } from "@chirpsieve/core";
import { inputErrorOf, syntheticStrain, useTempDir } from "./tempDir.js";

const tmp = useTempDir("raw");

/** Writes raw bytes and a sidecar object/text by hand. */
function handMade(name: string, samples: Float32Array | Float64Array | Uint8Array, sidecar: unknown): string {
  const p = tmp.path(name);
  writeFileSync(p, new Uint8Array(samples.buffer, samples.byteOffset, samples.byteLength));
  writeFileSync(`${p}.json`, typeof sidecar === "string" ? sidecar : JSON.stringify(sidecar));
  return p;
}

async function expectInputError(p: Promise<unknown>, ...parts: (string | RegExp)[]): Promise<string> {
  const msg = await inputErrorOf(p);
  for (const part of parts) {
    if (typeof part === "string") expect(msg).toContain(part);
    else expect(msg).toMatch(part);
  }
  return msg;
}

describe("raw .f64 / .f32 strain with a JSON sidecar", () => {
  const data = syntheticStrain(10_000, 7);

  it("round-trips .f64 exactly, with label and units", async () => {
    const p = tmp.path("rt.f64");
    await writeStrain(p, { data, sampleRate: 4096, startTime: 1_000_000_000.25, label: "synthetic H", units: "strain" });
    const s = await readStrain(p);
    expect(s.data).toEqual(data);
    expect(s).toMatchObject({ sampleRate: 4096, startTime: 1_000_000_000.25, file: p, label: "synthetic H", units: "strain" });
    const side = JSON.parse(readFileSync(`${p}.json`, "utf8"));
    expect(side).toEqual({ sampleRate: 4096, startTime: 1_000_000_000.25, sampleType: "float64", byteOrder: "little", length: 10_000, label: "synthetic H", units: "strain" });
    expect(readFileSync(p).length).toBe(80_000);
  });

  it("round-trips .f32 to float32 precision (relative 2^-24)", async () => {
    const p = tmp.path("rt.f32");
    await writeStrain(p, { data, sampleRate: 16384, startTime: -3 });
    const s = await readStrain(p);
    expect(s.sampleRate).toBe(16384);
    expect(s.startTime).toBe(-3);
    expect(s.label).toBeUndefined();
    let worst = 0;
    for (let i = 0; i < data.length; i++) worst = Math.max(worst, Math.abs(s.data[i] - data[i]) / Math.abs(data[i]));
    expect(worst).toBeLessThanOrEqual(2 ** -24);
    expect(s.data).toEqual(Float64Array.from(Float32Array.from(data)));
  });

  it("writes little-endian samples (byte order checked by hand)", async () => {
    const p = tmp.path("le.f32");
    await writeStrain(p, { data: [1, -2], sampleRate: 1, startTime: 0 });
    // 1.0f = 0x3f800000, -2.0f = 0xc0000000, little-endian (IEEE 754; common practice, no source)
    expect([...readFileSync(p)]).toEqual([0, 0, 0x80, 0x3f, 0, 0, 0, 0xc0]);
  });

  it("chunked reads at arbitrary offsets equal the whole read", async () => {
    for (const ext of ["f32", "f64"]) {
      const p = tmp.path(`chunks.${ext}`);
      await writeStrain(p, { data, sampleRate: 2048, startTime: 5 });
      const whole = (await readStrain(p)).data;
      const src = await openStrain(p);
      expect(src.length).toBe(data.length);
      const pieces: Float64Array[] = [];
      // Uneven piece sizes, including 0 and 1, covering [0, length).
      const sizes = [0, 1, 2, 3, 1000, 4093, 1, 0, 777];
      let at = 0;
      for (let k = 0; at < src.length; k++) {
        const n = Math.min(sizes[k % sizes.length], src.length - at);
        pieces.push(await src.read(at, n));
        at += n;
      }
      const joined = new Float64Array(src.length);
      let o = 0;
      for (const piece of pieces) {
        joined.set(piece, o);
        o += piece.length;
      }
      expect(joined).toEqual(whole);
      expect(await src.read(9_990, 10)).toEqual(whole.subarray(9_990));
      await expect(src.read(9_995, 10)).rejects.toBeInstanceOf(RangeError);
      await expect(src.read(-1, 1)).rejects.toBeInstanceOf(RangeError);
      await expect(src.read(0.5, 1)).rejects.toBeInstanceOf(RangeError);
      await src.close();
      await expect(src.read(0, 1)).rejects.toThrow(/after close/);
    }
  });

  it("reads a file longer than one internal read chunk (2^22 samples) whole", async () => {
    const n = (1 << 22) + 5;
    const big = new Float64Array(n);
    for (let i = 0; i < n; i++) big[i] = i % 1000;
    const p = tmp.path("big.f32");
    await writeStrain(p, { data: big, sampleRate: 16384, startTime: 0 });
    const s = await readStrain(p);
    expect(s.data.length).toBe(n);
    expect(s.data[(1 << 22) - 1]).toBe(((1 << 22) - 1) % 1000);
    expect(s.data[n - 1]).toBe((n - 1) % 1000);
    let mismatches = 0;
    for (let i = 0; i < n; i++) if (s.data[i] !== big[i]) mismatches++;
    expect(mismatches).toBe(0);
  });

  it("leaves no temporary files behind", async () => {
    await writeStrain(tmp.path("clean.f64"), { data: [1, 2, 3], sampleRate: 1, startTime: 0 });
    expect(tmp.files().filter((f) => f.includes("partial"))).toEqual([]);
  });

  it("the format option overrides the extension (sidecar at path + .json)", async () => {
    const p = tmp.path("plain.bin");
    await writeStrain(p, { data: [1.5, 2.5], sampleRate: 10, startTime: 0 }, { format: "f64" });
    expect((await readStrain(p, { format: "f64" })).data).toEqual(new Float64Array([1.5, 2.5]));
    await expectInputError(readStrain(p), "plain.bin", ".f64");
  });

  describe("errors name the file and the problem", () => {
    const good = new Float32Array([1, 2, 3, 4]);
    it("missing data file", async () => {
      const p = tmp.path("nope.f32");
      expect(await expectInputError(readStrain(p))).toBe(`${p}: no such file`);
    });
    it("missing sidecar", async () => {
      const p = tmp.path("noside.f32");
      writeFileSync(p, new Uint8Array(good.buffer));
      await expectInputError(readStrain(p), `${p}.json`, "missing sidecar");
    });
    it("malformed JSON", async () => {
      const p = handMade("bad.f32", good, "{sampleRate: 4096");
      await expectInputError(readStrain(p), `${p}.json: malformed JSON`);
    });
    it("sampleRate not a positive number", async () => {
      const p = handMade("rate.f32", good, { sampleRate: "4k", startTime: 0 });
      expect(await expectInputError(readStrain(p))).toBe(`${p}.json: sampleRate must be a positive number (got "4k")`);
      for (const bad of [0, -1, null, [4096]]) {
        handMade("rate.f32", good, { sampleRate: bad, startTime: 0 });
        await expectInputError(readStrain(p), "sampleRate must be a positive number");
      }
      handMade("rate.f32", good, `{"sampleRate": 1e999, "startTime": 0}`);
      await expectInputError(readStrain(p), "sampleRate must be a positive number (got Infinity)");
    });
    it("missing or non-finite startTime", async () => {
      const p = handMade("start.f32", good, { sampleRate: 1 });
      await expectInputError(readStrain(p), `${p}.json: missing "startTime"`);
      handMade("start.f32", good, { sampleRate: 1, startTime: "noon" });
      await expectInputError(readStrain(p), "startTime must be a finite number");
    });
    it("not a JSON object", async () => {
      const p = handMade("arr.f32", good, "[4096, 0]");
      await expectInputError(readStrain(p), `${p}.json: expected a JSON object`);
    });
    it("file size not a multiple of the sample size", async () => {
      const p = handMade("odd.f32", new Uint8Array(10), { sampleRate: 1, startTime: 0 });
      await expectInputError(readStrain(p), `${p}: file size 10 bytes is not a multiple of 4`);
      const q = handMade("odd.f64", new Uint8Array(12), { sampleRate: 1, startTime: 0 });
      await expectInputError(readStrain(q), `${q}: file size 12 bytes is not a multiple of 8`);
    });
    it("empty file", async () => {
      const p = handMade("empty.f64", new Uint8Array(0), { sampleRate: 1, startTime: 0 });
      expect(await expectInputError(readStrain(p))).toBe(`${p}: empty file (no samples)`);
    });
    it("sampleType disagreeing with the extension", async () => {
      const p = handMade("type.f32", good, { sampleRate: 1, startTime: 0, sampleType: "float64" });
      await expectInputError(readStrain(p), `${p}.json`, `sampleType "float64" disagrees with the .f32`);
      handMade("type.f32", good, { sampleRate: 1, startTime: 0, sampleType: "int16" });
      await expectInputError(readStrain(p), `sampleType must be "float32" or "float64"`);
    });
    it("a length field disagreeing with the file size", async () => {
      const p = handMade("len.f32", good, { sampleRate: 1, startTime: 0, length: 5 });
      await expectInputError(readStrain(p), `${p}.json: length 5 disagrees with the file size (16 bytes = 4 float32 samples)`);
      handMade("len.f32", good, { sampleRate: 1, startTime: 0, length: 4 });
      expect((await readStrain(p)).data.length).toBe(4);
    });
    it("label/units of the wrong type", async () => {
      const p = handMade("lab.f32", good, { sampleRate: 1, startTime: 0, label: 3 });
      await expectInputError(readStrain(p), `${p}.json: label must be a string`);
    });
    it("a directory instead of a file", async () => {
      const d = tmp.path("folder.f32");
      mkdirSync(d);
      expect(await expectInputError(readStrain(d))).toBe(`${d}: is a directory, not a file`);
    });
    it("rate/start options that disagree with the sidecar", async () => {
      const p = handMade("opt.f32", good, { sampleRate: 4096, startTime: 10 });
      await expectInputError(readStrain(p, { rate: 2048 }), p, "given rate 2048 Hz disagrees");
      await expectInputError(readStrain(p, { start: 11 }), p, "given start 11 s disagrees");
      expect((await readStrain(p, { rate: 4096, start: 10 })).sampleRate).toBe(4096);
    });
  });

  describe("non-finite samples", () => {
    const withNaN = new Float32Array([0, 1, Number.NaN, 3, Infinity]);
    it("are an InputError naming the file, sample index and time", async () => {
      const p = handMade("nan.f32", withNaN, { sampleRate: 4, startTime: 100 });
      expect(await expectInputError(readStrain(p))).toBe(`${p}: sample 2 (t = 100.5 s) is NaN; non-finite samples are rejected`);
      const src = await openStrain(p);
      expect(await src.read(0, 2)).toEqual(new Float64Array([0, 1])); // clean chunks read fine
      await expectInputError(src.read(3, 2), "sample 4 (t = 101 s) is +Infinity");
      await src.close();
    });
    it("are kept with nonFinite: allow", async () => {
      const p = handMade("nan2.f32", withNaN, { sampleRate: 4, startTime: 100 });
      const s = await readStrain(p, { nonFinite: "allow" });
      expect(Number.isNaN(s.data[2])).toBe(true);
      expect(s.data[4]).toBe(Infinity);
    });
    it("are refused by the writer unless allowed", async () => {
      const p = tmp.path("w.f64");
      await expectInputError(writeStrain(p, { data: [1, Number.NaN], sampleRate: 1, startTime: 0 }), p, "sample 1 is NaN");
      await writeStrain(p, { data: [1, Number.NaN], sampleRate: 1, startTime: 0 }, { nonFinite: "allow" });
      expect(Number.isNaN((await readStrain(p, { nonFinite: "allow" })).data[1])).toBe(true);
    });
    it("a finite float64 sample beyond float32 range is refused for .f32", async () => {
      const p = tmp.path("big.f32");
      await expectInputError(writeStrain(p, { data: [1, 1e39], sampleRate: 1, startTime: 0 }), p, "sample 1", "float32 range");
    });
  });
});

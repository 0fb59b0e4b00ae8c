import { spawnSync } from "node:child_process";
import { readFileSync, writeFileSync } from "node:fs";
import h5wasm from "h5wasm/node";
import type { Dataset as H5Dataset, Group as H5Group } from "h5wasm";
import { beforeAll, describe, expect, it } from "vitest";
import { InputError, openStrain, readStrain, writeStrain } from "@chirpsieve/core";
import { setHdf5TimeoutMs } from "../../packages/core/src/io/hdf5Client.js";
import { syntheticStrain, useTempDir, inputErrorOf } from "./tempDir.js";

const tmp = useTempDir("hdf5");

type Attr = { name: string; value: number | string; dtype?: string };
type DatasetSpec = { name: string; data: Float64Array | Float32Array | Int32Array; shape?: number[]; attrs?: Attr[] };

/** Builds an HDF5 file with h5wasm directly (the test's own writer, independent of writeStrain). */
function buildH5(name: string, datasets: DatasetSpec[], rootAttrs: Attr[] = []): string {
  const p = tmp.path(name);
  const f = new h5wasm.File(p, "w");
  try {
    for (const d of datasets) {
      const parts = d.name.split("/");
      let g: H5Group = f;
      for (const part of parts.slice(0, -1)) g = (g.get(part) as H5Group | null) ?? g.create_group(part);
      const ds = g.create_dataset({ name: parts[parts.length - 1], data: d.data, shape: d.shape ?? null });
      for (const a of d.attrs ?? []) ds.create_attribute(a.name, a.value, typeof a.value === "number" ? [] : null, a.dtype ?? (typeof a.value === "number" ? "<d" : null));
    }
    for (const a of rootAttrs) f.create_attribute(a.name, a.value, typeof a.value === "number" ? [] : null, a.dtype ?? (typeof a.value === "number" ? "<d" : null));
  } finally {
    f.close();
  }
  return p;
}


beforeAll(async () => {
  await h5wasm.ready;
});

describe("HDF5 strain files", () => {
  const data = syntheticStrain(5000, 3);

  it("round-trips exactly, with attributes sampleRate, startTime, label, units", async () => {
    const p = tmp.path("rt.h5");
    await writeStrain(p, { data, sampleRate: 4096, startTime: 1_000_000_123.5, label: "synthetic V", units: "strain" });
    const s = await readStrain(p);
    expect(s.data).toEqual(data);
    expect(s).toMatchObject({ sampleRate: 4096, startTime: 1_000_000_123.5, label: "synthetic V", units: "strain", file: p });
    // The file as another reader sees it (h5wasm directly).
    const f = new h5wasm.File(p, "r");
    try {
      const ds = f.get("strain") as H5Dataset;
      expect(ds.metadata.type).toBe(1);
      expect(ds.metadata.size).toBe(8);
      expect(ds.attrs.sampleRate.value).toBe(4096);
      expect(ds.attrs.sampleRate.metadata.type).toBe(1); // float, not integer
      expect(ds.attrs.startTime.metadata.size).toBe(8); // float64, not float32
      expect(ds.attrs.startTime.value).toBe(1_000_000_123.5);
    } finally {
      f.close();
    }
    expect(tmp.files().filter((n) => n.includes("partial"))).toEqual([]);
  });

  it("writes into a named dataset path, creating groups", async () => {
    const p = tmp.path("nested.hdf5");
    await writeStrain(p, { data: [1, 2, 3], sampleRate: 2, startTime: 0 }, { dataset: "/run1/detA/strain" });
    const s = await readStrain(p, { dataset: "run1/detA/strain" });
    expect([...s.data]).toEqual([1, 2, 3]);
    expect((await readStrain(p)).data.length).toBe(3); // the only 1-D float dataset
  });

  it("chunked reads at arbitrary offsets equal the whole read (float64 and float32 datasets)", async () => {
    const p = tmp.path("chunks.h5");
    await writeStrain(p, { data, sampleRate: 1024, startTime: 0 });
    const q = buildH5("chunks32.h5", [
      { name: "h", data: Float32Array.from(data), attrs: [{ name: "sampleRate", value: 1024 }, { name: "startTime", value: 0 }] },
    ]);
    for (const file of [p, q]) {
      const whole = (await readStrain(file)).data;
      const src = await openStrain(file);
      const offsets = [0, 1, 17, 1000, 2047, 4999];
      for (const off of offsets) {
        for (const n of [0, 1, 3, 250]) {
          if (off + n > src.length) continue;
          expect(await src.read(off, n)).toEqual(whole.slice(off, off + n));
        }
      }
      await expect(src.read(4999, 2)).rejects.toBeInstanceOf(RangeError);
      await src.close();
    }
    expect((await readStrain(q)).data).toEqual(Float64Array.from(Float32Array.from(data)));
  });

  it("a file written by another HDF5 writer with gzip chunks and integer rate attribute reads the same", async () => {
    const p = tmp.path("gzip.h5");
    const f = new h5wasm.File(p, "w");
    try {
      const ds = f.create_dataset({ name: "x", data: Float64Array.from(data), chunks: [512], compression: "gzip" });
      // h5wasm dtype strings are struct codes: "<i" is a 4-byte integer, "<d" an 8-byte float.
      ds.create_attribute("fs", 2048, [], "<i");
      ds.create_attribute("t0", 12, [], "<i");
    } finally {
      f.close();
    }
    const src = await openStrain(p);
    expect(src).toMatchObject({ sampleRate: 2048, startTime: 12, length: 5000 });
    expect(await src.read(1000, 600)).toEqual(data.slice(1000, 1600));
    await src.close();
  });

  describe("sample rate and start time", () => {
    it("a spacing attribute (dt) is seconds; file-level attributes count too", async () => {
      const p = buildH5("dt.h5", [{ name: "s", data: new Float64Array([1, 2]), attrs: [{ name: "dt", value: 1 / 256 }] }], [
        { name: "start", value: 40 },
      ]);
      expect(await readStrain(p)).toMatchObject({ sampleRate: 256, startTime: 40 });
    });
    it("Xspacing (seconds) and Xstart, on the dataset or the root, give the rate and start without --rate/--start", async () => {
      const p = buildH5("xspacing.h5", [{ name: "strain/Strain", data: new Float64Array([1, 2, 3]), attrs: [{ name: "Xspacing", value: 1 / 4096 }, { name: "Xstart", value: 1_126_259_446 }] }]);
      expect(await readStrain(p)).toMatchObject({ sampleRate: 4096, startTime: 1_126_259_446 });
      const q = buildH5("xroot.h5", [{ name: "s", data: new Float64Array([1, 2]) }], [
        { name: "Xspacing", value: 0.5 },
        { name: "Xstart", value: -3 },
      ]);
      expect(await readStrain(q)).toMatchObject({ sampleRate: 2, startTime: -3 });
    });
    it("a user-named rate attribute: below 1 is a spacing in seconds, else Hz", async () => {
      const p = buildH5("named.h5", [
        { name: "s", data: new Float64Array([1, 2]), attrs: [{ name: "step", value: 0.125 }, { name: "hz", value: 16 }, { name: "epoch", value: 3 }] },
      ]);
      expect(await readStrain(p, { rateAttribute: "step", startAttribute: "epoch" })).toMatchObject({ sampleRate: 8, startTime: 3 });
      expect(await readStrain(p, { rateAttribute: "hz", start: 0 })).toMatchObject({ sampleRate: 16, startTime: 0 });
      const msg = await inputErrorOf(readStrain(p, { rateAttribute: "nope", start: 0 }));
      expect(msg).toBe(`${p}: no attribute nope on /s or the file root`);
    });
    it("what the file lacks comes from the rate/start options; the error names the option (parameter) to give", async () => {
      const p = buildH5("bare.h5", [{ name: "s", data: new Float64Array([1, 2, 3]) }]);
      expect(await readStrain(p, { rate: 100, start: 2 })).toMatchObject({ sampleRate: 100, startTime: 2 });
      const noRate = await inputErrorOf(readStrain(p, { start: 2 }));
      expect(noRate).toContain(`${p}: no sample rate in the file`);
      expect(noRate).toMatch(/^rate: .*give the sample rate \(Hz\)$/);
      const noStart = await inputErrorOf(readStrain(p, { rate: 100 }));
      expect(noStart).toContain(`${p}: no start time in the file`);
      expect(noStart).toMatch(/^start: .*give the start time \(s\)$/);
    });
    it("options that disagree with the file, and attributes that disagree with each other", async () => {
      const p = buildH5("both.h5", [
        { name: "s", data: new Float64Array([1, 2]), attrs: [{ name: "sampleRate", value: 4096 }, { name: "startTime", value: 1 }] },
      ]);
      expect(await inputErrorOf(readStrain(p, { rate: 2048 }))).toBe(
        `${p}: the given rate 2048 Hz disagrees with sampleRate = 4096 Hz on /s`,
      );
      expect(await inputErrorOf(readStrain(p, { start: 2 }))).toContain("the given start 2 s disagrees with startTime = 1 s on /s");
      const q = buildH5("clash.h5", [
        { name: "s", data: new Float64Array([1, 2]), attrs: [{ name: "sampleRate", value: 4096 }, { name: "dt", value: 0.001 }, { name: "t0", value: 0 }] },
      ]);
      expect(await inputErrorOf(readStrain(q))).toContain("sample-rate attributes disagree (sampleRate = 4096 Hz on /s; dt = 0.001 s on /s)");
    });
    it("a rate attribute that is not a positive number", async () => {
      const p = buildH5("strrate.h5", [
        { name: "s", data: new Float64Array([1, 2]), attrs: [{ name: "sampleRate", value: "4k" }, { name: "startTime", value: 0 }] },
      ]);
      expect(await inputErrorOf(readStrain(p))).toBe(`${p}: attribute sampleRate on /s must be a positive rate in Hz (got "4k")`);
      const q = buildH5("negrate.h5", [
        { name: "s", data: new Float64Array([1, 2]), attrs: [{ name: "sampleRate", value: -1 }, { name: "startTime", value: 0 }] },
      ]);
      expect(await inputErrorOf(readStrain(q))).toContain("attribute sampleRate on /s must be positive (got -1)");
    });
  });

  describe("choosing the dataset", () => {
    const attrs = [{ name: "sampleRate", value: 1 }, { name: "startTime", value: 0 }];
    it("takes the only 1-D floating-point dataset, ignoring others", async () => {
      const p = buildH5("pick.h5", [
        { name: "counts", data: new Int32Array([1, 2, 3]) },
        { name: "image", data: new Float64Array(4), shape: [2, 2] },
        { name: "grp/h", data: new Float64Array([7, 8]), attrs },
      ]);
      const s = await readStrain(p);
      expect([...s.data]).toEqual([7, 8]);
    });
    it("several candidates: InputError listing them", async () => {
      const p = buildH5("two.h5", [
        { name: "a", data: new Float64Array([1]), attrs },
        { name: "b", data: new Float32Array([1]), attrs },
      ]);
      expect(await inputErrorOf(readStrain(p))).toBe(
        `dataset: ${p}: several 1-D floating-point datasets (/a, /b); name the one to read`,
      );
      expect([...(await readStrain(p, { dataset: "/b" })).data]).toEqual([1]);
    });
    it("no candidate: InputError listing what is there", async () => {
      const p = buildH5("none.h5", [{ name: "counts", data: new Int32Array([1, 2]) }, { name: "image", data: new Float64Array(4), shape: [2, 2] }]);
      expect(await inputErrorOf(readStrain(p))).toBe(
        `dataset: ${p}: no 1-D floating-point dataset (datasets: /counts (int32, 2), /image (float64, 2×2)); name the dataset to read`,
      );
    });
    it("unsupported dtype or shape of a named dataset", async () => {
      const p = buildH5("types.h5", [
        { name: "counts", data: new Int32Array([1, 2]), attrs },
        { name: "image", data: new Float64Array(4), shape: [2, 2], attrs },
        { name: "empty", data: new Float64Array(0), attrs },
      ]);
      expect(await inputErrorOf(readStrain(p, { dataset: "counts" }))).toBe(
        `${p}: dataset /counts holds int32 values; strain must be float32 or float64`,
      );
      expect(await inputErrorOf(readStrain(p, { dataset: "image" }))).toBe(
        `${p}: dataset /image has shape 2×2; strain must be a 1-D dataset`,
      );
      expect(await inputErrorOf(readStrain(p, { dataset: "empty" }))).toBe(`${p}: dataset /empty is empty (no samples)`);
      expect(await inputErrorOf(readStrain(p, { dataset: "nope" }))).toContain(`${p}: no dataset /nope (datasets: /counts (int32, 2)`);
    });
    it("a group named as the dataset", async () => {
      const p = buildH5("group.h5", [{ name: "g/x", data: new Float64Array([1]), attrs }]);
      expect(await inputErrorOf(readStrain(p, { dataset: "g" }))).toContain(`${p}: /g is a group, not a dataset`);
    });
  });

  describe("non-finite samples", () => {
    it("are an InputError naming the sample and its time; allowed with nonFinite: allow", async () => {
      const p = buildH5("nan.h5", [
        { name: "s", data: new Float64Array([0, 1, 2, Number.NaN]), attrs: [{ name: "sampleRate", value: 2 }, { name: "startTime", value: 10 }] },
      ]);
      expect(await inputErrorOf(readStrain(p))).toBe(`${p}: sample 3 (t = 11.5 s) is NaN; non-finite samples are rejected`);
      const src = await openStrain(p);
      expect([...(await src.read(0, 3))]).toEqual([0, 1, 2]);
      await src.close();
      expect(Number.isNaN((await readStrain(p, { nonFinite: "allow" })).data[3])).toBe(true);
    });
  });

  describe("damaged or foreign files", () => {
    it("a file without the HDF5 signature never reaches the library", async () => {
      const p = tmp.path("text.h5");
      writeFileSync(p, "not hdf5 at all\n");
      expect(await inputErrorOf(readStrain(p))).toBe(`${p}: not an HDF5 file (no HDF5 signature found)`);
      const e = tmp.path("empty.h5");
      writeFileSync(e, "");
      expect(await inputErrorOf(readStrain(e))).toBe(`${e}: empty file`);
      expect(await inputErrorOf(readStrain(tmp.path("missing.h5")))).toBe(`${tmp.path("missing.h5")}: no such file`);
    });
    it("a truncated file is an InputError with HDF5's own reason", async () => {
      const p = tmp.path("whole.h5");
      await writeStrain(p, { data, sampleRate: 4096, startTime: 0 });
      const bytes = readFileSync(p);
      const q = tmp.path("cut.h5");
      writeFileSync(q, bytes.subarray(0, bytes.length - 1000));
      const msg = await inputErrorOf(readStrain(q));
      expect(msg.startsWith(`${q}: unreadable HDF5 file (`)).toBe(true);
      expect(msg).toMatch(/truncated/);
      // The library is still usable afterwards.
      expect((await readStrain(p)).data).toEqual(data);
    });
    it("the worker keeps HDF5's error stack off stderr (checked in a child process)", async () => {
      const { HDF5_WORKER_SOURCE } = await import("../../packages/core/src/io/hdf5Worker.js");
      const src = tmp.path("worker-source.cjs");
      writeFileSync(src, HDF5_WORKER_SOURCE);
      const script = tmp.path("run-worker.mjs");
      writeFileSync(
        script,
        [
          'import { Worker } from "node:worker_threads";',
          'import { readFileSync } from "node:fs";',
          "const [srcFile, h5url, target] = process.argv.slice(2);",
          'const w = new Worker(readFileSync(srcFile, "utf8"), { eval: true, workerData: { h5url } });',
          'w.on("message", (m) => {',
          '  if (m.ready) w.postMessage({ id: 1, op: "open", args: { path: target } });',
          "  else { console.log(JSON.stringify(m)); process.exit(0); }",
          "});",
        ].join("\n"),
      );
      const q = tmp.path("cut2.h5");
      const whole = tmp.path("whole2.h5");
      await writeStrain(whole, { data, sampleRate: 4096, startTime: 0 });
      writeFileSync(q, readFileSync(whole).subarray(0, 3000));
      const run = spawnSync(process.execPath, [script, src, import.meta.resolve("h5wasm/node"), q], { encoding: "utf8", timeout: 60_000 });
      expect(run.stderr).toBe("");
      const reply = JSON.parse(run.stdout);
      expect(reply).toMatchObject({ id: 1, ok: false, kind: "hdf5" });
      expect(reply.reason).toMatch(/truncated/);
    });
    it("a file on which the library loops forever times out as an InputError; the next file reads", async () => {
      // Found by fuzzing h5wasm 0.10.3: one changed byte (at 2608, in an attribute message of
      // /strain) makes reading the attribute values loop forever. If a newer h5wasm lays the
      // file out differently this byte may no longer do so; then find another by fuzzing.
      const p = tmp.path("loop.h5");
      const f = new h5wasm.File(p, "w");
      try {
        const d = f.create_dataset({ name: "strain", data: new Float64Array(64).map((_, i) => i) });
        d.create_attribute("sampleRate", 4096, [], "<f");
        d.create_attribute("startTime", 0, [], "<f");
        d.create_attribute("label", "hello");
        f.create_dataset({ name: "ints", data: new Int32Array([1, 2]) });
        f.create_group("g").create_dataset({ name: "f32", data: new Float32Array([1, 2]) });
        f.create_dataset({ name: "m2", data: new Float64Array([1, 2, 3, 4]), shape: [2, 2] });
        f.create_attribute("t0", 12.5);
      } finally {
        f.close();
      }
      const bytes = readFileSync(p);
      bytes[2608] = 71;
      writeFileSync(p, bytes);
      const good = tmp.path("good.h5");
      await writeStrain(good, { data: [1, 2, 3], sampleRate: 1, startTime: 0 });
      const before = await openStrain(good);
      setHdf5TimeoutMs(3000);
      try {
        const msg = await inputErrorOf(readStrain(p, { dataset: "strain" }));
        expect(msg).toBe(`${p}: unreadable HDF5 file (the HDF5 library did not finish within 3 s; the file may be damaged)`);
      } finally {
        setHdf5TimeoutMs(60_000);
      }
      // The stuck worker was replaced: files opened in it are gone (and say so), new ones read.
      expect(await inputErrorOf(before.read(0, 3))).toContain("restarted");
      await before.close();
      expect([...(await readStrain(good)).data]).toEqual([1, 2, 3]);
      expect((await readStrain(tmp.path("whole.h5"))).data).toEqual(data);
    });
    it("a user block before the superblock (signature at byte 512) is accepted", async () => {
      // HDF5 File Format Specification: the superblock may sit at byte 0, 512, 1024, 2048, ...
      const p = tmp.path("ub.h5");
      await writeStrain(p, { data: [1, 2, 3], sampleRate: 2, startTime: 0 });
      writeFileSync(p, Buffer.concat([Buffer.alloc(512), readFileSync(p)]));
      expect([...(await readStrain(p)).data]).toEqual([1, 2, 3]);
    });
  });
});

import { readFileSync, writeFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { openStrain, readStrain, writeStrain } from "@chirpsieve/core";
import { inputErrorOf, syntheticStrain, useTempDir } from "./tempDir.js";

const tmp = useTempDir("byteorder");

/** Big-endian bytes of `data` written by the test itself with DataView (independent of the writer). */
function bigEndianBytes(data: Float64Array, bytesPerSample: 4 | 8): Uint8Array {
  const out = new Uint8Array(bytesPerSample * data.length);
  const view = new DataView(out.buffer);
  for (let i = 0; i < data.length; i++) {
    if (bytesPerSample === 8) view.setFloat64(8 * i, data[i], false);
    else view.setFloat32(4 * i, data[i], false);
  }
  return out;
}

describe("raw strain byte order (sidecar \"byteOrder\")", () => {
  const data = syntheticStrain(4096, 11);

  it("reads big-endian .f64 and .f32 files written by hand exactly", async () => {
    const p64 = tmp.path("hand.f64");
    writeFileSync(p64, bigEndianBytes(data, 8));
    writeFileSync(`${p64}.json`, JSON.stringify({ sampleRate: 1024, startTime: 5, byteOrder: "big" }));
    expect((await readStrain(p64)).data).toEqual(data);
    const p32 = tmp.path("hand.f32");
    writeFileSync(p32, bigEndianBytes(data, 4));
    writeFileSync(`${p32}.json`, JSON.stringify({ sampleRate: 1024, startTime: 5, byteOrder: "big" }));
    expect((await readStrain(p32)).data).toEqual(Float64Array.from(Float32Array.from(data)));
  });

  it("the same bytes read as little-endian are not the data (the key matters)", async () => {
    const p = tmp.path("wrong.f64");
    writeFileSync(p, bigEndianBytes(data, 8));
    writeFileSync(`${p}.json`, JSON.stringify({ sampleRate: 1024, startTime: 5 }));
    const s = await readStrain(p, { nonFinite: "allow" });
    expect(s.data).not.toEqual(data);
  });

  it("writes big-endian on request, states it in the sidecar, and reads it back exactly", async () => {
    const p = tmp.path("rt.f64");
    await writeStrain(p, { data, sampleRate: 1024, startTime: 5 }, { byteOrder: "big" });
    expect(JSON.parse(readFileSync(`${p}.json`, "utf8")).byteOrder).toBe("big");
    const bytes = readFileSync(p);
    const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    expect(view.getFloat64(8 * 17, false)).toBe(data[17]); // checked with DataView, not the reader
    expect((await readStrain(p)).data).toEqual(data);
  });

  it("a byteOrder other than little or big is an error naming the sidecar", async () => {
    const p = tmp.path("bad.f64");
    writeFileSync(p, bigEndianBytes(data, 8));
    writeFileSync(`${p}.json`, JSON.stringify({ sampleRate: 1024, startTime: 5, byteOrder: "network" }));
    const msg = await inputErrorOf(openStrain(p));
    expect(msg).toContain(`${p}.json`);
    expect(msg).toContain("byteOrder");
  });
});

describe("unknown sidecar keys", () => {
  it("are reported as one warning each, naming the sidecar and the key, and otherwise ignored", async () => {
    const data = syntheticStrain(64, 2);
    const p = tmp.path("keys.f64");
    writeFileSync(p, new Uint8Array(data.buffer));
    writeFileSync(`${p}.json`, JSON.stringify({ sampleRate: 64, startTime: 0, endian: "big", channel: "X1" }));
    const source = await openStrain(p);
    try {
      expect(source.warnings).toHaveLength(2);
      expect(source.warnings![0]).toContain(`${p}.json`);
      expect(source.warnings![0]).toContain('"endian"');
      expect(source.warnings![1]).toContain('"channel"');
      for (const w of source.warnings!) expect(w).not.toMatch(/\n/);
    } finally {
      await source.close();
    }
    const s = await readStrain(p);
    expect(s.warnings).toHaveLength(2);
    expect(s.data).toEqual(data);
  });

  it("a sidecar with known keys only gives no warning", async () => {
    const p = tmp.path("known.f32");
    await writeStrain(p, { data: [1, 2, 3], sampleRate: 4, startTime: 0, label: "x", units: "strain" });
    const source = await openStrain(p);
    expect(source.warnings).toEqual([]);
    await source.close();
  });
});

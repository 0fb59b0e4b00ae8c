import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { type Injection, injectionManifest, readInjectionFile, writeInjectionManifest } from "@chirpsieve/core";
import { parseInjections } from "../../packages/core/src/inject/manifest.js";

const one: Injection = {
  primaryMassSolar: 1.4,
  secondaryMassSolar: 1.3,
  coalescenceTime: 1000000040.25,
  distanceMpc: 40,
  inclination: 0.5,
  rightAscension: 1,
  declination: 0.2,
  polarisation: 0.3,
  phase: 0.4,
  optimalSnr: 17.5,
};

describe("injection manifest", () => {
  it("round-trips through the file, with the chirp mass added", () => {
    const dir = mkdtempSync(join(tmpdir(), "chirpsieve-manifest-"));
    const path = join(dir, "m.json");
    const meta = { noiseCurve: "ajith2011", noise: true, sampleRate: 2048, startTime: 1e9, duration: 128, fMinHz: 30, seed: 7, detector: "site-a" };
    writeInjectionManifest(path, injectionManifest(meta, [one, { ...one, coalescenceTime: 1000000090.5 }]));
    const json = JSON.parse(readFileSync(path, "utf8"));
    expect(json.synthetic).toBe(true);
    expect(json.noiseCurve).toBe("ajith2011");
    expect(json.injections[0].chirpMassSolar).toBeCloseTo(Math.pow(1.4 * 1.3, 0.6) / Math.pow(2.7, 0.2), 12);
    expect(readInjectionFile(path)).toEqual([one, { ...one, coalescenceTime: 1000000090.5 }]);
  });

  it("reads a manifest in the previous layout (masses and distance without their unit)", () => {
    const previous = `{
  "synthetic": true, "noiseCurve": "ajith2011", "noise": true, "sampleRate": 2048, "startTime": 1000000000, "duration": 128, "fMinHz": 30, "seed": 7, "detector": "site-a",
  "injections": [
    {"primaryMass":1.4,"secondaryMass":1.3,"chirpMass":1.1742757165047846,"coalescenceTime":1000000040.25,"distance":40,"inclination":0.5,"rightAscension":1,"declination":0.2,"polarisation":0.3,"phase":0.4,"optimalSnr":17.5}
  ]
}`;
    expect(parseInjections(previous, "old.json")).toEqual([one]);
    // The checks apply under the previous names too.
    expect(() => parseInjections(previous.replace('"secondaryMass":1.3', '"secondaryMass":1.5'), "old.json")).toThrow(
      /^old\.json: injection 0: primaryMassSolar must be at least secondaryMassSolar/,
    );
  });

  it("accepts a bare array and names the file and entry index of a bad record", () => {
    expect(parseInjections(JSON.stringify([one]), "a.json")).toEqual([one]);
    const bad = JSON.stringify({ injections: [one, { ...one, inclination: 4 }] });
    expect(() => parseInjections(bad, "b.json")).toThrow(/^b\.json: injection 1: inclination must be in \[0, π\]/);
    expect(() => parseInjections("{", "c.json")).toThrow(/^c\.json: not valid JSON/);
    expect(() => parseInjections('{"x": 1}', "d.json")).toThrow(/d\.json: expected an array/);
    const dir = mkdtempSync(join(tmpdir(), "chirpsieve-manifest-"));
    writeFileSync(join(dir, "e.json"), JSON.stringify([{ ...one, distanceMpc: "far" }]));
    expect(() => readInjectionFile(join(dir, "e.json"))).toThrow(/e\.json: injection 0: distanceMpc must be a finite number \(got "far"\)/);
  });
});

import { describe, expect, it } from "vitest";
import { type Injection, ajith2011 } from "@chirpsieve/core";
import { injectInto } from "../../packages/core/src/inject/injection.js";
import { synthesizeStrain } from "../../packages/core/src/inject/synthesizeStrain.js";
import { SITE_A } from "../../packages/core/src/waveform/antenna.js";

const injections: Injection[] = [
  {
    primaryMassSolar: 12,
    secondaryMassSolar: 9,
    coalescenceTime: 100.37,
    distanceMpc: 50,
    inclination: 0.3,
    rightAscension: 4,
    declination: 0.6,
    polarisation: 2,
    phase: 0.1,
  },
  {
    primaryMassSolar: 20,
    secondaryMassSolar: 15,
    coalescenceTime: 103.9,
    distanceMpc: 80,
    inclination: 2.5,
    rightAscension: 1,
    declination: -1,
    polarisation: 0.5,
    phase: 3,
  },
];

function concat(chunks: Iterable<Float64Array>): Float64Array {
  const list = [...chunks];
  const out = new Float64Array(list.reduce((n, c) => n + c.length, 0));
  let off = 0;
  for (const c of list) {
    out.set(c, off);
    off += c.length;
  }
  return out;
}

describe("synthesizeStrain", () => {
  const opts = { psd: ajith2011, sampleRate: 1024, startTime: 96, duration: 16, seed: "synth", fMinHz: 30, injections, detector: SITE_A };

  it("gives the same series whatever the chunk size", () => {
    const a = concat(synthesizeStrain({ ...opts, chunkSamples: 777 }));
    const b = concat(synthesizeStrain({ ...opts, chunkSamples: 1 << 16 }));
    expect(a.length).toBe(16 * 1024);
    expect(b).toEqual(a);
  });

  it("without noise equals the injections added to zeros", () => {
    const signal = concat(synthesizeStrain({ ...opts, noise: false, chunkSamples: 1000 }));
    const ref = new Float64Array(16 * 1024);
    for (const inj of injections) injectInto(ref, 1024, 96, inj, SITE_A, 30);
    expect(signal).toEqual(ref);
    // And noise + signal − noise-only = signal.
    const both = concat(synthesizeStrain(opts));
    const noise = concat(synthesizeStrain({ ...opts, injections: [] }));
    for (let i = 0; i < both.length; i += 101) expect(both[i] - noise[i]).toBeCloseTo(signal[i], 30);
  });

  it("rejects a duration that is not a whole number of samples", () => {
    expect(() => concat(synthesizeStrain({ ...opts, duration: 1.0001 }))).toThrow(/whole number of samples/);
  });
});

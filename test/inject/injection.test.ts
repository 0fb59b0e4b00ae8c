import { describe, expect, it } from "vitest";
import { type Injection, InputError } from "@chirpsieve/core";
import { addSegment, checkInjection, injectInto, projectInjection } from "../../packages/core/src/inject/injection.js";
import { SITE_A, geocentreDelay, plusCrossResponse, siderealAngle } from "../../packages/core/src/waveform/antenna.js";
import { taylorT4 } from "../../packages/core/src/waveform/taylorT4.js";

const base: Injection = {
  primaryMassSolar: 10,
  secondaryMassSolar: 8,
  coalescenceTime: 1_000_000_010.3,
  distanceMpc: 200,
  inclination: 0.7,
  rightAscension: 2.1,
  declination: -0.4,
  polarisation: 0.9,
  phase: 1.3,
};

function maxAbs(a: Float64Array): number {
  let m = 0;
  for (const x of a) m = Math.max(m, Math.abs(x));
  return m;
}

describe("sub-sample placement", () => {
  it("shifting t_c by a fraction of a sample shifts the sampled waveform by that fraction", () => {
    // Reference sampled 16× finer on the same grid origin; the coarse waveform with t_c + k/(16 fs)
    // must equal the reference at fine index 16 i − k.
    const fs = 2048;
    const up = 16;
    const common = { massSolar1: 10, massSolar2: 8, distanceMpc: 100, inclination: 0.4, coalescencePhase: 0.2, fStartHz: 30, fEndHz: 240 };
    const ref = taylorT4({ ...common, coalescenceTime: 3.0, sampleRate: fs * up });
    const peak = maxAbs(ref.hPlus);
    let worst = 0;
    for (const k of [0, 1, 5, 8, 13]) {
      const wf = taylorT4({ ...common, coalescenceTime: 3.0 + k / (up * fs), sampleRate: fs });
      for (let j = 0; j < wf.hPlus.length; j++) {
        const fine = up * (wf.startIndex + j) - k - ref.startIndex;
        if (fine < 0 || fine >= ref.hPlus.length) continue;
        worst = Math.max(worst, Math.abs(wf.hPlus[j] - ref.hPlus[fine]), Math.abs(wf.hCross[j] - ref.hCross[fine]));
      }
      // The two samplings cover the same span to within one coarse sample.
      expect(Math.abs(wf.startIndex * up - k - ref.startIndex)).toBeLessThanOrEqual(up);
    }
    expect(worst / peak).toBeLessThan(1e-8); // measured 7e-10
  });
});

describe("projectInjection / injectInto", () => {
  it("is F+ h+ + F× h× delayed by the Earth-centre-to-detector time", () => {
    const fs = 1024;
    const start = 1_000_000_000;
    const seg = projectInjection(base, SITE_A, { sampleRate: fs, gridStartTime: start, fMinHz: 30 });
    const gmst = siderealAngle(base.coalescenceTime);
    const f = plusCrossResponse(SITE_A, base, base.polarisation, gmst);
    const delay = geocentreDelay(SITE_A, base, gmst);
    const wf = taylorT4({
      massSolar1: 10,
      massSolar2: 8,
      distanceMpc: 200,
      inclination: 0.7,
      coalescencePhase: 1.3,
      coalescenceTime: base.coalescenceTime - start + delay,
      sampleRate: fs,
      fStartHz: 30,
    });
    expect(seg.startIndex).toBe(wf.startIndex);
    for (let i = 0; i < seg.data.length; i += 97) {
      expect(seg.data[i]).toBeCloseTo(f.plus * wf.hPlus[i] + f.cross * wf.hCross[i], 35);
    }
    expect(Math.abs(delay)).toBeLessThan(0.0214);
  });

  it("adds only the overlapping samples when the injection is partly outside the series", () => {
    const fs = 1024;
    const start = 1_000_000_000;
    const full = new Float64Array(20 * fs);
    injectInto(full, fs, start, base, SITE_A, 30);
    // A series that starts in the middle of the chirp and ends before coalescence.
    const offset = Math.round(9 * fs);
    const part = new Float64Array(Math.round(1.2 * fs)).fill(1e-21);
    const changed = injectInto(part, fs, start + offset / fs, base, SITE_A, 30);
    expect(changed).toBe(part.length);
    for (let i = 0; i < part.length; i += 13) expect(part[i] - 1e-21).toBeCloseTo(full[offset + i], 33);
    // Wholly outside: nothing changes.
    const far = new Float64Array(1000);
    expect(injectInto(far, fs, start + 500, base, SITE_A, 30)).toBe(0);
    expect(maxAbs(far)).toBe(0);
  });

  it("addSegment adds into Float32Array series too", () => {
    const s = new Float32Array(4);
    expect(addSegment(s, 10, { startIndex: 12, data: new Float64Array([1, 2, 3]) })).toBe(2);
    expect(Array.from(s)).toEqual([0, 0, 1, 2]);
  });
});

describe("checkInjection", () => {
  it("names the field and the place that is wrong", () => {
    expect(() => checkInjection({ ...base, distanceMpc: -1 }, "inj.json: injection 2")).toThrow(/inj\.json: injection 2: distanceMpc must be a positive/);
    expect(() => checkInjection({ ...base, phase: "x" }, "here")).toThrow(/phase must be a finite number/);
    expect(() => checkInjection({ ...base, primaryMassSolar: 1, secondaryMassSolar: 2 }, "here")).toThrow(/primaryMassSolar must be at least/);
    expect(() => checkInjection({ ...base, declination: 2 }, "here")).toThrow(InputError);
    expect(checkInjection({ ...base, chirpMassSolar: 7, optimalSnr: 12 }, "here")).toEqual({ ...base, optimalSnr: 12 });
  });
});

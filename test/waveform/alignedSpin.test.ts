// Aligned-spin TaylorF2: non-spinning output unchanged bit for bit, spins reach every path, bad spins rejected.
import { describe, expect, it } from "vitest";
import { InputError } from "@chirpsieve/core";
import { createTaylorF2Phasor } from "../../packages/core/src/waveform/taylorF2Phasor.js";
import { pnTimeToCoalescence } from "../../packages/core/src/waveform/chirpTimes.js";
import { taylorT4 } from "../../packages/core/src/waveform/taylorT4.js";
import { taylorT4Cycles } from "../../packages/core/src/waveform/taylorT4Evolution.js";
import { createTaylorF2Generator, taylorF2Into, taylorF2Phase } from "../../packages/core/src/waveform/taylorf2.js";

/** Regression values measured here with the code before spins were added (commit 3c7755b). */
const BEFORE = {"phase":[3764.4939692378366,19.08390296491748,27.520486065867527,139.78268949404276],"f2bins":[[-1.4346614867942982e-21,-3.700966924514511e-21],[1.7197962629548775e-21,-4.105728521706238e-22],[3.3182992581894104e-22,-5.083715975284151e-22],[0,0]],"genbins":[[1.1031603987235849e-22,9.23400959643295e-22],[1.84812660680454e-22,-3.707425858952521e-22],[-1.525453267364584e-23,-1.4141334778728158e-22],[-5.71603338613772e-23,2.732989382984611e-23],[1.0106662838836221e-23,-2.6351069420144627e-23]],"phasorbins":[[-1.171674893778216,-1.0773576526729705],[0.010057991764737206,-1.2713009412293175],[0.9428751126406046,1.575434318889745],[-1.4714061969068428,1.1584879078251118],[-0.46245143351922974,-0.9292902851851531]],"t4":[20609,12663,1.547509565215546e-23,2.9189226000775036e-22,8.3579600216835615e-22],"t4cycles":2613.107345544691,"tc":3.0859982432232242};

function nonSpinning(chi?: [number, number]) {
  const extra = chi ?? [];
  const out: Record<string, unknown> = {};
  out.phase = [[40, 1.4, 1.4], [100, 10, 6], [25, 30, 25], [300, 1.2, 1.1]].map(([f, a, b]) =>
    taylorF2Phase(f, a, b, 7, ...extra),
  );
  const nB = 4097, df = 0.25;
  const h = new Float64Array(2 * nB);
  taylorF2Into(h, nB, df, 30, 10, 6, 1, Infinity, 7, ...extra);
  out.f2bins = [200, 400, 1000, 1500].map((k) => [h[2 * k], h[2 * k + 1]]);
  const g = createTaylorF2Generator(nB, df);
  g.generate(h, 30, 1.4, 1.3, 1, Infinity, ...extra);
  out.genbins = [200, 400, 1000, 2000, 4000].map((k) => [h[2 * k], h[2 * k + 1]]);
  const ph = createTaylorF2Phasor(df);
  const u = new Float64Array(2 * nB);
  for (let k = 0; k < nB; k++) {
    u[2 * k] = Math.cos(k * 0.1);
    u[2 * k + 1] = Math.sin(k * 0.37);
  }
  const o = new Float64Array(2 * nB);
  ph.multiply(u, o, 120, 4000, 1.4, 1.3, 1.7, ...extra);
  out.phasorbins = [120, 400, 1000, 2000, 3999].map((k) => [o[2 * k], o[2 * k + 1]]);
  const w = taylorT4({
    massSolar1: 10, massSolar2: 6, distanceMpc: 100, inclination: 0.3, coalescencePhase: 0.2,
    coalescenceTime: 8.123, sampleRate: 4096, fStartHz: 30,
    ...(chi ? { chi1: chi[0], chi2: chi[1] } : {}),
  });
  out.t4 = [w.startIndex, w.hPlus.length, w.hPlus[100], w.hCross[5000], w.hPlus[w.hPlus.length - 50]];
  out.t4cycles = taylorT4Cycles(1.4, 1.4, 30, undefined, 7, ...extra);
  out.tc = pnTimeToCoalescence(30, 10, 6);
  return out;
}

describe("aligned spins leave non-spinning results unchanged", () => {
  it("reproduces the pre-spin TaylorF2, generator, fast-phase and TaylorT4 values bit for bit with spins omitted", () => {
    expect(nonSpinning()).toStrictEqual(BEFORE);
  });
  it("and with χ1 = χ2 = 0 given explicitly", () => {
    expect(nonSpinning([0, 0])).toStrictEqual(BEFORE);
  });
  it("while a spin of 0.3 changes each of them", () => {
    const spun = nonSpinning([0.3, 0.3]);
    for (const key of ["phase", "f2bins", "genbins", "phasorbins", "t4", "t4cycles"]) {
      expect(spun[key], key).not.toStrictEqual((BEFORE as Record<string, unknown>)[key]);
    }
  });
});

describe("spinning templates by each path agree", () => {
  it("the per-grid generator equals taylorF2Into to 1e-10 with spins (10+3 M_sun, χ = 0.7, −0.4)", () => {
    const nB = 8193, df = 0.125;
    const a = new Float64Array(2 * nB);
    const b = new Float64Array(2 * nB);
    taylorF2Into(a, nB, df, 20, 10, 3, 1, Infinity, 7, 0.7, -0.4);
    createTaylorF2Generator(nB, df).generate(b, 20, 10, 3, 1, Infinity, 0.7, -0.4);
    let worst = 0, peak = 0;
    for (let i = 0; i < a.length; i++) {
      worst = Math.max(worst, Math.abs(a[i] - b[i]));
      peak = Math.max(peak, Math.abs(a[i]));
    }
    expect(worst / peak).toBeLessThan(1e-10);
  });
});

describe("bad spins throw InputError naming the spin", () => {
  const cases: [string, () => unknown][] = [
    ["χ1 = 1 (extremal excluded)", () => taylorF2Phase(50, 10, 5, 7, 1, 0)],
    ["χ2 = −1.2", () => taylorF2Phase(50, 10, 5, 7, 0, -1.2)],
    ["χ1 = NaN", () => taylorF2Into(new Float64Array(20), 10, 1, 2, 1, 1, 1, Infinity, 7, NaN, 0)],
    ["TaylorT4 χ2 = 2", () => taylorT4Cycles(10, 5, 30, undefined, 7, 0, 2)],
  ];
  for (const [name, call] of cases) {
    it(name, () => {
      expect(call).toThrow(InputError);
      expect(call).toThrow(/chi[12]/);
    });
  }
});

// The per-template output rate against the full-rate filter: the same peaks, SNR, time and phase.
import { beforeAll, describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { ajith2011, arrayInput, chooseOutputRate, createBankFilter, createComplexFft, createSegmentFilter, loadFftBackends, searchStrain } from "@chirpsieve/core";
import { parabolicPeak, type Trigger } from "../../packages/core/src/filter/peaks.js";
import { MIN_RATE_LENGTH, RATE_GUARD } from "../../packages/core/src/search/outputRate.js";
import { atSnr, injectionAt, simulatedData, standardSearch } from "./fixtures.js";

const FS = 4096;
const FMIN = 30;
const N = 2 ** 18; // 64 s

beforeAll(async () => {
  await loadFftBackends();
});

/** Seeded component masses, uniform in 1–30 M☉ (log-uniform total mass, so that light systems are well represented). */
function seededTemplates(count: number, seed: string): { m1: number; m2: number }[] {
  const rng = seedrandom(seed);
  const out: { m1: number; m2: number }[] = [];
  for (let i = 0; i < count; i++) {
    const a = Math.exp(Math.log(1) + rng() * Math.log(30));
    const b = Math.exp(Math.log(1) + rng() * Math.log(30));
    out.push({ m1: Math.max(a, b), m2: Math.min(a, b) });
  }
  return out;
}

describe("choice of the reduced rate", () => {
  it("the M-point inverse DFT of bins below M is every (N/M)-th sample of the N-point one (DFT identity; common practice, no source)", () => {
    const n = 1024;
    const m = 128;
    const rng = seedrandom("dft");
    const full = new Float64Array(2 * n);
    const short = new Float64Array(2 * m);
    for (let k = 3; k < 100; k++) {
      full[2 * k] = short[2 * k] = rng() - 0.5;
      full[2 * k + 1] = short[2 * k + 1] = rng() - 0.5;
    }
    const zf = new Float64Array(2 * n);
    const zs = new Float64Array(2 * m);
    createComplexFft(n, "fftjs").inverse(full, zf);
    createComplexFft(m, "fftjs").inverse(short, zs);
    let worst = 0;
    for (let j = 0; j < m; j++) {
      worst = Math.max(worst, Math.hypot(zs[2 * j] - zf[2 * j * (n / m)], zs[2 * j + 1] - zf[2 * j * (n / m) + 1]));
    }
    expect(worst).toBeLessThan(1e-12);
  });

  it("keeps at least 1 − ε of the band's power below the cut, within the guard fraction of a power-of-two length", () => {
    const rng = seedrandom("cut");
    const size = 2 ** 16;
    const cum = new Float64Array(size / 2 + 2);
    for (let k = 1; k < cum.length; k++) cum[k] = cum[k - 1] + (k > 40 ? rng() * (k / 1000) ** -2.3 : 0);
    const out = { kUse: 0, length: 0 };
    for (let trial = 0; trial < 200; trial++) {
      const kFrom = 41 + Math.floor(rng() * 200);
      const kTo = kFrom + 10 + Math.floor(rng() * (size / 2 - kFrom - 10));
      const eps = [1e-2, 1e-3, 1e-4][trial % 3];
      chooseOutputRate(cum, kFrom, kTo, eps, size, out);
      expect(Number.isInteger(Math.log2(out.length))).toBe(true);
      expect(out.kUse).toBeLessThanOrEqual(kTo);
      expect(cum[out.kUse] - cum[kFrom]).toBeGreaterThanOrEqual((1 - eps) * (cum[kTo] - cum[kFrom]) * (1 - 1e-12));
      // The smallest cut keeping 1 − ε, found by a plain scan; no shorter length holds it.
      let cut = kFrom + 1;
      while (cum[cut] - cum[kFrom] < (1 - eps) * (cum[kTo] - cum[kFrom])) cut++;
      if (out.length > MIN_RATE_LENGTH) expect(cut).toBeGreaterThan(RATE_GUARD * (out.length / 2));
      if (out.length < size) {
        expect(out.kUse).toBeLessThanOrEqual(RATE_GUARD * out.length);
      } else {
        expect(out.kUse).toBe(kTo);
      }
    }
  });
});

describe("per-template output rate (reduced-rate inverse FFT, peaks refined to full-rate samples)", () => {
  it("gives the full-rate peaks of 96 templates in noise with loud signals: SNR within 0.1%, time within 0.05 ms, phase within 0.01 rad", () => {
    const bank = seededTemplates(96, "rates");
    // Each template is its own signal's best match: signals of a few bank members, SNR 15–40.
    const injections = [0, 7, 19, 33, 52, 71, 90].map((i, j) => atSnr(injectionAt(bank[i].m1, bank[i].m2, 20 + 5 * j + 0.123 * j), 15 + 4 * j, ajith2011, FS, FMIN));
    const data = simulatedData({ psd: ajith2011, fs: FS, seconds: N / FS, seed: "rates-noise", fMin: FMIN, injections });
    const seg = createSegmentFilter({
      size: N,
      sampleRate: FS,
      fMinHz: FMIN,
      fMaxHz: 0.95 * (FS / 2),
      psd: { kind: "model", model: ajith2011 },
      truncationSamples: 2 * FS,
      backend: "pffft",
    });
    seg.load(data, N);
    const masses = new Float64Array(bank.flatMap((t) => [t.m1, t.m2]));
    const peaks = { start: 4 * FS, end: N - 4 * FS, threshold: 6, window: FS / 4 };
    const base = { size: N, sampleRate: FS, fMinHz: FMIN, fMaxHz: 0.95 * (FS / 2), backend: "pffft" as const };
    const run = (bandPowerLoss?: number) => {
      const filter = createBankFilter({ ...base, ...(bandPowerLoss === undefined ? {} : { bandPowerLoss }) });
      const sigmas = new Float64Array(bank.length);
      const triggers: Trigger[] = [];
      filter.scan(seg.weights, masses, 0, bank.length, peaks, sigmas, triggers);
      filter.dispose();
      return { sigmas, triggers };
    };
    const full = run();
    const reduced = run(1e-3);
    const key = (t: Trigger) => `${t.templateIndex}:${Math.floor((t.index - peaks.start) / peaks.window)}`;
    const byKey = new Map(reduced.triggers.map((t) => [key(t), t]));
    let compared = 0;
    let worstSnr = 0;
    let worstTime = 0;
    for (const f of full.triggers) {
      if (f.snr < 10) continue; // signal-dominated peaks; noise peaks near threshold differ by the cut band's noise
      const r = byKey.get(key(f));
      expect(r, `template ${f.templateIndex} peak at ${f.index}`).toBeDefined();
      const pf = parabolicPeak(f.before, f.snr, f.after);
      const pr = parabolicPeak(r!.before, r!.snr, r!.after);
      const snrErr = Math.abs(pr.value / pf.value - 1);
      const timeErr = Math.abs(r!.index + pr.offset - (f.index + pf.offset)) / FS;
      worstSnr = Math.max(worstSnr, snrErr);
      worstTime = Math.max(worstTime, timeErr);
      let dPhase = Math.atan2(r!.im, r!.re) - Math.atan2(f.im, f.re);
      dPhase = Math.atan2(Math.sin(dPhase), Math.cos(dPhase));
      expect(Math.abs(dPhase)).toBeLessThan(0.01);
      compared++;
    }
    expect(compared).toBeGreaterThan(50);
    expect(worstSnr).toBeLessThan(1e-3);
    expect(worstTime).toBeLessThan(5e-5);
    // σ of the cut band is within sqrt(1 − ε) of the full band's (ε = 1e-3).
    for (let i = 0; i < bank.length; i++) {
      expect(reduced.sigmas[i] / full.sigmas[i]).toBeGreaterThanOrEqual(Math.sqrt(1 - 1e-3) - 1e-9);
      expect(reduced.sigmas[i] / full.sigmas[i]).toBeLessThanOrEqual(1 + 1e-9);
    }
    seg.dispose();
  });

  it("a whole search finds the same candidates by either path, and the rate can be switched off", async () => {
    const inj = atSnr(injectionAt(1.4, 1.3, 130.2718), 14, ajith2011, 2048, FMIN);
    const inj2 = atSnr(injectionAt(12, 8, 145.77), 18, ajith2011, 2048, FMIN);
    const data = simulatedData({ psd: ajith2011, fs: 2048, seconds: 192, seed: "rates-search", fMin: FMIN, injections: [inj, inj2] });
    const bank = seededTemplates(40, "rates-search").map((t) => ({ primaryMassSolar: t.m1, secondaryMassSolar: t.m2 }));
    bank.push({ primaryMassSolar: 1.4, secondaryMassSolar: 1.3 }, { primaryMassSolar: 12, secondaryMassSolar: 8 });
    const o = standardSearch(bank, FMIN, 7);
    const a = await searchStrain(arrayInput(data, 2048), o);
    const b = await searchStrain(arrayInput(data, 2048), { ...o, perTemplateRate: false });
    const loud = (c: typeof a.candidates) => c.filter((x) => x.snr > 10).sort((x, y) => x.coalescenceTime - y.coalescenceTime);
    const la = loud(a.candidates);
    const lb = loud(b.candidates);
    expect(la.length).toBe(2);
    expect(la.length).toBe(lb.length);
    for (let i = 0; i < la.length; i++) {
      expect(la[i].templateIndex).toBe(lb[i].templateIndex);
      expect(Math.abs(la[i].snr / lb[i].snr - 1)).toBeLessThan(1e-3);
      expect(Math.abs(la[i].coalescenceTime - lb[i].coalescenceTime)).toBeLessThan(5e-5);
      expect(Math.abs(la[i].chi2 - lb[i].chi2)).toBeLessThan(1e-6 * Math.max(1, lb[i].chi2));
    }
  });

  it("refuses a band-power loss outside (0, 0.1]", async () => {
    const data = simulatedData({ psd: ajith2011, fs: 2048, seconds: 128, seed: "x", fMin: FMIN });
    const o = { ...standardSearch([{ primaryMassSolar: 1.4, secondaryMassSolar: 1.4 }], FMIN, 7), bandPowerLoss: 0.5 };
    await expect(searchStrain(arrayInput(data, 2048), o)).rejects.toThrow(/SNR² a template may lose/);
  });
});

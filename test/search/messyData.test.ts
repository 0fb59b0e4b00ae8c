// A recorded-data scenario built here with seeded noise: data gaps, a zero-filled stretch, a loud
// glitch, and three contiguous files with a chirp crossing a file boundary. The search must find
// both chirps as it does in clean data, raise nothing loud at the defects, and lose only the bad
// stretches plus the filter lengths they force.
import { beforeAll, describe, expect, it } from "vitest";
import { ajith2011, arrayInput, joinContiguousInputs, loadFftBackends, searchStrain, type Candidate, type SearchOptions } from "@chirpsieve/core";
import { optimalSnrOfSeries } from "../../packages/core/src/inject/optimalSnr.js";
import { arrivalTime, atSnr, chirpMassGrid, injectionAt, simulatedData, standardSearch } from "./fixtures.js";

const FS = 2048;
const FMIN = 40;
const SECONDS = 600;
const bns = atSnr(injectionAt(1.4, 1.3, 215.25), 13, ajith2011, FS, FMIN);
const bbh = atSnr(injectionAt(10, 8, 470.5), 14, ajith2011, FS, FMIN);
const GAP = { start: 430, end: 430.5 }; // NaN, 40 s before the 10+8 chirp
const ZEROS = { start: 300, end: 330 }; // zero-filled
const GLITCH_TIME = 235.25; // 20 s after the neutron-star chirp
const FILE_EDGES = [0, 200, 400, 600]; // the BNS chirp enters the band at ~188 s and crosses 200 s

const chirpMassSolar = (m1: number, m2: number) => (m1 * m2) ** 0.6 / (m1 + m2) ** 0.2;
const bank = [...chirpMassGrid(1.15, 1.19, 0.0005, [0.93, 0.8]), ...chirpMassGrid(7.4, 8.2, 0.002, [0.8, 0.6])];

/** A sine-Gaussian (Q ≈ 9 at 120 Hz) scaled to optimal SNR `snr` in the PSD the noise was drawn from. */
function sineGaussian(n: number, t0: number, snr: number): Float64Array {
  const f0 = 120;
  const tau = 9 / (Math.SQRT2 * Math.PI * f0);
  const g = new Float64Array(n);
  const i0 = Math.max(0, Math.floor((t0 - 6 * tau) * FS));
  const i1 = Math.min(n - 1, Math.ceil((t0 + 6 * tau) * FS));
  for (let i = i0; i <= i1; i++) {
    const t = i / FS - t0;
    g[i] = Math.exp(-(t * t) / (tau * tau)) * Math.sin(2 * Math.PI * f0 * t);
  }
  const rho = optimalSnrOfSeries(g, ajith2011, FS, FMIN);
  for (let i = i0; i <= i1; i++) g[i] *= snr / rho;
  return g;
}

const options: SearchOptions = { ...standardSearch(bank, FMIN, 6), segmentSeconds: 256, fftBackend: "pffft" };
let clean: Candidate[];
let messy: Awaited<ReturnType<typeof searchStrain>>;
let data: Float64Array;

beforeAll(async () => {
  await loadFftBackends();
  data = simulatedData({ psd: ajith2011, fs: FS, seconds: SECONDS, seed: "messy-data", fMin: FMIN, injections: [bns, bbh] });
  clean = (await searchStrain(arrayInput(data, FS, 0, "clean.f64"), options)).candidates;
  const bad = data.slice();
  for (let i = GAP.start * FS; i < GAP.end * FS; i++) bad[i] = Number.NaN;
  bad.fill(0, ZEROS.start * FS, ZEROS.end * FS);
  const glitch = sineGaussian(bad.length, GLITCH_TIME, 200);
  for (let i = 0; i < bad.length; i++) bad[i] += glitch[i];
  const files = FILE_EDGES.slice(0, -1).map((t, k) =>
    arrayInput(bad.slice(t * FS, FILE_EDGES[k + 1] * FS), FS, t, `part-${k}.f64`),
  );
  // Given out of order: the stream is put together by time.
  const streams = joinContiguousInputs([files[2], files[0], files[1]]);
  expect(streams).toHaveLength(1);
  messy = await searchStrain(streams[0], { ...options, badData: "exclude" });
}, 240_000);

describe("recorded-data defects (seeded noise with gaps, zeros, a glitch and three contiguous files)", () => {
  const near = (list: Candidate[], t: number) => list.filter((c) => Math.abs(c.coalescenceTime - t) < 0.5).sort((a, b) => b.snr - a.snr)[0];

  it("finds both chirps with coalescence time within 2 ms and chirp mass within 1% of the clean-data result", () => {
    for (const inj of [bns, bbh]) {
      const t = arrivalTime(inj);
      const a = near(clean, t);
      const b = near(messy.candidates, t);
      expect(a, `clean data: chirp at ${t.toFixed(2)} s`).toBeDefined();
      expect(b, `messy data: chirp at ${t.toFixed(2)} s`).toBeDefined();
      expect(Math.abs(b.coalescenceTime - a.coalescenceTime)).toBeLessThan(0.002);
      expect(Math.abs(b.chirpMassSolar / a.chirpMassSolar - 1)).toBeLessThan(0.01);
      // Common practice, no source: a gate 20 s from a chirp leaves its SNR within 2%.
      expect(Math.abs(b.snr / a.snr - 1)).toBeLessThan(0.02);
      expect(chirpMassSolar(b.primaryMassSolar, b.secondaryMassSolar)).toBeCloseTo(b.chirpMassSolar, 10);
    }
    // The neutron-star chirp crosses the boundary of part-0 and part-1 and coalesces in part-1.
    expect(near(messy.candidates, arrivalTime(bns)).file).toBe("part-1.f64");
  });

  it("raises no candidate with reweighted SNR above 6 in the zeros, the gap or at the glitch", () => {
    const inside = (c: Candidate, a: number, b: number) => c.coalescenceTime >= a && c.coalescenceTime <= b;
    const loud = messy.candidates.filter((c) => c.reweightedSnr > 6);
    expect(loud.filter((c) => inside(c, ZEROS.start - 1, ZEROS.end + 1))).toEqual([]);
    expect(loud.filter((c) => inside(c, GAP.start - 1, GAP.end + 1))).toEqual([]);
    expect(loud.filter((c) => inside(c, GLITCH_TIME - 2, GLITCH_TIME + 2))).toEqual([]);
  });

  it("gates the glitch and reports it", () => {
    expect(messy.summary.gates).toHaveLength(1);
    expect(Math.abs(messy.summary.gates[0].time - GLITCH_TIME)).toBeLessThan(0.01);
    // Measured here: 45.6 σ for this SNR-200 glitch at 2048 Hz; the default threshold is 20 σ.
    expect(messy.summary.gates[0].peakSigma).toBeGreaterThan(20);
  });

  it("leaves out only the bad stretches, and loses at most the filter lengths around them", () => {
    const s = messy.summary;
    const reasons = s.skipped.map((k) => k.reason).sort();
    expect(reasons).toEqual(["non-finite samples (NaN or infinite)", "zero-filled samples"]);
    expect(s.skippedSeconds).toBeCloseTo(GAP.end - GAP.start + ZEROS.end - ZEROS.start, 9);
    // Three valid intervals (before the zeros, between zeros and gap, after the gap), each losing the
    // lead-in (longest template + inverse-PSD filter) at its start and the filter at its end.
    expect(s.intervals).toBe(3);
    const bound = s.intervals * (s.leadInSeconds + s.tailSeconds);
    expect(s.lostToEdgesSeconds).toBeLessThanOrEqual(bound + 1e-9);
    expect(s.analysedSeconds + s.skippedSeconds + s.lostToEdgesSeconds).toBeCloseTo(SECONDS, 6);
    // One stream: no lead-in lost at the two file boundaries.
    expect(s.dataSeconds).toBe(SECONDS);
  });
});

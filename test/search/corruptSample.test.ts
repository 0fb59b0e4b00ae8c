// Corrupt samples (far above any recordable strain) are rejected or their segment skipped, instead of
// overflowing the single-precision FFT and silently losing every candidate of the segment.
import { beforeAll, describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { InputError, ajith2011, arraySource, firstCorruptSample, loadFftBackends, searchSource } from "@chirpsieve/core";
import { atSnr, chirpMassGrid, injectionAt, simulatedData, standardSearch } from "./fixtures.js";

const FS = 2048;
const FMIN = 40;

describe("corrupt samples", () => {
  beforeAll(async () => {
    await loadFftBackends();
  });

  it("are samples over 1e8 times the median magnitude, found in Gaussian noise; zero-filled data have no scale", () => {
    const rng = seedrandom("corrupt");
    const x = new Float64Array(100_000);
    for (let i = 0; i < x.length; i++) x[i] = (rng() - 0.5) * 1e-21;
    expect(firstCorruptSample(x)).toBe(-1);
    x[777] = 1e-16; // 4e5 × the median: a loud glitch, not corrupt
    expect(firstCorruptSample(x)).toBe(-1);
    x[4242] = 1e-12; // 4e9 × the median
    expect(firstCorruptSample(x)).toBe(4242);
    const zeros = new Float64Array(1000);
    zeros[3] = 1;
    expect(firstCorruptSample(zeros)).toBe(-1);
  });

  it("stop the scan with one line naming file, sample and time, or skip their segment and keep the others", async () => {
    // Unchecked, a 1e30 sample turns the filter output into NaN (float32 overflow of X/S) and drops
    // every candidate of its segment, the injected chirp included, without a word.
    const inj = atSnr(injectionAt(1.4, 1.3, 100), 20, ajith2011, FS, FMIN);
    const data = simulatedData({ psd: ajith2011, fs: FS, seconds: 256, seed: "corrupt-scan", fMin: FMIN, injections: [inj] });
    data[1000] = 1e30;
    const opts = { ...standardSearch(chirpMassGrid(1.1, 1.3, 0.01, [0.9]), FMIN, 8), segmentSeconds: 64 };
    const err = await searchSource(arraySource(data, FS, 0, "x.f32"), opts).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(InputError);
    expect((err as Error).message).toBe(
      "x.f32: sample at index 1000 (t = 0.4883 s) is 1.00e+30, over 1e+8 times the segment's median magnitude; corrupt data are rejected",
    );
    const { candidates, summary } = await searchSource(arraySource(data, FS, 0, "x.f32"), { ...opts, skipNonFinite: true });
    expect(summary.skipped.length).toBeGreaterThan(0);
    expect(summary.skipped[0].reason).toBe("sample (t = 0.4883 s) is 1.00e+30, over 1e+8 times the segment's median magnitude");
    // The other segments are searched as if nothing were wrong: the injection is found as in clean data.
    data[1000] = 0;
    const clean = await searchSource(arraySource(data, FS, 0, "x.f32"), opts);
    const near = (list: typeof candidates) => list.filter((c) => Math.abs(c.coalescenceTime - 100) < 0.1);
    expect(near(clean.candidates)).toHaveLength(1);
    expect(near(candidates)).toEqual(near(clean.candidates));
  });
});

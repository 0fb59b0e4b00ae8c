// Corrupt samples (far above any recordable strain) are rejected or their segment skipped, instead of
// overflowing the single-precision FFT and silently losing every candidate of the segment.
import { beforeAll, describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { InputError, ajith2011, arrayInput, loadFftBackends, searchStrain } from "@chirpsieve/core";
import { screenInput } from "../../packages/core/src/search/dataQuality.js";
import { atSnr, chirpMassGrid, injectionAt, simulatedData, standardSearch } from "./fixtures.js";

const FS = 2048;
const FMIN = 40;

describe("corrupt samples", () => {
  beforeAll(async () => {
    await loadFftBackends();
  });

  it("are samples over 1e8 times the median magnitude, found in Gaussian noise; zero-filled data have no scale", async () => {
    const firstCorrupt = async (x: Float64Array): Promise<number> =>
      (await screenInput(arrayInput(x, FS))).find((b) => b.kind === "corrupt")?.start ?? -1;
    const rng = seedrandom("corrupt");
    const x = new Float64Array(100_000);
    for (let i = 0; i < x.length; i++) x[i] = (rng() - 0.5) * 1e-21;
    expect(await firstCorrupt(x)).toBe(-1);
    x[777] = 1e-16; // 4e5 × the median: a loud glitch, not corrupt
    expect(await firstCorrupt(x)).toBe(-1);
    x[4242] = 1e-12; // 4e9 × the median
    expect(await firstCorrupt(x)).toBe(4242);
    const zeros = new Float64Array(1000);
    zeros[3] = 1;
    expect(await firstCorrupt(zeros)).toBe(-1);
  });

  it("stop the scan with one line naming file, sample and time, or are left out alone while the rest is searched", async () => {
    // Unchecked, a 1e30 sample turns the filter output into NaN (float32 overflow of X/S) and drops
    // every candidate of its segment, the injected chirp included, without a word.
    const inj = atSnr(injectionAt(1.4, 1.3, 100), 20, ajith2011, FS, FMIN);
    const data = simulatedData({ psd: ajith2011, fs: FS, seconds: 256, seed: "corrupt-scan", fMin: FMIN, injections: [inj] });
    data[1000] = 1e30;
    const opts = { ...standardSearch(chirpMassGrid(1.1, 1.3, 0.01, [0.9]), FMIN, 8), segmentSeconds: 64 };
    const err = await searchStrain(arrayInput(data, FS, 0, "x.f32"), opts).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(InputError);
    expect((err as Error).message).toBe(
      "x.f32: corrupt samples (up to 1.00e+30, over 1e+8 times the median magnitude) at t = 0.4883 s (samples 1000–1000, 0.000488 s); " +
        "bad data are rejected unless the search is told to leave them out",
    );
    const { candidates, summary } = await searchStrain(arrayInput(data, FS, 0, "x.f32"), { ...opts, badData: "exclude" });
    expect(summary.skipped).toEqual([{ startTime: 1000 / FS, endTime: 1001 / FS, reason: "corrupt samples (up to 1.00e+30, over 1e+8 times the median magnitude)" }]);
    expect(summary.skippedSeconds).toBeCloseTo(1 / FS, 12);
    // The rest is searched as if nothing were wrong: the injection is found as in clean data (the
    // segments start after the bad sample, so their PSD estimates differ slightly).
    data[1000] = 0;
    const clean = await searchStrain(arrayInput(data, FS, 0, "x.f32"), opts);
    const near = (list: typeof candidates) => list.filter((c) => Math.abs(c.coalescenceTime - 100) < 0.1);
    expect(near(clean.candidates)).toHaveLength(1);
    expect(near(candidates)).toHaveLength(1);
    expect(near(candidates)[0].templateIndex).toBe(near(clean.candidates)[0].templateIndex);
    expect(near(candidates)[0].coalescenceTime).toBeCloseTo(near(clean.candidates)[0].coalescenceTime, 4);
    expect(near(candidates)[0].snr / near(clean.candidates)[0].snr).toBeCloseTo(1, 2);
  });
});

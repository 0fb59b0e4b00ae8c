// Several inputs searched as one pipelined run (searchEach) give, input by input and in order,
// what searchStrain gives for each alone: with one thread and with workers, across an input that
// cannot be searched and an input whose segment length differs (new filters and workers). The
// workers run the compiled dist/, so the core is built first and a failed build fails the test.
import { beforeAll, describe, expect, it } from "vitest";
import { buildCoreForWorkers } from "../support/buildCore.js";
import { ajith2011, arrayInput, loadFftBackends, searchEach, searchStrain, type SearchInput, type SearchOptions, type SearchResult } from "@chirpsieve/core";
import { atSnr, chirpMassGrid, injectionAt, simulatedData } from "./fixtures.js";

const FS = 2048;
const FMIN = 30;

beforeAll(async () => {
  buildCoreForWorkers();
  await loadFftBackends();
});

/** Four synthetic inputs (invented scenario): two of 200 s and 160 s with chirps, one too short to search, one of 30 s (a shorter segment). */
function inputs(): SearchInput[] {
  const a = simulatedData({ psd: ajith2011, fs: FS, seconds: 200, seed: "each-a", fMin: FMIN, injections: [atSnr(injectionAt(3, 2.5, 90.25), 14, ajith2011, FS, FMIN)] });
  const b = simulatedData({ psd: ajith2011, fs: FS, seconds: 160, seed: "each-b", fMin: FMIN, injections: [atSnr(injectionAt(3.6, 2.4, 120.5, { phase: 1.1 }), 16, ajith2011, FS, FMIN)] });
  const short = simulatedData({ psd: ajith2011, fs: FS, seconds: 6, seed: "each-short", fMin: FMIN });
  const d = simulatedData({ psd: ajith2011, fs: FS, seconds: 30, seed: "each-d", fMin: FMIN, injections: [atSnr(injectionAt(3, 3, 25.3), 15, ajith2011, FS, FMIN)] });
  return [arrayInput(a, FS, 1000, "a"), arrayInput(short, FS, 3000, "short"), arrayInput(b, FS, 2000, "b"), arrayInput(d, FS, 4000, "d")];
}

const options: SearchOptions = {
  templates: chirpMassGrid(2.2, 2.8, 0.01, [1, 0.6]),
  fMinHz: FMIN,
  snrThreshold: 5.5,
  chi2Bands: 16,
  loudestWithinSeconds: 1,
  psd: { kind: "estimate", segmentSeconds: 4, average: "median" },
  segmentSeconds: 64,
  fftBackend: "pffft",
};

/** The parts of a result that do not depend on timing or on the thread count. */
function comparable(r: SearchResult): unknown {
  const { wallSeconds: _w, threads: _t, ...summary } = r.summary;
  return { candidates: r.candidates, summary };
}

describe("searchEach: several inputs as one pipelined run", () => {
  for (const threads of [1, 2]) {
    it(`gives each input what searchStrain gives it alone, in order (${threads} thread${threads > 1 ? "s" : ""})`, async () => {
      const alone: SearchResult[] = [];
      for (const input of inputs()) alone.push(await searchStrain(input, { ...options, threads }));
      // The layout the test relies on: a short input with nothing to search, and a segment length that changes.
      expect(alone.map((r) => r.summary.segments > 0)).toEqual([true, false, true, true]);
      expect(new Set(alone.filter((r) => r.summary.segments > 0).map((r) => r.summary.segmentSamples)).size).toBe(2);
      expect(alone.reduce((n, r) => n + r.candidates.filter((c) => c.snr > 10).length, 0)).toBe(3);

      const list = inputs();
      const opened: number[] = [];
      const got: { index: number; result: SearchResult }[] = [];
      await searchEach(
        list.length,
        (i) => {
          opened.push(i);
          return { input: list[i] };
        },
        { ...options, threads },
        (index, result) => {
          got.push({ index, result });
        },
      );
      expect(opened).toEqual([0, 1, 2, 3]);
      expect(got.map((g) => g.index)).toEqual([0, 1, 2, 3]);
      for (const [i, g] of got.entries()) expect(comparable(g.result)).toEqual(comparable(alone[i]));
      if (threads > 1) expect(got.filter((g) => g.result.summary.segments > 0).every((g) => g.result.summary.threads === threads)).toBe(true);
    });
  }

  it("stops at the first input whose callback throws, having handed on the ones before", async () => {
    const list = inputs();
    const seen: number[] = [];
    await expect(
      searchEach(list.length, (i) => ({ input: list[i] }), { ...options, threads: 2 }, (index) => {
        seen.push(index);
        if (index === 2) throw new Error("stop here");
      }),
    ).rejects.toThrow("stop here");
    expect(seen).toEqual([0, 1, 2]);
  });
});

// Worker threads give the same candidates as one thread. The workers run the compiled
// packages/core/dist/search/searchWorker.js, so the core is built first with tsc -b, and a failed
// build fails the test: the workers never run a stale dist/.
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { buildCoreForWorkers } from "../support/buildCore.js";
import { ajith2011, arrayInput, createBankFilter, createSegmentFilter, loadFftBackends, searchStrain, type Candidate, type SearchOptions } from "@chirpsieve/core";
import { type Trigger } from "../../packages/core/src/filter/peaks.js";
import { createSearchPool } from "../../packages/core/src/search/workerPool.js";
import { atSnr, chirpMassGrid, injectionAt, simulatedData } from "../search/fixtures.js";

const FS = 2048;
const FMIN = 30;

beforeAll(async () => {
  buildCoreForWorkers();
  await loadFftBackends();
});

function expectSameCandidates(a: Candidate[], b: Candidate[]): void {
  expect(b.length).toBe(a.length);
  for (let i = 0; i < a.length; i++) {
    expect(b[i].templateIndex).toBe(a[i].templateIndex);
    expect(b[i].coalescenceTime).toBe(a[i].coalescenceTime);
    expect(Math.abs(b[i].snr - a[i].snr)).toBeLessThan(1e-4 * a[i].snr);
    expect(Math.abs(b[i].chi2 - a[i].chi2)).toBeLessThan(1e-4 * Math.max(1, a[i].chi2));
    expect(b[i].effectiveDistanceMpc).toBeCloseTo(a[i].effectiveDistanceMpc, 6);
  }
}

describe("multi-threaded search (worker_threads sharing the segment's weights)", () => {
  for (const [fftBackend, counts] of [["pffft", [2, 3]], ["fftjs", [2]]] as const) {
    it(`gives the same candidates with 1 and ${counts.join(" and ")} threads over several segments (${fftBackend})`, async () => {
      const injections = [
        atSnr(injectionAt(1.6, 1.3, 70.25), 14, ajith2011, FS, FMIN),
        atSnr(injectionAt(2.4, 1.2, 150.5, { phase: 1.9 }), 20, ajith2011, FS, FMIN),
      ];
      const data = simulatedData({ psd: ajith2011, fs: FS, seconds: 200, seed: "threads", fMin: FMIN, injections });
      const options: SearchOptions = {
        // fft.js is ~6× slower: a quarter of the grid keeps this test short.
        templates: chirpMassGrid(1.1, 1.6, 0.01, [1, 0.5]).filter((_, i) => fftBackend === "pffft" || i % 4 === 0),
        fMinHz: FMIN,
        snrThreshold: 5.5,
        chi2Bands: 16,
        loudestWithinSeconds: 1,
        psd: { kind: "estimate", segmentSeconds: 4, average: "median" },
        segmentSeconds: 128,
        fftBackend,
      };
      const one = await searchStrain(arrayInput(data, FS), { ...options, threads: 1 });
      expect(one.summary.threads).toBe(1);
      expect(one.summary.segments).toBeGreaterThan(1);
      if (fftBackend === "pffft") expect(one.candidates.filter((c) => c.snr > 9)).toHaveLength(2);
      for (const threads of counts) {
        const many = await searchStrain(arrayInput(data, FS), { ...options, threads });
        expect(many.summary.threads).toBe(threads);
        expectSameCandidates(one.candidates, many.candidates);
      }
    });
  }

  it("filters a template range [from, to) in the workers exactly as one thread does (same peaks, same σ), in either slot of the double buffer", async () => {
    const n = 1 << 17;
    const data = simulatedData({ psd: ajith2011, fs: FS, seconds: 2 * n / FS, seed: "threads-range", fMin: FMIN });
    const filter = createSegmentFilter({
      size: n, sampleRate: FS, fMinHz: FMIN, fMaxHz: 0.95 * (FS / 2),
      psd: { kind: "model", model: ajith2011 }, truncationSamples: 2 * FS, backend: "pffft", shared: true,
    });
    const twin = filter.twin();
    filter.load(data.slice(0, n), n);
    twin.load(data.slice(n), n);
    const bank = chirpMassGrid(2, 6, 0.06, [1, 0.6]);
    const masses = new Float64Array(bank.flatMap((t) => [t.primaryMassSolar, t.secondaryMassSolar]));
    const config = { size: n, sampleRate: FS, fMinHz: FMIN, fMaxHz: 0.95 * (FS / 2), backend: "pffft" as const };
    const peaks = { start: 8 * FS, end: n - 2 * FS, threshold: 3.5, window: FS / 4 };
    const from = 5, to = bank.length - 3;
    const pool = await createSearchPool(2, config, [filter.weights, twin.weights], masses);
    try {
      for (const [slot, f] of [filter, twin].entries()) {
        const one: Trigger[] = [];
        const sigmas = new Float64Array(bank.length);
        createBankFilter(config).scan(f.weights, masses, from, to, peaks, sigmas, one);
        const many = await pool.run(slot, slot, peaks, from, to);
        expect(one.length).toBeGreaterThan(20);
        expect(many).toEqual(one);
        expect(Array.from(pool.sigmas[slot].subarray(from, to))).toEqual(Array.from(sigmas.subarray(from, to)));
        expect(pool.sigmas[slot][from - 1]).toBe(0);
        expect(pool.sigmas[slot][to]).toBe(0);
      }
      // The two slots hold different segments: their peaks differ.
      expect(await pool.run(0, 0, peaks, from, to)).not.toEqual(await pool.run(1, 1, peaks, from, to));
    } finally {
      await pool.close();
      filter.dispose();
    }
  });

  it("rejects a thread count that is not a positive integer", async () => {
    const data = simulatedData({ psd: ajith2011, fs: FS, seconds: 64, seed: "threads-bad", fMin: FMIN });
    const options: SearchOptions = {
      templates: [{ primaryMassSolar: 10, secondaryMassSolar: 8 }],
      fMinHz: FMIN,
      snrThreshold: 6,
      chi2Bands: 0,
      loudestWithinSeconds: 1,
      psd: { kind: "model", model: ajith2011 },
    };
    for (const threads of [0, 1.5, -2, NaN]) {
      await expect(searchStrain(arrayInput(data, FS), { ...options, threads })).rejects.toThrow(/threads: must be a positive integer/);
    }
  });
});

describe("closing the workers", () => {
  it("never aborts the process: 30 searches with 8 workers each, in a child process, exit 0", () => {
    // Terminating busy workers outright aborted Node 20 (an assertion in NodePlatform::ForIsolate
    // while V8 compiled in the background) in about half the runs of this loop (3 of 5); the pool now asks its workers
    // to end their event loops. Measured here.
    const core = new URL("../../packages/core/dist/index.js", import.meta.url).href;
    const script = `
      const core = await import(${JSON.stringify(core)});
      await core.loadFftBackends();
      const fs = 512, data = core.colouredNoise(core.ajith2011, 1 << 15, fs, "close-workers");
      const templates = [[10, 8], [11, 9], [12, 8], [9, 8], [10, 10], [12, 11], [8, 8], [11, 11]].map(([a, b]) => ({ primaryMassSolar: a, secondaryMassSolar: b }));
      for (let r = 0; r < 30; r++) {
        await core.searchStrain(core.arrayInput(data, fs), { templates, fMinHz: 40, snrThreshold: 6, chi2Bands: 4, loudestWithinSeconds: 1, psd: { kind: "model", model: core.ajith2011 }, threads: 8 });
      }
      process.stdout.write("done");
    `;
    const dir = mkdtempSync(join(tmpdir(), "chirpsieve-close-"));
    const file = join(dir, "closeWorkers.mjs");
    writeFileSync(file, script);
    const r = spawnSync(process.execPath, [file], { encoding: "utf8" });
    rmSync(dir, { recursive: true, force: true });
    expect(r.status, r.stderr.slice(0, 400)).toBe(0);
    expect(r.stdout).toBe("done");
  }, 120_000);
});

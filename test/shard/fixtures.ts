// Shared set-up for the sharding, merge and resume tests: a small synthetic run (invented data,
// seeded noise with two injected chirps, one near a segment boundary) and helpers that run a
// shard or a resumable scan through searchStrain's segment hook.
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll } from "vitest";
import {
  ajith2011,
  arrayInput,
  searchStrain,
  startScanRun,
  type Candidate,
  type SearchInput,
  type SearchOptions,
  type ShardSpec,
} from "@chirpsieve/core";
import { atSnr, chirpMassGrid, injectionAt, simulatedData } from "../search/fixtures.js";

export const FS = 1024;
export const FMIN = 40;
export const VERSION = "0.0.0-test";
/** The caller arguments every test run records (part of the run id). */
export const RUN_ARGUMENTS = { bank: "test grid" };

/** Low threshold and a short window so that noise gives many peaks and clustering has work to do. */
export function runOptions(extra: Partial<SearchOptions> = {}): SearchOptions {
  return {
    templates: chirpMassGrid(6, 10, 0.03, [1, 0.7]),
    fMinHz: FMIN,
    snrThreshold: 4.6,
    chi2Bands: 8,
    loudestWithinSeconds: 0.4,
    psd: { kind: "estimate", segmentSeconds: 2, average: "median" },
    truncationSeconds: 1,
    segmentSeconds: 8,
    fftBackend: "pffft",
    threads: 1,
    ...extra,
  };
}

let cached: Float64Array[] | undefined;

/** Two synthetic inputs (invented scenario): 80 s and 48 s of seeded noise, chirps at SNR 12 and 10, and one at SNR 10. */
export function syntheticInputs(): SearchInput[] {
  cached ??= [
    simulatedData({
      psd: ajith2011,
      fs: FS,
      seconds: 80,
      seed: "shard-a",
      fMin: FMIN,
      injections: [atSnr(injectionAt(9, 7, 30.2), 12, ajith2011, FS, FMIN), atSnr(injectionAt(8, 7, 49.45, { phase: 2 }), 10, ajith2011, FS, FMIN)],
    }),
    simulatedData({ psd: ajith2011, fs: FS, seconds: 48, seed: "shard-b", fMin: FMIN, injections: [atSnr(injectionAt(8, 8, 20.7), 10, ajith2011, FS, FMIN)] }),
  ];
  return [arrayInput(cached[0], FS, 1000, "synthetic-a"), arrayInput(cached[1], FS, 2000, "synthetic-b")];
}

/** What the CLI does without sharding: searchStrain per input, candidates concatenated. */
export async function unshardedCandidates(inputs: SearchInput[], options: SearchOptions): Promise<Candidate[]> {
  const out: Candidate[] = [];
  for (const s of inputs) out.push(...(await searchStrain(s, options)).candidates);
  return out;
}

/** Runs one shard of the run through searchStrain's segment hook and writes its record file and manifest. */
export async function runShard(dir: string, inputs: SearchInput[], options: SearchOptions, shard: ShardSpec, name = `part-${shard.index}.jsonl`): Promise<string> {
  const run = await startScanRun({ version: VERSION, inputs, options, shard, arguments: RUN_ARGUMENTS });
  for (const [i, s] of inputs.entries()) await searchStrain(s, { ...options, segmentHook: run.hook(i) });
  const path = join(dir, name);
  run.writeShard(path);
  return path;
}

/** A fresh temporary folder, removed after the test file. */
export function tempDir(prefix: string): string {
  const dir = mkdtempSync(join(tmpdir(), `chirpsieve-${prefix}-`));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  return dir;
}

/** Fails with a clear message when searchStrain does not honour options.segmentHook yet. */
export async function expectHookWired(): Promise<void> {
  let asked = false;
  const [input] = syntheticInputs();
  await searchStrain(input, {
    ...runOptions(),
    segmentHook: {
      segments: () => {
        asked = true;
        return [];
      },
      templates: () => ({ from: 0, to: 0 }),
      done: () => {},
    },
  });
  if (!asked) throw new Error("searchStrain ignores options.segmentHook: the filter loop in search/scan.ts must ask the hook for its segments");
}

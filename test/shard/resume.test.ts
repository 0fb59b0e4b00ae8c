import { appendFileSync, existsSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { InputError, loadFftBackends, mergeShards, searchStrain, startScanRun, type Candidate, type SearchInput, type SearchOptions, type ShardSpec } from "@chirpsieve/core";
import { readScanJournal } from "../../packages/core/src/run/scanJournal.js";
import { expectHookWired, RUN_ARGUMENTS, runOptions, runShard, syntheticInputs, tempDir, unshardedCandidates, VERSION } from "./fixtures.js";

const dir = tempDir("resume");
let reference: Candidate[];

beforeAll(async () => {
  await loadFftBackends();
  await expectHookWired();
  reference = await unshardedCandidates(syntheticInputs(), runOptions());
});

class Killed extends Error {}

/**
 * Runs a journaled scan that "dies" after `killAfter` newly finished segments (the hook throws
 * right after the segment is journaled, as a SIGKILL between two segments would leave it), or
 * runs to the end when killAfter is undefined. Returns the run's result, or undefined when killed.
 */
async function journaledScan(journalPath: string, options: SearchOptions, killAfter?: number, shard?: ShardSpec) {
  const inputs = syntheticInputs();
  const run = await startScanRun({ version: VERSION, inputs, options, journalPath, shard, arguments: RUN_ARGUMENTS });
  let finished = 0;
  try {
    for (const [i, s] of inputs.entries()) {
      const hook = run.hook(i);
      await searchStrain(s, {
        ...options,
        segmentHook: {
          segments: (total) => hook.segments(total),
          templates: (segment) => hook.templates(segment),
          done(segment, outcome) {
            hook.done(segment, outcome);
            if (killAfter !== undefined && ++finished >= killAfter) throw new Killed("killed");
          },
        },
      });
    }
  } catch (error) {
    run.close();
    if (error instanceof Killed) return { run, killed: true as const };
    throw error;
  }
  return { run, killed: false as const };
}

describe("--resume: a killed scan continues from its journal and ends with the same result", () => {
  it("killed after 5 of 29 segments, then after 9 more, then finished: the same candidates as one uninterrupted run", async () => {
    const journal = join(dir, "whole.jsonl.journal");
    expect((await journaledScan(journal, runOptions(), 5)).killed).toBe(true);
    expect(readScanJournal(journal)!.records).toHaveLength(5);
    const second = await journaledScan(journal, runOptions(), 9);
    expect(second.killed).toBe(true);
    expect(second.run.resumedSegments).toBe(5);
    const last = await journaledScan(journal, runOptions());
    expect(last.run.resumedSegments).toBe(14);
    expect(last.run.result().candidates).toEqual(reference);
    last.run.finish();
    expect(existsSync(journal)).toBe(false);
  });

  it("ignores a torn last line (a kill in the middle of a write) and continues", async () => {
    const journal = join(dir, "torn.jsonl.journal");
    await journaledScan(journal, runOptions(), 3);
    appendFileSync(journal, '{"type":"segment","input":0,"segment":3,"templates":[0,');
    const last = await journaledScan(journal, runOptions());
    expect(last.run.resumedSegments).toBe(3);
    expect(last.run.result().candidates).toEqual(reference);
    // The torn bytes were cut before appending: every line of the journal is whole JSON.
    for (const line of readFileSync(journal, "utf8").trim().split("\n")) expect(() => JSON.parse(line)).not.toThrow();
  });

  it("refuses a journal written by a run with other arguments (InputError, exit 2 in the CLI)", async () => {
    const journal = join(dir, "other.jsonl.journal");
    await journaledScan(journal, runOptions(), 2);
    const before = readFileSync(journal, "utf8");
    await expect(journaledScan(journal, runOptions({ snrThreshold: 5 }))).rejects.toThrow(InputError);
    await expect(journaledScan(journal, runOptions({ snrThreshold: 5 }))).rejects.toThrow(/other\.jsonl\.journal: the journal belongs to another run \(run id [0-9a-f]{12}…, this run [0-9a-f]{12}…\)/);
    expect(readFileSync(journal, "utf8")).toBe(before);
  });

  it("refuses a file that is not a journal", async () => {
    const journal = join(dir, "notes.journal");
    writeFileSync(journal, '{"hello":1}\n');
    await expect(journaledScan(journal, runOptions())).rejects.toThrow(/notes\.journal: not a chirpsieve scan journal/);
  });

  it("resumes a shard too: shard 1/3 by both killed midway, resumed, merged with the others = the unsharded result", async () => {
    const shardDir = join(dir, "shards");
    const spec: ShardSpec = { index: 1, count: 3, by: "both" };
    const path = join(shardDir, "part-1.jsonl");
    const journal = `${path}.journal`;
    expect((await journaledScan(journal, runOptions(), 4, spec)).killed).toBe(true);
    // The same journal cannot be taken over by another shard.
    await expect(journaledScan(journal, runOptions(), undefined, { ...spec, index: 2 })).rejects.toThrow(/belongs to shard 1\/3 by both, not shard 2\/3 by both/);
    const last = await journaledScan(journal, runOptions(), undefined, spec);
    expect(last.run.resumedSegments).toBe(4);
    last.run.writeShard(path);
    last.run.finish();
    await runShard(shardDir, syntheticInputs(), runOptions(), { ...spec, index: 0 });
    await runShard(shardDir, syntheticInputs(), runOptions(), { ...spec, index: 2 });
    expect(mergeShards([shardDir]).candidates).toEqual(reference);
  });
});

describe("a sharded or resumable run screens each input once", () => {
  /** An input that counts the samples read from it. */
  function counting(source: SearchInput): { input: SearchInput; read: () => number } {
    let samples = 0;
    const input: SearchInput = {
      ...source,
      read: async (start, length) => {
        samples += length;
        return source.read(start, length);
      },
    };
    return { input, read: () => samples };
  }

  it("reads the input once to screen it, not again in searchStrain (the run's plan goes to searchStrain with the hook)", async () => {
    const options = { ...runOptions(), badData: "reject" as const };
    const plain = counting(syntheticInputs()[0]);
    await searchStrain(plain.input, options);
    const hooked = counting(syntheticInputs()[0]);
    const run = await startScanRun({ version: VERSION, inputs: [hooked.input], options, arguments: RUN_ARGUMENTS });
    const result = await searchStrain(hooked.input, { ...options, segmentHook: run.hook(0) });
    run.close();
    expect(result.summary.segments).toBeGreaterThan(1);
    // Screening reads the whole input once (80 s at 1024 Hz). The run also checksums the samples
    // (an in-memory input has no file to hash): one more whole read; a second screen would add another.
    const whole = 80 * 1024;
    expect(plain.read()).toBeGreaterThan(whole);
    expect(hooked.read()).toBe(plain.read() + whole);
  });
});

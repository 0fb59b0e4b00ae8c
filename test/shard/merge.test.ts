import { copyFileSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { arrayInput, InputError, loadFftBackends, mergeShards, searchStrain, type Candidate, type ShardBy } from "@chirpsieve/core";
import { expectHookWired, runOptions, runShard, syntheticInputs, tempDir, unshardedCandidates } from "./fixtures.js";

const root = tempDir("merge");
let reference: Candidate[];

beforeAll(async () => {
  await loadFftBackends();
  await expectHookWired();
  reference = await unshardedCandidates(syntheticInputs(), runOptions());
});

function expectSameCandidates(merged: Candidate[], single: Candidate[]): void {
  expect(merged.map((c) => [c.file, c.templateIndex, c.coalescenceTime])).toEqual(single.map((c) => [c.file, c.templateIndex, c.coalescenceTime]));
  for (const [i, c] of merged.entries()) expect(Math.abs(c.snr - single[i].snr)).toBeLessThanOrEqual(1e-6);
  // In fact every number is identical: each shard computes its survivors exactly as the single run does.
  expect(merged).toEqual(single);
}

async function shardsInto(dir: string, count: number, by: ShardBy): Promise<string[]> {
  mkdirSync(dir, { recursive: true });
  const paths: string[] = [];
  for (let index = 0; index < count; index++) paths.push(await runShard(dir, syntheticInputs(), runOptions(), { index, count, by }));
  return paths;
}

describe("merging shards gives the unsharded result", () => {
  it("the reference run has work for the clustering: several segments, loud chirps and many noise peaks", () => {
    expect(reference.filter((c) => c.snr > 7).length).toBeGreaterThanOrEqual(3);
    expect(reference.length).toBeGreaterThan(20);
  });

  for (const by of ["templates", "time", "both"] as ShardBy[]) {
    it(`by ${by}: N = 1, 2, 3, 4 merge to the same candidates with the same numbers`, async () => {
      for (const count of [1, 2, 3, 4]) {
        const dir = join(root, `${by}-${count}`);
        await shardsInto(dir, count, by);
        const merged = mergeShards([dir]);
        expect(merged.shards).toBe(count);
        expectSameCandidates(merged.candidates, reference);
        expect(merged.perInput.map((p) => p.candidates)).toEqual([
          reference.filter((c) => c.file === "synthetic-a").length,
          reference.filter((c) => c.file === "synthetic-b").length,
        ]);
      }
    });
  }
});

describe("merging shards of a run that skips bad data", () => {
  it("a NaN sample, left out by every shard that covers it: same candidates and the same left-out stretch", async () => {
    const [a, b] = syntheticInputs();
    const data = await a.read(0, a.length);
    data[30_000] = Number.NaN;
    const inputs = [arrayInput(data, a.sampleRate, a.startTime, a.file), b];
    const options = runOptions({ badData: "exclude" });
    const single = await searchStrain(inputs[0], options);
    const singleB = await searchStrain(inputs[1], options);
    expect(single.summary.skipped).toHaveLength(1);
    const dir = join(root, "nan");
    mkdirSync(dir);
    for (let index = 0; index < 3; index++) await runShard(dir, inputs, options, { index, count: 3, by: "both" });
    const merged = mergeShards([dir]);
    expect(merged.candidates).toEqual([...single.candidates, ...singleB.candidates]);
    expect(merged.perInput[0].skipped).toEqual(single.summary.skipped);
    expect(merged.perInput[0].skippedSeconds).toBe(single.summary.skippedSeconds);
    expect(merged.perInput[0].analysedSeconds).toBe(single.summary.analysedSeconds);
  });
});

describe("merge checks that the shards are one complete run", () => {
  let dir: string;
  beforeAll(async () => {
    dir = join(root, "checks");
    await shardsInto(dir, 4, "both");
  });

  const failure = (paths: string[]): string => {
    try {
      mergeShards(paths);
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      expect((e as Error).message).not.toContain("\n");
      return (e as Error).message;
    }
    throw new Error("merge did not fail");
  };
  const shard = (i: number) => join(dir, `part-${i}.jsonl`);

  it("names a missing shard", () => {
    expect(failure([shard(0), shard(1), shard(3)])).toBe("merge: shard 2/4 is missing");
    expect(failure([shard(0), shard(3)])).toBe("merge: shards 1/4, 2/4 are missing");
  });

  it("names a shard given twice under two names", () => {
    const twice = join(root, "twice");
    mkdirSync(twice);
    for (const f of ["part-0", "part-1", "part-2", "part-3"]) {
      copyFileSync(join(dir, `${f}.jsonl`), join(twice, `${f}.jsonl`));
      copyFileSync(join(dir, `${f}.manifest.json`), join(twice, `${f}.manifest.json`));
    }
    copyFileSync(join(dir, "part-1.jsonl"), join(twice, "b.jsonl"));
    writeFileSync(join(twice, "b.manifest.json"), readFileSync(join(dir, "part-1.manifest.json"), "utf8").replace('"part-1.jsonl"', '"b.jsonl"'));
    expect(failure([twice])).toBe("merge: shard 1/4 appears twice (b.jsonl, part-1.jsonl)");
  });

  it("refuses shards of different runs", async () => {
    const other = join(root, "other");
    mkdirSync(other);
    const odd = await runShard(other, syntheticInputs(), runOptions({ snrThreshold: 5 }), { index: 2, count: 4, by: "both" });
    expect(failure([shard(0), shard(1), odd, shard(3)])).toMatch(/^merge: part-0\.jsonl and part-2\.jsonl belong to different runs \(run ids/);
  });

  it("refuses an incomplete record file", () => {
    const cut = join(root, "cut");
    mkdirSync(cut);
    for (let i = 0; i < 4; i++) {
      copyFileSync(join(dir, `part-${i}.manifest.json`), join(cut, `part-${i}.manifest.json`));
      const text = readFileSync(shard(i), "utf8");
      writeFileSync(join(cut, `part-${i}.jsonl`), i === 2 ? text.split("\n").slice(0, -2).join("\n") + "\n" : text);
    }
    expect(failure([cut])).toMatch(/^merge: .*part-2\.jsonl: \d+ bytes, but its manifest records \d+: the file changed or was cut short; rerun shard 2\/4$/);
  });

  it("refuses a manifest whose coverage is not its shard's", () => {
    const edited = join(root, "edited");
    mkdirSync(edited);
    for (let i = 0; i < 4; i++) {
      copyFileSync(shard(i), join(edited, `part-${i}.jsonl`));
      const m = JSON.parse(readFileSync(join(dir, `part-${i}.manifest.json`), "utf8"));
      if (i === 1) m.covered.blocks[0].templates[0] += 1;
      writeFileSync(join(edited, `part-${i}.manifest.json`), JSON.stringify(m));
    }
    expect(failure([edited])).toMatch(/part-1\.manifest\.json: the coverage it records is not that of shard 1\/4 of this run$/);
  });
});

import { beforeAll, describe, expect, it } from "vitest";
import { loadFftBackends, mergeShards } from "@chirpsieve/core";
import { expectHookWired, runOptions, runShard, syntheticInputs, tempDir, unshardedCandidates } from "./fixtures.js";

// Worker threads run the compiled core (packages/core/dist): `npm test` builds it first.
const dir = tempDir("threads");

beforeAll(async () => {
  await loadFftBackends();
  await expectHookWired();
});

describe("shards filtered by worker threads", () => {
  it("two shards by both, each with 2 threads over its template ranges, merge to the single-thread unsharded result", async () => {
    const reference = await unshardedCandidates(syntheticInputs(), runOptions());
    const paths = [];
    for (let index = 0; index < 2; index++) paths.push(await runShard(dir, syntheticInputs(), runOptions({ threads: 2 }), { index, count: 2, by: "both" }));
    expect(mergeShards(paths).candidates).toEqual(reference);
  });
});

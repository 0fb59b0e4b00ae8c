// The CLI's --shard flag: I/N, or auto/N with the index from a scheduler's array-task variable.
import { describe, expect, it } from "vitest";
import { InputError } from "@chirpsieve/core";
import { parseShardSpec } from "../../packages/cli/src/shardFlag.js";

describe("parseShardSpec reads --shard I/N and auto/N", () => {
  it("parses I/N (0-based)", () => {
    expect(parseShardSpec("2/4", "time")).toEqual({ index: 2, count: 4, by: "time" });
  });

  it("takes auto from SLURM_ARRAY_TASK_ID, else JOB_COMPLETION_INDEX", () => {
    expect(parseShardSpec("auto/4", "both", { SLURM_ARRAY_TASK_ID: "3" }).index).toBe(3);
    expect(parseShardSpec("auto/4", "both", { JOB_COMPLETION_INDEX: "1" }).index).toBe(1);
  });

  it("rejects bad specs with a one-line message naming the flag", () => {
    const cases: [string, string, Record<string, string>, RegExp][] = [
      ["4/4", "time", {}, /--shard: the index must be below the count/],
      ["1-4", "time", {}, /--shard: expected I\/N/],
      ["0/0", "time", {}, /at least 1/],
      ["auto/4", "time", {}, /none of SLURM_ARRAY_TASK_ID, JOB_COMPLETION_INDEX is set/],
      ["auto/4", "time", { SLURM_ARRAY_TASK_ID: "4" }, /SLURM_ARRAY_TASK_ID=4 is outside 0..3; submit the array with indices 0-3/],
      ["1/4", "bank", {}, /--shard-by: expected one of templates, time, both/],
    ];
    for (const [text, by, env, re] of cases) {
      let error: unknown;
      try {
        parseShardSpec(text, by, env);
      } catch (e) {
        error = e;
      }
      expect(error).toBeInstanceOf(InputError);
      expect((error as Error).message).toMatch(re);
      expect((error as Error).message).not.toContain("\n");
    }
  });
});

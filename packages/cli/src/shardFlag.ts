// `--shard I/N` and `--shard auto/N`: the CLI's spelling of a core ShardSpec.
import { SHARD_BY_CHOICES, type ShardBy, type ShardSpec } from "@chirpsieve/core";
import { UsageError } from "./errors.js";

/** Environment variables a batch scheduler sets to an array task's 0-based index, in the order tried by `auto/N`. */
export const SHARD_INDEX_VARIABLES: readonly string[] = ["SLURM_ARRAY_TASK_ID", "JOB_COMPLETION_INDEX"];

/**
 * Parses `I/N` (0-based I) or `auto/N`, where auto takes I from the first of
 * {@link SHARD_INDEX_VARIABLES} set in `env` (a Slurm array task or a Kubernetes indexed job).
 * Errors name the `--shard` flag.
 */
export function parseShardSpec(text: string, by: string, env: Readonly<Record<string, string | undefined>> = {}): ShardSpec {
  const m = /^\s*(auto|\d+)\s*\/\s*(\d+)\s*$/.exec(String(text));
  if (!m) throw new UsageError(`--shard: expected I/N with 0 ≤ I < N, or auto/N (got "${text}")`);
  const count = Number(m[2]);
  if (!(count >= 1)) throw new UsageError(`--shard: the shard count N must be at least 1 (got "${text}")`);
  if (!SHARD_BY_CHOICES.includes(by as ShardBy)) throw new UsageError(`--shard-by: expected one of ${SHARD_BY_CHOICES.join(", ")} (got "${by}")`);
  let index: number;
  if (m[1] === "auto") {
    const name = SHARD_INDEX_VARIABLES.find((v) => env[v] !== undefined && env[v] !== "");
    if (!name) {
      throw new UsageError(
        `--shard auto/${count}: none of ${SHARD_INDEX_VARIABLES.join(", ")} is set; run inside a scheduler array task or give the index, e.g. --shard 0/${count}`,
      );
    }
    const v = String(env[name]).trim();
    if (!/^\d+$/.test(v)) throw new UsageError(`--shard auto/${count}: ${name} must be a whole number (got "${v}")`);
    index = Number(v);
    if (index >= count) {
      throw new UsageError(`--shard auto/${count}: ${name}=${index} is outside 0..${count - 1}; submit the array with indices 0-${count - 1}`);
    }
  } else {
    index = Number(m[1]);
    if (index >= count) throw new UsageError(`--shard: the index must be below the count (0 ≤ I < ${count}; got "${text}")`);
  }
  return { index, count, by: by as ShardBy };
}

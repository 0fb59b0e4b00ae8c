import { InputError } from "../errors.js";

/** How a run is split into shards: by template blocks, by time (segments), or both. */
export type ShardBy = "templates" | "time" | "both";

export const SHARD_BY_CHOICES: readonly ShardBy[] = ["templates", "time", "both"];

/** Shard `index` (0-based) of `count` disjoint pieces of a run, split `by`. */
export interface ShardSpec {
  readonly index: number;
  readonly count: number;
  readonly by: ShardBy;
}

/**
 * A rectangle of work: segments first..last (inclusive, numbered within input file `input`) of one
 * input, each filtered with templates first..last (inclusive) of the bank.
 */
export interface WorkBlock {
  readonly input: number;
  readonly segments: readonly [number, number];
  readonly templates: readonly [number, number];
}

/** What one shard runs: disjoint blocks in input, segment order. Empty when the shard has nothing to do. */
export interface ShardWork {
  readonly shard: ShardSpec;
  readonly blocks: readonly WorkBlock[];
}

/** Checks a shard spec at the door (index an integer in 0..count−1, count ≥ 1, a known `by`). */
export function checkShardSpec(shard: ShardSpec, what = "shard"): void {
  if (!Number.isInteger(shard.count) || shard.count < 1) throw new InputError(`${what}: the shard count must be a positive integer (got ${shard.count})`);
  if (!Number.isInteger(shard.index) || shard.index < 0 || shard.index >= shard.count) {
    throw new InputError(`${what}: the shard index must be an integer from 0 to ${shard.count - 1} (got ${shard.index})`);
  }
  if (!SHARD_BY_CHOICES.includes(shard.by)) throw new InputError(`${what}: shard-by must be one of ${SHARD_BY_CHOICES.join(", ")} (got "${shard.by}")`);
}

/** `2/4` */
export function shardLabel(shard: { index: number; count: number }): string {
  return `${shard.index}/${shard.count}`;
}

/** floor(i · total / count) without overflow worries for realistic sizes (exact in float64 below 2^53). */
function cut(i: number, total: number, count: number): number {
  return Math.floor((i * total) / count);
}

/**
 * The work of one shard, deterministic in its arguments. The run's units are the pairs
 * (segment, template) over every segment of every input (`segmentCounts[i]` segments in input i,
 * numbered in input order) and the `templateCount` templates of the bank. The N shards partition
 * them exactly (every pair in exactly one shard):
 * - `templates`: shard i filters templates ⌊iT/N⌋ … ⌊(i+1)T/N⌋−1 over all segments;
 * - `time`: shard i filters all templates over global segments ⌊iS/N⌋ … ⌊(i+1)S/N⌋−1;
 * - `both`: the S·T pairs in segment-major order are cut into N runs of (nearly) equal length,
 *   so each shard has ⌊S·T/N⌋ or one more pairs: a partial first segment, whole middle segments
 *   and a partial last segment (equal FFT cost per shard, contiguous data per shard).
 * Shards beyond the available work get no blocks.
 */
export function shardWork(segmentCounts: number | readonly number[], templateCount: number, shard: ShardSpec): ShardWork {
  checkShardSpec(shard);
  const counts = typeof segmentCounts === "number" ? [segmentCounts] : segmentCounts;
  for (const c of counts) if (!Number.isInteger(c) || c < 0) throw new InputError(`shard work: segment counts must be whole numbers (got ${c})`);
  if (!Number.isInteger(templateCount) || templateCount < 1) throw new InputError(`shard work: the bank must hold at least one template (got ${templateCount})`);
  const T = templateCount;
  const S = counts.reduce((a, b) => a + b, 0);
  const { index: i, count: N } = shard;
  // Global segment g → (input, local segment); blocks never straddle an input.
  const starts: number[] = [];
  let acc = 0;
  for (const c of counts) {
    starts.push(acc);
    acc += c;
  }
  const blocks: WorkBlock[] = [];
  /** Adds global segments g0..g1 (inclusive) with templates t0..t1, split at input boundaries. */
  const add = (g0: number, g1: number, t0: number, t1: number): void => {
    if (g1 < g0 || t1 < t0) return;
    for (let input = 0; input < counts.length; input++) {
      const lo = Math.max(g0, starts[input]);
      const hi = Math.min(g1, starts[input] + counts[input] - 1);
      if (lo <= hi) blocks.push({ input, segments: [lo - starts[input], hi - starts[input]], templates: [t0, t1] });
    }
  };
  if (S > 0) {
    if (shard.by === "templates") {
      add(0, S - 1, cut(i, T, N), cut(i + 1, T, N) - 1);
    } else if (shard.by === "time") {
      add(cut(i, S, N), cut(i + 1, S, N) - 1, 0, T - 1);
    } else {
      const p0 = cut(i, S * T, N);
      const p1 = cut(i + 1, S * T, N); // exclusive
      if (p1 > p0) {
        const gFirst = Math.floor(p0 / T);
        const gLast = Math.floor((p1 - 1) / T);
        const tFirst = p0 % T;
        const tLast = (p1 - 1) % T;
        if (gFirst === gLast) {
          add(gFirst, gFirst, tFirst, tLast);
        } else {
          // Partial first segment, whole middle segments, partial last segment (merged when whole).
          let g0 = gFirst;
          if (tFirst > 0) {
            add(gFirst, gFirst, tFirst, T - 1);
            g0 = gFirst + 1;
          }
          let g1 = gLast;
          if (tLast < T - 1) g1 = gLast - 1;
          add(g0, g1, 0, T - 1);
          if (tLast < T - 1) add(gLast, gLast, 0, tLast);
        }
      }
    }
  }
  return { shard, blocks };
}

/** Template range [first, last] of `work` for segment `segment` of input `input`, or undefined when the shard does not cover it. */
export function templatesOf(work: ShardWork, input: number, segment: number): readonly [number, number] | undefined {
  for (const b of work.blocks) {
    if (b.input === input && segment >= b.segments[0] && segment <= b.segments[1]) return b.templates;
  }
  return undefined;
}

/** The (input, segment) pairs a shard covers, in order, with their template range. */
export function coveredSegments(work: ShardWork): { input: number; segment: number; templates: readonly [number, number] }[] {
  const out: { input: number; segment: number; templates: readonly [number, number] }[] = [];
  for (const b of work.blocks) {
    for (let s = b.segments[0]; s <= b.segments[1]; s++) out.push({ input: b.input, segment: s, templates: b.templates });
  }
  return out;
}

import type { SearchInput } from "./types.js";

/** Several inputs whose samples continue each other, read as one. */
export interface JoinedInput extends SearchInput {
  /** The inputs joined, in time order. */
  readonly parts: readonly SearchInput[];
}

/**
 * True when `next` continues `prev`: the same sample rate, and its first sample within half a
 * sample of the one that would follow prev's last. (Ours; common practice, no source.)
 */
export function continues(prev: SearchInput, next: SearchInput): boolean {
  if (prev.sampleRate !== next.sampleRate) return false;
  const expected = prev.startTime + prev.length / prev.sampleRate;
  return Math.abs(next.startTime - expected) <= 0.5 / prev.sampleRate;
}

/**
 * Groups inputs into streams: sorted by sample rate and start time, each input that continues the
 * previous one (see {@link continues}) joins its stream, so a search loses no lead-in at the files'
 * boundary. A gap, an overlap or a change of rate starts a new stream. A stream of one input is
 * that input itself; a longer one reads across its parts and names, for each time, the part that
 * holds it (`fileAt`). Streams come out in the order of their first sample.
 */
export function joinContiguousInputs(inputs: readonly SearchInput[]): SearchInput[] {
  const sorted = [...inputs].sort((a, b) => a.sampleRate - b.sampleRate || a.startTime - b.startTime);
  const groups: SearchInput[][] = [];
  for (const x of sorted) {
    const g = groups[groups.length - 1];
    if (g && continues(g[g.length - 1], x)) g.push(x);
    else groups.push([x]);
  }
  return groups.map((g) => (g.length === 1 ? g[0] : joinInputs(g))).sort((a, b) => a.startTime - b.startTime);
}

/** One input reading across `parts` (which must continue each other; see joinContiguousInputs). */
export function joinInputs(parts: readonly SearchInput[]): JoinedInput {
  const offsets: number[] = [];
  let length = 0;
  for (const p of parts) {
    offsets.push(length);
    length += p.length;
  }
  const first = parts[0];
  const fs = first.sampleRate;
  const partAt = (sample: number): number => {
    let lo = 0;
    let hi = parts.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (offsets[mid] <= sample) lo = mid;
      else hi = mid - 1;
    }
    return lo;
  };
  return {
    file: parts.map((p) => p.file).join(" + "),
    sampleRate: fs,
    startTime: first.startTime,
    length,
    parts,
    async read(offset: number, count: number): Promise<Float64Array> {
      if (!(offset >= 0 && count >= 0 && offset + count <= length)) {
        throw new RangeError(`read(${offset}, ${count}) outside [0, ${length}]`);
      }
      const out = new Float64Array(count);
      let at = offset;
      while (at < offset + count) {
        const i = partAt(at);
        const local = at - offsets[i];
        const take = Math.min(parts[i].length - local, offset + count - at);
        out.set(await parts[i].read(local, take), at - offset);
        at += take;
      }
      return out;
    },
    fileAt(time: number): string {
      const sample = Math.min(length - 1, Math.max(0, Math.floor((time - first.startTime) * fs)));
      const p = parts[partAt(sample)];
      return p.fileAt ? p.fileAt(time) : p.file;
    },
  };
}

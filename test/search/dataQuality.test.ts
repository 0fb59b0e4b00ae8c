// Screening, interval planning, stream joining and interval files: each on a small fixture.
import { describe, expect, it } from "vitest";
import { InputError, arrayInput, joinContiguousInputs } from "@chirpsieve/core";
import { parseIntervals } from "../../packages/core/src/io/intervalFile.js";
import { MIN_CONSTANT_RUN, screenInput } from "../../packages/core/src/search/dataQuality.js";
import { continues } from "../../packages/core/src/search/joinedInput.js";
import { planSegments } from "../../packages/core/src/search/segmentPlan.js";
import { intervalSamples, planStream } from "../../packages/core/src/search/streamPlan.js";
import seedrandom from "seedrandom";

function noise(n: number, seed: string): Float64Array {
  const rng = seedrandom(seed);
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = rng() - 0.5;
  return x;
}

describe("screenInput finds every unusable stretch, and nothing else", () => {
  it("finds nothing in noise", async () => {
    expect(await screenInput(arrayInput(noise(100_000, "clean"), 100))).toEqual([]);
  });

  it("finds NaN runs, zero-filled and constant runs of at least MIN_CONSTANT_RUN samples, and corrupt samples", async () => {
    const x = noise(3_000_000, "defects"); // three screening chunks: runs crossing chunk edges are joined
    x.fill(Number.NaN, 1000, 1500);
    x[1600] = Number.POSITIVE_INFINITY;
    x.fill(0, (1 << 20) - 100, (1 << 20) + 400); // across the first chunk edge
    x.fill(0.25, 2_000_000, 2_000_000 + MIN_CONSTANT_RUN);
    x.fill(0.3, 2_100_000, 2_100_000 + MIN_CONSTANT_RUN - 1); // one too short
    x[2_500_000] = 1e12;
    const bad = await screenInput(arrayInput(x, 1000));
    expect(bad).toEqual([
      { start: 1000, end: 1500, kind: "non-finite", value: Number.NaN },
      { start: 1600, end: 1601, kind: "non-finite", value: Number.NaN },
      { start: (1 << 20) - 100, end: (1 << 20) + 400, kind: "constant", value: 0 },
      { start: 2_000_000, end: 2_000_000 + MIN_CONSTANT_RUN, kind: "constant", value: 0.25 },
      { start: 2_500_000, end: 2_500_001, kind: "corrupt", value: 1e12 },
    ]);
  });

  it("finds an all-zero input as one stretch", async () => {
    expect(await screenInput(arrayInput(new Float64Array(5000), 100))).toEqual([{ start: 0, end: 5000, kind: "constant", value: 0 }]);
  });
});

describe("planStream leaves out exclusions and tiles the valid intervals", () => {
  const N = 1024;
  const A = 200; // invalidStart
  const B = 50; // invalidEnd

  it("plans a clean input exactly as planSegments does", () => {
    const p = planStream(10_000, 100, 0, N, A, B);
    expect(p.segments).toEqual(planSegments(10_000, N, A, B).segments);
    expect(p.intervals).toEqual([{ start: 0, end: 10_000 }]);
    expect(p.excludedSamples).toBe(0);
    expect(p.edgeSamples).toBe(A + B);
    expect(p.searchedSamples).toBe(10_000 - A - B);
  });

  it("splits around a bad stretch, losing the lead-in after it and the tail before it", () => {
    const p = planStream(10_000, 100, 0, N, A, B, { badData: [{ start: 4000, end: 4100, reason: "zero-filled samples" }] });
    expect(p.intervals).toEqual([{ start: 0, end: 4000 }, { start: 4100, end: 10_000 }]);
    expect(p.excludedSamples).toBe(100);
    expect(p.edgeSamples).toBe(2 * (A + B));
    expect(p.searchedSamples + p.edgeSamples + p.excludedSamples).toBe(10_000);
    // Every segment reads only valid samples, and searched ranges tile each interval's inside once.
    for (const s of p.segments) expect(s.start + s.dataLength <= 4000 || s.start >= 4100).toBe(true);
    const searched = p.segments.map((s) => [s.searchStart, s.searchEnd]);
    expect(searched[0][0]).toBe(A);
    expect(searched.some(([a]) => a === 4100 + A)).toBe(true);
    for (let i = 1; i < searched.length; i++) expect(searched[i][0]).toBeGreaterThanOrEqual(searched[i - 1][1]);
  });

  it("keeps only the analysis intervals, drops the excluded ones, and searches nothing in a stretch too short", () => {
    const p = planStream(10_000, 100, 50, N, A, B, {
      analysisIntervals: [{ start: 60, end: 120 }, { start: 140, end: 142 }],
      excludedIntervals: [{ start: 100, end: 101 }],
    });
    // Seconds 60–120 of a series starting at 50 s sampled at 100 Hz: samples 1000–7000.
    expect(p.intervals).toEqual([{ start: 1000, end: 5000 }, { start: 5100, end: 7000 }, { start: 9000, end: 9200 }]);
    expect(p.excluded.map((e) => e.reason)).toEqual(["outside the analysis intervals", "excluded interval", "outside the analysis intervals", "outside the analysis intervals"]);
    expect(p.segments.every((s) => s.searchStart < 9000)).toBe(true); // 200 samples cannot hold A + B
    expect(p.searchedSamples + p.edgeSamples + p.excludedSamples).toBe(10_000);
  });

  it("converts interval edges that fall on samples without rounding them away", () => {
    expect(intervalSamples({ start: 0.1, end: 0.3 }, 0, 10, 100)).toEqual({ start: 1, end: 3 });
    expect(intervalSamples({ start: -5, end: 1e9 }, 0, 10, 100)).toEqual({ start: 0, end: 100 });
  });
});

describe("contiguous inputs form one stream", () => {
  const part = (t0: number, n: number, fs: number, name: string) => arrayInput(noise(n, name), fs, t0, name);

  it("joins files whose samples continue each other (within half a sample), in time order", async () => {
    const a = part(100, 1000, 100, "a");
    const b = part(110 + 0.004, 500, 100, "b"); // 0.4 sample late: still contiguous
    const c = part(115.004, 700, 100, "c");
    expect(continues(a, b)).toBe(true);
    const [s] = joinContiguousInputs([c, a, b]);
    expect(s.length).toBe(2200);
    expect(s.startTime).toBe(100);
    expect(s.file).toBe("a + b + c");
    const all = await s.read(900, 700); // across both boundaries
    expect(Array.from(all.subarray(0, 100))).toEqual(Array.from(await a.read(900, 100)));
    expect(Array.from(all.subarray(100, 600))).toEqual(Array.from(await b.read(0, 500)));
    expect(Array.from(all.subarray(600))).toEqual(Array.from(await c.read(0, 100)));
    expect(s.fileAt!(109.99)).toBe("a");
    expect(s.fileAt!(112)).toBe("b");
    expect(s.fileAt!(121)).toBe("c");
  });

  it("keeps files apart across a gap, an overlap or a change of rate", () => {
    const a = part(0, 1000, 100, "a");
    expect(joinContiguousInputs([a, part(10.006, 10, 100, "gap")])).toHaveLength(2);
    expect(joinContiguousInputs([a, part(9.5, 10, 100, "overlap")])).toHaveLength(2);
    expect(joinContiguousInputs([a, part(10, 10, 200, "rate")])).toHaveLength(2);
  });
});

describe("interval files", () => {
  it("read `start end` lines with comments, sorted and merged", () => {
    const text = "# synthetic example\n\n300 400\n100\t200 # first\n150,250\n";
    expect(parseIntervals(text, "iv.txt")).toEqual([{ start: 100, end: 250 }, { start: 300, end: 400 }]);
  });

  it("refuse a malformed line naming the file and the line", () => {
    expect(() => parseIntervals("1 2\n5 4\n", "iv.txt")).toThrow(new InputError("iv.txt:2: the end 4 must be after the start 5"));
    expect(() => parseIntervals("1 2 3\n", "iv.txt")).toThrow(/iv\.txt:1: expected "start end"/);
    expect(() => parseIntervals("a b\n", "iv.txt")).toThrow(/iv\.txt:1: "a b" is not two numbers/);
  });
});

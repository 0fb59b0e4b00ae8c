import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { type ShardBy } from "@chirpsieve/core";
import { coveredSegments, shardWork } from "../../packages/core/src/run/shardWork.js";

const BYS: ShardBy[] = ["templates", "time", "both"];

describe("shardWork splits a run into disjoint pieces", () => {
  it("is a partition: every (input, segment, template) lies in exactly one of the N shards (property test)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.integer({ min: 0, max: 9 }), { minLength: 1, maxLength: 3 }),
        fc.integer({ min: 1, max: 40 }),
        fc.integer({ min: 1, max: 12 }),
        fc.constantFrom(...BYS),
        (segmentCounts, templates, count, by) => {
          const hits = segmentCounts.map((s) => new Uint8Array(s * templates));
          for (let index = 0; index < count; index++) {
            const work = shardWork(segmentCounts, templates, { index, count, by });
            for (const b of work.blocks) {
              expect(b.segments[0]).toBeLessThanOrEqual(b.segments[1]);
              expect(b.templates[0]).toBeLessThanOrEqual(b.templates[1]);
              for (let s = b.segments[0]; s <= b.segments[1]; s++) {
                for (let t = b.templates[0]; t <= b.templates[1]; t++) hits[b.input][s * templates + t]++;
              }
            }
            // A shard covers each segment at most once (one template range per segment).
            const seen = new Set(coveredSegments(work).map((c) => `${c.input}:${c.segment}`));
            expect(seen.size).toBe(coveredSegments(work).length);
          }
          for (const h of hits) for (const x of h) expect(x).toBe(1);
        },
      ),
      { seed: 20260901, numRuns: 300 },
    );
  });

  it("is deterministic and balanced: by both, shard sizes in pairs differ by at most one", () => {
    const sizes = Array.from({ length: 7 }, (_, index) =>
      shardWork([5, 3], 11, { index, count: 7, by: "both" }).blocks.reduce(
        (a, b) => a + (b.segments[1] - b.segments[0] + 1) * (b.templates[1] - b.templates[0] + 1),
        0,
      ),
    );
    expect(Math.max(...sizes) - Math.min(...sizes)).toBeLessThanOrEqual(1);
    expect(sizes.reduce((a, b) => a + b)).toBe(8 * 11);
    expect(shardWork([5, 3], 11, { index: 3, count: 7, by: "both" })).toEqual(shardWork([5, 3], 11, { index: 3, count: 7, by: "both" }));
  });

  it("splits by time into contiguous segment ranges with the whole bank, and by templates into bank blocks over all segments", () => {
    expect(shardWork(10, 4, { index: 1, count: 3, by: "time" }).blocks).toEqual([{ input: 0, segments: [3, 5], templates: [0, 3] }]);
    expect(shardWork(10, 9, { index: 2, count: 4, by: "templates" }).blocks).toEqual([{ input: 0, segments: [0, 9], templates: [4, 5] }]);
    // 3 segments × 4 templates in 5 pieces of 2 or 3 pairs: shard 2 holds pairs 4..6 = segment 1, templates 0..2.
    expect(shardWork(3, 4, { index: 2, count: 5, by: "both" }).blocks).toEqual([{ input: 0, segments: [1, 1], templates: [0, 2] }]);
  });
});

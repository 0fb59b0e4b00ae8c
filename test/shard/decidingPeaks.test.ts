import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { decidingPeaks } from "../../packages/core/src/run/shardRecord.js";
import { clusterByTime } from "../../packages/core/src/search/cluster.js";
import { type SegmentPeak } from "../../packages/core/src/search/segmentHook.js";

/** The per-segment clustering as searchStrain runs it: peaks in (template, sample) order. */
function cluster(peaks: readonly SegmentPeak[], w: number): SegmentPeak[] {
  const ordered = [...peaks].sort((a, b) => a.templateIndex - b.templateIndex || a.index - b.index);
  return clusterByTime(ordered, w);
}

const key = (p: SegmentPeak) => `${p.templateIndex}:${p.index}`;

describe("decidingPeaks keeps what the whole-bank clustering needs", () => {
  it("re-clustering the union of the subsets' deciding peaks gives the whole-bank survivors exactly (property test, ties and exact ±window distances included)", () => {
    const peak = fc.record({
      // Times on a 1/8 s grid, so distances of exactly the window occur; SNRs from a few values, so ties occur.
      slot: fc.integer({ min: 0, max: 160 }),
      jitter: fc.constantFrom(0, 0, 0, 1e-7, -3e-7),
      snr: fc.constantFrom(5, 5.5, 6, 6, 7.25, 9),
      templateIndex: fc.integer({ min: 0, max: 11 }),
      index: fc.integer({ min: 0, max: 4000 }),
    });
    fc.assert(
      fc.property(
        fc.array(peak, { maxLength: 120 }),
        fc.constantFrom(0.25, 0.5, 1, 1e-8),
        fc.array(fc.integer({ min: 1, max: 11 }), { maxLength: 4 }),
        fc.constantFrom(0, 1e9),
        (raw, w, cutsRaw, offset) => {
          const unique = new Map<string, SegmentPeak>();
          for (const r of raw) {
            const p = { time: offset + r.slot / 8 + r.jitter, snr: r.snr, templateIndex: r.templateIndex, index: r.index };
            unique.set(key(p), p);
          }
          const all = [...unique.values()];
          const cuts = [0, ...new Set(cutsRaw.sort((a, b) => a - b)), 12];
          const union = new Map<string, SegmentPeak>();
          for (let k = 0; k + 1 < cuts.length; k++) {
            const subset = all.filter((p) => p.templateIndex >= cuts[k] && p.templateIndex < cuts[k + 1]);
            for (const p of decidingPeaks(subset, cluster(subset, w), w)) union.set(key(p), p);
          }
          expect(cluster([...union.values()], w).map(key)).toEqual(cluster(all, w).map(key));
        },
      ),
      { seed: 424242, numRuns: 400 },
    );
  });

  it("keeps a few peaks per window, not one per template", () => {
    // 200 templates × 100 windows of peaks, loudness varying smoothly across templates and time.
    const peaks: SegmentPeak[] = [];
    for (let t = 0; t < 200; t++) {
      for (let j = 0; j < 100; j++) {
        peaks.push({ time: j * 0.5 + ((t * 37) % 50) / 100, snr: 5 + Math.sin(j * 1.7 + t * 0.11) + t / 1000, templateIndex: t, index: j * 512 });
      }
    }
    const kept = decidingPeaks(peaks, [], 0.5);
    expect(kept.length).toBeLessThan(peaks.length / 20);
  });
});

import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { welchPsd } from "@chirpsieve/core";
import { medianBiasFactor } from "../../packages/core/src/noise/welch.js";

describe("Welch median average", () => {
  for (const k of [7, 8]) {
    it(`equals the bias-corrected median of the segments' own periodograms (${k} segments, by sorting)`, () => {
      const n = 256;
      const fs = 1024;
      const rng = seedrandom(`median-${k}`);
      const data = new Float64Array(n * k).map(() => rng() - 0.5);
      const got = welchPsd(data, fs, { segmentLength: n, overlap: 0, average: "median" });
      // One segment's Welch estimate is its own periodogram.
      const periodograms = Array.from({ length: k }, (_, s) => welchPsd(data.slice(s * n, (s + 1) * n), fs, { segmentLength: n }).psd);
      for (let b = 0; b <= n / 2; b++) {
        const v = periodograms.map((p) => p[b]).sort((x, y) => x - y);
        const median = k % 2 === 1 ? v[(k - 1) / 2] : 0.5 * (v[k / 2 - 1] + v[k / 2]);
        expect(got.psd[b]).toBeCloseTo(median / medianBiasFactor(k), 12);
      }
    });
  }
});

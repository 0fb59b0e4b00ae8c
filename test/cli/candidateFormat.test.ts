// Candidate tables for long runs: hundreds of thousands of rows (a day of data at a low threshold).
import { describe, expect, it } from "vitest";
import type { Candidate } from "@chirpsieve/core";
import { formatCandidatesTable } from "../../packages/cli/src/candidateFormat.js";

describe("candidate table", () => {
  it("formats 300 000 candidates (no argument spread that would overflow the call stack)", () => {
    const c: Candidate = {
      coalescenceTime: 1000000000.5,
      snr: 7.1,
      phase: 0,
      chi2: 10,
      chi2Dof: 10,
      reweightedSnr: 7.1,
      primaryMassSolar: 1.4,
      secondaryMassSolar: 1.3,
      chirpMassSolar: 1.17,
      primarySpin: 0,
      secondarySpin: 0,
      effectiveSpin: 0,
      effectiveDistanceMpc: 100,
      templateIndex: 0,
      file: "x.f32",
    };
    const many = Array.from({ length: 300_000 }, (_, i) => ({ ...c, coalescenceTime: c.coalescenceTime + i }));
    const text = formatCandidatesTable(many, { minSnr: 7 });
    expect(text.split("\n").filter((l) => l.includes("x.f32")).length).toBe(300_000);
  });

  it("counts segments in the summary line: 1 segment, 3 segments", () => {
    const summary = { minSnr: 6, analysedSeconds: 10, files: 1, templates: 4, segmentSamples: 8192, sampleRate: 2048, psd: "flat", fftBackend: "fftjs", wallSeconds: 1 };
    expect(formatCandidatesTable([], { ...summary, segments: 1 })).toContain("(1 segment of 8192 samples");
    expect(formatCandidatesTable([], { ...summary, segments: 3 })).toContain("(3 segments of 8192 samples");
  });
});

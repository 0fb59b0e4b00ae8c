import { writeFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { readScanJournal } from "../../packages/core/src/run/scanJournal.js";
import { segmentRecordWithCurrentKeys } from "../../packages/core/src/run/shardRecord.js";
import { useTempDir } from "../io/tempDir.js";

const tmp = useTempDir("record-keys");

const rest = {
  coalescenceTime: 100.25, snr: 9.5, phase: 0.3, chi2: 14, chi2Dof: 30, reweightedSnr: 9.5, primarySpin: 0, secondarySpin: 0,
  effectiveSpin: 0, effectiveDistanceMpc: 120, templateIndex: 4, file: "a.f32", sample: 1234, peakSnr: 9.4,
};
/** A segment record as earlier versions wrote it: candidate masses without their unit. */
const previous = {
  type: "segment", input: 0, segment: 2, templates: [0, 9], searchSamples: 4096,
  candidates: [{ ...rest, primaryMass: 1.4, secondaryMass: 1.3, chirpMass: 1.1743 }],
};
const current = {
  type: "segment", input: 0, segment: 2, templates: [0, 9], searchSamples: 4096,
  candidates: [{ ...rest, primaryMassSolar: 1.4, secondaryMassSolar: 1.3, chirpMassSolar: 1.1743 }],
};

describe("segment records written before the masses carried their unit", () => {
  it("are read under the current key names; current records pass unchanged", () => {
    expect(segmentRecordWithCurrentKeys(previous)).toEqual(current);
    expect(segmentRecordWithCurrentKeys(current)).toEqual(current);
    expect(segmentRecordWithCurrentKeys(null)).toBeNull();
  });

  it("resume from a journal holding them", () => {
    const path = tmp.path("journal.jsonl");
    const header = { type: "scan-journal", tool: "chirpsieve", format: 1, version: "0.0.0-test", runId: "r1", shard: null };
    writeFileSync(path, `${JSON.stringify(header)}\n${JSON.stringify(previous)}\n`);
    expect(readScanJournal(path)!.records).toEqual([current]);
  });
});

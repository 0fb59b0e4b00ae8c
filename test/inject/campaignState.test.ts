import { appendFileSync, readFileSync, writeFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import {
  appendCampaignBatch,
  campaignFingerprint,
  readCampaignState,
  startCampaignState,
  type BatchResult,
} from "@chirpsieve/core";
import { useTempDir } from "../io/tempDir.js";

const tmp = useTempDir("campaign-state");

function batch(b: number): BatchResult {
  return { batch: b, startTime: 256 * b, analysedSeconds: 200.5, injections: [], falseCandidates: [{ batch: b, coalescenceTime: 256 * b + 3.25, snr: 6.5, reweightedSnr: 6.1, chirpMassSolar: 1.21 }] };
}

describe("campaign state file", () => {
  it("fingerprints arguments independently of key order", () => {
    expect(campaignFingerprint({ a: 1, b: [1, { c: 2, d: 3 }] })).toBe(campaignFingerprint({ b: [1, { d: 3, c: 2 }], a: 1 }));
    expect(campaignFingerprint({ a: 1 })).not.toBe(campaignFingerprint({ a: 2 }));
  });

  it("round-trips finished batches, one line each, counting a repeated batch once", () => {
    const path = tmp.path("round.jsonl");
    startCampaignState(path, "f1", { seed: "x" });
    appendCampaignBatch(path, "f1", batch(0));
    appendCampaignBatch(path, "f1", batch(1));
    appendCampaignBatch(path, "f1", batch(1));
    expect(readFileSync(path, "utf8").split("\n")).toHaveLength(5);
    expect(readCampaignState(path, "f1")).toEqual([batch(0), batch(1)]);
    expect(readCampaignState(tmp.path("absent.jsonl"), "f1")).toBeNull();
  });

  it("reads batches written before the masses carried their unit under the current names", () => {
    const path = tmp.path("previous.jsonl");
    startCampaignState(path, "f1", {});
    const outcome = {
      index: 0, batch: 0, coalescenceTime: 12.5, arrivalTime: 12.51, distanceMpc: 40, inclination: 0.5, rightAscension: 1, declination: 0.2,
      polarisation: 0.3, phase: 0.4, optimalSnr: 12, found: true, recoveredSnr: 11.5, reweightedSnr: 11.2, chirpMassError: 0.001, timeError: 0.002,
    };
    const previous = {
      type: "batch", campaign: "f1", batch: 0, startTime: 0, analysedSeconds: 200.5,
      injections: [{ ...outcome, primaryMass: 1.4, secondaryMass: 1.3, chirpMass: 1.1743, recoveredChirpMass: 1.1755 }],
      falseCandidates: [{ batch: 0, coalescenceTime: 3.25, snr: 6.5, reweightedSnr: 6.1, chirpMass: 1.21 }],
    };
    appendFileSync(path, `${JSON.stringify(previous)}\n`);
    expect(readCampaignState(path, "f1")).toEqual([
      {
        batch: 0, startTime: 0, analysedSeconds: 200.5,
        injections: [{ ...outcome, primaryMassSolar: 1.4, secondaryMassSolar: 1.3, chirpMassSolar: 1.1743, recoveredChirpMassSolar: 1.1755 }],
        falseCandidates: [{ batch: 0, coalescenceTime: 3.25, snr: 6.5, reweightedSnr: 6.1, chirpMassSolar: 1.21 }],
      },
    ]);
  });

  it("drops a torn last line and cuts it from the file so appending continues cleanly", () => {
    const path = tmp.path("torn.jsonl");
    startCampaignState(path, "f1", {});
    appendCampaignBatch(path, "f1", batch(0));
    appendFileSync(path, '{"type":"batch","batch":1,"startTi');
    expect(readCampaignState(path, "f1")).toEqual([batch(0)]);
    appendCampaignBatch(path, "f1", batch(1));
    expect(readCampaignState(path, "f1")).toEqual([batch(0), batch(1)]);
  });

  it("refuses a state written for other arguments, and a file that is not a state file", () => {
    const path = tmp.path("other.jsonl");
    startCampaignState(path, "f1", {});
    expect(() => readCampaignState(path, "f2")).toThrow(/different arguments/);
    writeFileSync(path, '{"hello":1}\n');
    expect(() => readCampaignState(path, "f1")).toThrow(/not a campaign state file/);
  });

  it("refuses a batch line of another campaign (two campaigns shared one state file)", () => {
    const path = tmp.path("shared.jsonl");
    startCampaignState(path, "f1", {});
    appendCampaignBatch(path, "f1", batch(0));
    appendCampaignBatch(path, "f2", batch(1)); // a second campaign, still running, appends here
    expect(() => readCampaignState(path, "f1")).toThrow(/line 3 is a batch of another campaign/);
  });
});

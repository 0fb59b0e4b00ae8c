import { existsSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { runCli } from "./helpers.js";

// Needs the built CLI: run `npm run build` first.
const dir = mkdtempSync(join(tmpdir(), "chirpsieve-recover-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** A quick campaign: stellar-mass binaries (chirps of a few seconds from 30 Hz), one or two batches. */
const BASE = [
  "recover",
  "--noise-curve", "ajith2011",
  "--count", "12",
  "--mass-range", "8:12",
  "--snr-range", "6:16",
  "--seed", "11",
  "--fmin", "30",
  "--rate", "2048",
  "--min-snr", "7",
  "--match-floor", "0.9", // a coarse bank keeps the test quick
  "--quiet",
];

describe("chirpsieve recover: flags", () => {
  it("rejects a malformed --require rule with exit 2, naming the flag and the grammar", () => {
    const r = runCli([...BASE, "--require", "efficiency>0.9"]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^chirpsieve: --require: requirement "efficiency>0\.9" is not understood; expected efficiency>=X@snr>=Y/);
  });

  it("needs exactly one of --snr-range and --distance-range, and a place for the state to resume", () => {
    const noRange = BASE.filter((a, i) => a !== "--snr-range" && BASE[i - 1] !== "--snr-range");
    expect(runCli(noRange).stderr).toMatch(/--snr-range or --distance-range/);
    const r = runCli([...BASE, "--resume"]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--resume: needs --state DIR, --out or --report/);
  });
});

describe("chirpsieve recover: a small campaign", () => {
  it("exits 0 when the rules are met, 1 naming the unmet rule and by how much; two runs give the same JSON outside \"run\"", () => {
    const out1 = join(dir, "one.json");
    const report = join(dir, "one.html");
    const a = runCli([...BASE, "--json", "--out", out1, "--report", report, "--require", "efficiency>=0.5@snr>=10", "--require", "false-candidates<=1000"]);
    expect(a.code, a.stderr).toBe(0);
    const doc = JSON.parse(a.stdout);
    expect(JSON.parse(readFileSync(out1, "utf8"))).toEqual(doc);
    expect(Object.keys(doc)).toEqual(["format", "version", "arguments", "population", "layout", "summary", "injections", "falseCandidates", "requirements", "caution", "run", "inspiralEdge"]);
    expect(Object.keys(doc.summary).slice(0, 8)).toEqual(["injections", "found", "missed", "efficiency", "efficiencyLower", "efficiencyUpper", "interval", "efficiencyBySnr"]);
    expect(Object.keys(doc.injections[0])).toEqual([
      "index", "batch", "primaryMassSolar", "secondaryMassSolar", "chirpMassSolar", "coalescenceTime", "arrivalTime", "distanceMpc", "inclination",
      "rightAscension", "declination", "polarisation", "phase", "optimalSnr", "found", "recoveredSnr", "reweightedSnr",
      "recoveredChirpMassSolar", "chirpMassError", "timeError",
    ]);
    expect(doc.summary.injections).toBe(12);
    expect(doc.requirements.map((q: { met: boolean }) => q.met)).toEqual([true, true]);
    expect(existsSync(report)).toBe(true);
    expect(readFileSync(report, "utf8")).toContain("not detections of real sources");
    expect(existsSync(join(dir, "one.json.state", "campaign.jsonl"))).toBe(true);

    // Same arguments, fresh run (its own state): an unmet rule exits 1 and says by how much.
    const b = runCli([...BASE, "--json", "--state", join(dir, "two.state"), "--require", "time-error<=0"]);
    expect(b.code).toBe(1);
    expect(b.stderr).toMatch(/chirpsieve: requirement not met: time-error<=0: median \|time error\| [0-9.e-]+ s is [0-9.e-]+ above 0/);
    const doc2 = JSON.parse(b.stdout);
    const strip = (d: Record<string, unknown>) => ({ ...d, run: null, requirements: null });
    expect(strip(doc2)).toEqual(strip(doc));
    expect(doc2.requirements).toEqual([expect.objectContaining({ rule: "time-error<=0", met: false, threshold: 0 })]);

    // Plain-text summary for a person.
    const c = runCli([...BASE, "--state", join(dir, "two.state"), "--resume"]);
    expect(c.code).toBe(0);
    expect(c.stdout).toMatch(/^recover: 12 injections/);
    expect(c.stdout).toMatch(/efficiency by optimal SNR/);
    expect(c.stdout).toMatch(/not detections of real sources/);
  });
});

describe("chirpsieve recover --spin-range", () => {
  it("injects aligned-spin TaylorT4 signals drawn in the range and records the range and each injection's spins", () => {
    const r = runCli([
      "recover", "--noise-curve", "ajith2011", "--count", "6", "--mass-range", "8:12", "--spin-range", "0:0.5",
      "--snr-range", "10:14", "--fmin", "30", "--rate", "1024", "--seed", "s", "--json", "--quiet",
    ]);
    expect(r.code, r.stderr).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.population.spinRange).toEqual([0, 0.5]);
    expect(doc.arguments.spinRange).toEqual([0, 0.5]);
    expect(doc.injections).toHaveLength(6);
    for (const inj of doc.injections) {
      expect(inj.primarySpin).toBeGreaterThanOrEqual(0);
      expect(inj.secondarySpin).toBeLessThanOrEqual(0.5);
    }
  });
  it("refuses a reversed spin range (one line, exit 2)", () => {
    const r = runCli(["recover", "--noise-curve", "ajith2011", "--count", "2", "--spin-range", "0.5:0.1", "--snr-range", "10:14"]);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split("\n")).toHaveLength(1);
    expect(r.stderr).toMatch(/--spin-range: MIN must not exceed MAX/);
  });
});

describe("chirpsieve recover: the edge of the inspiral", () => {
  it("warns once, naming the total-mass range, when the bank's templates carry under 90% of their signals' SNR, and records it", () => {
    // 20–25 M_sun components: total masses 40–50 M_sun, past the edge (about 21 M_sun in ajith2011; measured here).
    const args = ["recover", "--noise-curve", "ajith2011", "--count", "2", "--mass-range", "20:25", "--snr-range", "10:12", "--seed", "3", "--fmin", "30", "--rate", "1024", "--match-floor", "0.9", "--json"];
    const r = runCli(args);
    expect(r.stderr).toMatch(/warning: \d+ of \d+ templates \(total mass [\d.]+–[\d.]+ M_sun\) carry less than 90% of their signal's SNR/);
    expect(r.stderr.match(/warning:/g)).toHaveLength(1);
    const doc = JSON.parse(r.stdout);
    expect(doc.inspiralEdge.below).toBeGreaterThan(0);
    expect(doc.inspiralEdge.threshold).toBe(0.9);
    expect(runCli([...args, "--quiet"]).stderr).not.toMatch(/warning/);
  });
});

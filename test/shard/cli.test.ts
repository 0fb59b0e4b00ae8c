// `chirpsieve scan --shard` and `chirpsieve merge` through the built CLI (npm test builds it).
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { ajith2011, colouredNoise, writeStrain } from "@chirpsieve/core";
import { injectInto } from "../../packages/core/src/inject/injection.js";
import { SITE_A } from "../../packages/core/src/waveform/antenna.js";
import { runCli } from "../cli/helpers.js";
import { injectionAt } from "../search/fixtures.js";
import { tempDir } from "./fixtures.js";

const dir = tempDir("shard-cli");
const strain = join(dir, "synthetic.f64");
const SCAN = ["scan", strain, "--mass-range", "8:12", "--fmin", "40", "--min-snr", "5", "--loudest-within", "0.4", "--welch-segment", "2", "--segment", "8", "--quiet"];

const candidateLines = (text: string) => text.split("\n").filter((l) => l.startsWith('{"type":"candidate"'));
let single: string;

describe("scan --shard and merge on the command line", () => {
  beforeAll(async () => {
    // Invented scenario: 40 s of seeded noise at 1024 Hz with one chirp (10+8 M_sun) at t = 20.2 s.
    const fs = 1024;
    const data = colouredNoise(ajith2011, 40 * fs, fs, "shard-cli");
    injectInto(data, fs, 0, { ...injectionAt(10, 8, 20.2), distanceMpc: 80 }, SITE_A, 40);
    await writeStrain(strain, { data, sampleRate: fs, startTime: 0 });
    single = runCli([...SCAN, "--json"]).stdout;
  });

  it("three shards by both, merged, print the unsharded scan's candidate lines exactly", () => {
    for (let i = 0; i < 3; i++) {
      const r = runCli([...SCAN, "--shard", `${i}/3`, "--out", join(dir, "shards", `part-${i}.jsonl`)]);
      expect(r.stderr).toBe("");
      expect(r.code).toBe(0);
    }
    const merged = runCli(["merge", join(dir, "shards"), "--json"]);
    expect(merged.code).toBe(0);
    expect(candidateLines(single).length).toBeGreaterThan(3);
    expect(candidateLines(merged.stdout)).toEqual(candidateLines(single));
    const summary = JSON.parse(merged.stdout.trim().split("\n").pop()!);
    const singleSummary = JSON.parse(single.trim().split("\n").pop()!);
    expect(summary).toMatchObject({ type: "summary", shards: 3, shardBy: "both", analysedSeconds: singleSummary.analysedSeconds, segments: singleSummary.segments });
  });

  it("takes the shard index from SLURM_ARRAY_TASK_ID with --shard auto/N: the same records as --shard 1/3", () => {
    const out = join(dir, "auto", "task.jsonl");
    const r = runCli([...SCAN, "--shard", "auto/3", "--out", out], { env: { SLURM_ARRAY_TASK_ID: "1" } });
    expect(r.code).toBe(0);
    expect(JSON.parse(readFileSync(join(dir, "auto", "task.manifest.json"), "utf8")).shard).toEqual({ index: 1, count: 3, by: "both" });
    expect(readFileSync(out, "utf8")).toBe(readFileSync(join(dir, "shards", "part-1.jsonl"), "utf8"));
  });

  it("merge names a missing shard and exits 2", () => {
    const r = runCli(["merge", join(dir, "shards", "part-0.jsonl"), join(dir, "shards", "part-2.jsonl")]);
    expect(r.code).toBe(2);
    expect(r.stderr).toBe("chirpsieve: merge: shard 1/3 is missing\n");
  });

  it("--shard needs --out (usage error, exit 2)", () => {
    expect(runCli([...SCAN, "--shard", "1/3"])).toMatchObject({ code: 2, stderr: "chirpsieve: --shard: needs --out (its records and journal are kept beside it)\n" });
  });
});

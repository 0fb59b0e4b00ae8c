// `chirpsieve scan --resume` through the built CLI (npm test builds it): a real SIGKILL midway.
import { spawn } from "node:child_process";
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { ajith2011, colouredNoise, writeStrain } from "@chirpsieve/core";
import { injectInto } from "../../packages/core/src/inject/injection.js";
import { SITE_A } from "../../packages/core/src/waveform/antenna.js";
import { CLI, runCli } from "../cli/helpers.js";
import { injectionAt } from "../search/fixtures.js";
import { tempDir } from "./fixtures.js";

const dir = tempDir("resume-cli");
const strain = join(dir, "synthetic.f64");
// fft.js keeps each segment slow enough (tens of ms) that the kill surely lands midway.
const SCAN = ["scan", strain, "--mass-range", "6:12", "--fmin", "40", "--min-snr", "5", "--loudest-within", "0.4", "--welch-segment", "2", "--segment", "8", "--fft", "fftjs", "--quiet"];

const candidateLines = (text: string) => text.split("\n").filter((l) => l.startsWith('{"type":"candidate"'));
const segmentLines = (path: string) => (existsSync(path) ? readFileSync(path, "utf8").split("\n").filter((l) => l.startsWith('{"type":"segment"')).length : 0);
let single: string;

describe("scan --resume on the command line", () => {
  beforeAll(async () => {
    // Invented scenario: 64 s of seeded noise at 1024 Hz with one chirp (9+7 M_sun) at t = 30.2 s.
    const fs = 1024;
    const data = colouredNoise(ajith2011, 64 * fs, fs, "resume-cli");
    injectInto(data, fs, 0, { ...injectionAt(9, 7, 30.2), distanceMpc: 80 }, SITE_A, 40);
    await writeStrain(strain, { data, sampleRate: fs, startTime: 0 });
    single = runCli([...SCAN, "--json"]).stdout;
  });

  it("a scan killed by SIGKILL after 2 of 32 segments and rerun with the same arguments gives the uninterrupted scan's candidates", async () => {
    const out = join(dir, "resumed.jsonl");
    const journal = `${out}.journal`;
    const child = spawn(process.execPath, [CLI, ...SCAN, "--resume", "--out", out], { stdio: "ignore" });
    const exited = new Promise<void>((resolve) => child.on("exit", () => resolve()));
    const deadline = Date.now() + 60_000;
    while (segmentLines(journal) < 2 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 1));
    child.kill("SIGKILL");
    await exited;
    const before = segmentLines(journal);
    expect(before).toBeGreaterThanOrEqual(2);
    expect(before).toBeLessThan(32);
    expect(existsSync(out)).toBe(false);
    const rerun = runCli([...SCAN, "--resume", "--out", out]);
    expect(rerun.code).toBe(0);
    expect(candidateLines(single).length).toBeGreaterThan(5);
    expect(candidateLines(readFileSync(out, "utf8"))).toEqual(candidateLines(single));
    expect(existsSync(journal)).toBe(false);
  });

  it("refuses a journal of another run (exit 2) and leaves it alone", () => {
    const out = join(dir, "other.jsonl");
    const header = { type: "scan-journal", tool: "chirpsieve", format: 1, version: "0.1.0", runId: "0123456789abcdef", shard: null };
    writeFileSync(`${out}.journal`, `${JSON.stringify(header)}\n`);
    const r = runCli([...SCAN, "--resume", "--out", out]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^chirpsieve: .*other\.jsonl\.journal: the journal belongs to another run \(run id 0123456789ab…, this run [0-9a-f]{12}…\); rerun with the same arguments and inputs, or delete the journal to start afresh\n$/);
    expect(readFileSync(`${out}.journal`, "utf8")).toBe(`${JSON.stringify(header)}\n`);
  });
});

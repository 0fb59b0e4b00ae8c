import { spawn } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { CLI, runCli } from "./helpers.js";

// Needs the built CLI: run `npm run build` first.
const dir = mkdtempSync(join(tmpdir(), "chirpsieve-resume-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Six batches of two stellar-mass chirps each: long enough to be killed midway. */
const ARGS = [
  "recover",
  "--noise-curve", "ajith2011",
  "--count", "12",
  "--per-batch", "2",
  "--mass-range", "8:12",
  "--snr-range", "5:15",
  "--seed", "resume-test",
  "--fmin", "30",
  "--min-snr", "7",
  "--match-floor", "0.9", // a coarse bank keeps the test quick
  "--quiet",
];

function lines(path: string): number {
  if (!existsSync(path)) return 0;
  return readFileSync(path, "utf8").split("\n").filter((l) => l.length > 0).length;
}

/** Starts the CLI, SIGKILLs it as soon as the state file holds its header and ≥ 1 finished batch. */
function runAndKill(args: string[], statePath: string): Promise<{ signal: NodeJS.Signals | null; linesAtKill: number }> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [CLI, ...args], { stdio: "ignore" });
    let linesAtKill = -1;
    const timer = setInterval(() => {
      const n = lines(statePath);
      if (n >= 2 && linesAtKill < 0) {
        linesAtKill = n;
        child.kill("SIGKILL");
      }
    }, 5);
    child.on("error", reject);
    child.on("exit", (_code, signal) => {
      clearInterval(timer);
      resolve({ signal, linesAtKill });
    });
  });
}

describe("chirpsieve recover --resume", () => {
  it("after SIGKILL midway, resuming gives the same results as an uninterrupted run; other arguments are refused", async () => {
    const whole = join(dir, "whole.json");
    const a = runCli([...ARGS, "--out", whole]);
    expect(a.code, a.stderr).toBe(0);

    const cut = join(dir, "cut.json");
    const state = join(dir, "cut.json.state", "campaign.jsonl");
    const killed = await runAndKill([...ARGS, "--out", cut], state);
    expect(killed.signal).toBe("SIGKILL");
    expect(existsSync(cut)).toBe(false); // it never finished
    const finished = lines(state) - 1;
    expect(finished).toBeGreaterThanOrEqual(1);
    expect(finished).toBeLessThan(6);

    // Other arguments with the same state: refused (exit 2), state untouched.
    const other = runCli([...ARGS.map((x) => (x === "resume-test" ? "other-seed" : x)), "--out", cut, "--resume"]);
    expect(other.code).toBe(2);
    expect(other.stderr).toMatch(/state was written for different arguments/);
    expect(lines(state) - 1).toBe(finished);

    const b = runCli([...ARGS, "--out", cut, "--resume"]);
    expect(b.code, b.stderr).toBe(0);
    expect(lines(state)).toBe(7); // header + 6 batches: nothing lost, nothing twice
    const x = JSON.parse(readFileSync(whole, "utf8"));
    const y = JSON.parse(readFileSync(cut, "utf8"));
    expect(y.run.resumedBatches).toBe(finished);
    expect(y.summary).toEqual(x.summary);
    expect(y.injections).toEqual(x.injections);
    expect(y.falseCandidates).toEqual(x.falseCandidates);
    expect(y.injections.map((o: { index: number }) => o.index)).toEqual(Array.from({ length: 12 }, (_, i) => i));
  });
});

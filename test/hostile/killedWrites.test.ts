// Kill tests for the writers of several files: a multi-site `simulate` (data, sidecar and manifest
// of each site) and `recover` (its state file, --out and --report). The writer is killed with
// SIGKILL at chosen steps (CHIRPSIEVE_CRASH_AT, core/io/crashPoint.ts); what the next chirpsieve
// reader sees must be the complete old set or the complete new set. Needs the built CLI.
import { createHash } from "node:crypto";
import { appendFileSync, copyFileSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { hostname, tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCli } from "../cli/helpers.js";

const root = mkdtempSync(join(tmpdir(), "chirpsieve-killed-"));
afterAll(() => rmSync(root, { recursive: true, force: true }));

function fresh(name: string): string {
  const d = join(root, name);
  mkdirSync(d);
  return d;
}

const sha = (path: string): string => createHash("sha256").update(readFileSync(path)).digest("hex");

/** Hidden leftovers of our writers: temporary files and commit records. */
const leftovers = (d: string): string[] => readdirSync(d).filter((f) => f.endsWith(".partial") || f.endsWith(".set-commit.json"));

describe("simulate with two sites, killed while writing its six files", () => {
  const SITES = ["site-a", "site-b"];
  const MEMBERS = SITES.flatMap((s) => [`net.${s}.f32`, `net.${s}.f32.json`, `net.${s}.f32.injections.json`]);
  const simulate = (seed: string): string[] => [
    "simulate", "--duration", "16", "--rate", "512", "--fmin", "40", "--seed", seed, "--detector", SITES.join(","),
    "--inject-random", "1", "--mass-range", "8:12", "--snr-range", "10:12", "--out", "net.f32",
  ];
  /** The reader: a coincidence scan of the two sites (it also completes an interrupted set). */
  const scanSites = ["scan", "--site", "site-a=net.site-a.f32", "--site", "site-b=net.site-b.f32", "--mass-range", "8:12", "--fmin", "40",
    "--match-floor", "0.9", "--slide-step", "1", "--slides", "3", "--json", "--quiet"];
  const sets: Record<"old" | "new", string[]> = { old: [], new: [] };

  beforeAll(() => {
    for (const which of ["old", "new"] as const) {
      const d = fresh(`sim-ref-${which}`);
      const r = runCli(simulate(`kill-${which}`), { cwd: d });
      expect(r.code, r.stderr).toBe(0);
      sets[which] = MEMBERS.map((m) => sha(join(d, m)));
    }
    expect(sets.old).not.toEqual(sets.new);
  });

  const points: [string, "old" | "new"][] = [
    ["set-staged", "old"], // every new file written, nothing committed
    ["set-committed", "new"], // commit record written, no rename yet
    ["set-renamed-1", "new"], // site-a's data renamed, the rest not
    ["set-renamed-4", "new"], // site-a whole and site-b's data
  ];
  for (const [point, expected] of points) {
    it(`killed at ${point}: the reader sees the whole ${expected} set; the next run leaves no temporary file`, () => {
      const d = fresh(`sim-${point}`);
      expect(runCli(simulate("kill-old"), { cwd: d }).code).toBe(0);
      const killed = runCli(simulate("kill-new"), { cwd: d, env: { CHIRPSIEVE_CRASH_AT: point } });
      expect(killed.code).toBe(-1); // killed by SIGKILL: no exit status
      const read = runCli(scanSites, { cwd: d });
      expect(read.code, read.stderr).toBe(0);
      expect(MEMBERS.map((m) => sha(join(d, m)))).toEqual(sets[expected]);
      // The next write of the same output removes what the killed one left.
      expect(runCli(simulate("kill-new"), { cwd: d }).code).toBe(0);
      expect(MEMBERS.map((m) => sha(join(d, m)))).toEqual(sets.new);
      expect(leftovers(d)).toEqual([]);
    });
  }

  it("scan --site refuses sites whose files come from different simulate runs", () => {
    const d = fresh("sim-mixed");
    for (const m of MEMBERS) copyFileSync(join(root, m.includes("site-a") ? "sim-ref-new" : "sim-ref-old", m), join(d, m));
    const r = runCli(scanSites, { cwd: d });
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split("\n")).toHaveLength(1);
    expect(r.stderr).toMatch(/^chirpsieve: --site: site-a=net\.site-a\.f32 and site-b=net\.site-b\.f32 come from different simulate runs \(run ids /);
  });
});

describe("recover: a shared state, a lock, and --out/--report killed at several points", () => {
  const recover = (seed: string, ...extra: string[]): string[] => [
    "recover", "--noise-curve", "ajith2011", "--count", "4", "--per-batch", "2", "--mass-range", "8:12", "--snr-range", "8:12",
    "--seed", seed, "--fmin", "40", "--min-snr", "7", "--match-floor", "0.9", "--quiet", "--out", "r.json", "--report", "r.html", ...extra,
  ];
  const state = (d: string): string => join(d, "r.json.state", "campaign.jsonl");
  const lock = (d: string): string => join(d, "r.json.state", "campaign.lock");
  const stateLines = (d: string): string[] => readFileSync(state(d), "utf8").split("\n").filter((l) => l !== "");
  const doc = (path: string): Record<string, unknown> => {
    const { run: _run, ...rest } = JSON.parse(readFileSync(path, "utf8"));
    return rest;
  };

  it("a resume refuses another campaign's lines, a live run's lock is respected, a dead one's taken over; every kill leaves the old or the new --out/--report", () => {
    const ref = fresh("rec-ref");
    expect(runCli(recover("kill-new"), { cwd: ref }).code).toBe(0);
    const d = fresh("rec");
    // The old set: another campaign (another seed) written to the same --out and --report.
    expect(runCli(recover("kill-old"), { cwd: d }).code).toBe(0);
    const old = { out: sha(join(d, "r.json")), report: sha(join(d, "r.html")) };
    const isOld = (): boolean => sha(join(d, "r.json")) === old.out && sha(join(d, "r.html")) === old.report;

    // The new campaign, killed after its first batch: the state holds it, the outputs are the old set.
    const k1 = runCli(recover("kill-new"), { cwd: d, env: { CHIRPSIEVE_CRASH_AT: "campaign-batch-0" } });
    expect(k1.code).toBe(-1);
    expect(stateLines(d)).toHaveLength(2);
    expect(isOld()).toBe(true);

    // A line of another campaign in the state (two runs shared it): the resume is refused, state untouched.
    const good = readFileSync(state(d), "utf8");
    const foreign = JSON.parse(stateLines(d)[1]);
    foreign.campaign = "f".repeat(64);
    appendFileSync(state(d), `${JSON.stringify(foreign)}\n`);
    const mixed = runCli(recover("kill-new", "--resume"), { cwd: d });
    expect(mixed.code).toBe(2);
    expect(mixed.stderr).toMatch(/^chirpsieve: .*campaign\.jsonl: line 3 is a batch of another campaign .*give each campaign its own state file\n$/);
    writeFileSync(state(d), good);

    // A live run holds the state (this test process, as the lock records it): refused.
    const ticks = Number(readFileSync(`/proc/${process.pid}/stat`, "utf8").split(") ")[1].split(" ")[19]);
    writeFileSync(lock(d), JSON.stringify({ pid: process.pid, started: ticks, host: hostname() }));
    const busy = runCli(recover("kill-new", "--resume"), { cwd: d });
    expect(busy.code).toBe(2);
    expect(busy.stderr).toMatch(/^chirpsieve: --out: the campaign state in r\.json\.state: in use by a running process \d+ \(lock .*campaign\.lock\); wait for it or give another location\n$/);
    expect(stateLines(d)).toHaveLength(2);
    // A killed run's lock (its process is gone) does not stick: the resume below takes it over.
    writeFileSync(lock(d), JSON.stringify({ pid: process.pid, started: ticks + 1, host: hostname() }));

    // Killed with every new file staged: the old set stays.
    expect(runCli(recover("kill-new", "--resume"), { cwd: d, env: { CHIRPSIEVE_CRASH_AT: "set-staged" } }).code).toBe(-1);
    expect(isOld()).toBe(true);
    expect(stateLines(d)).toHaveLength(3); // both batches finished before the kill
    // Killed after --out was renamed: the commit record stays until the next run completes the set.
    expect(runCli(recover("kill-new", "--resume"), { cwd: d, env: { CHIRPSIEVE_CRASH_AT: "set-renamed-1" } }).code).toBe(-1);
    expect(existsSync(join(d, ".r.json.set-commit.json"))).toBe(true);

    const done = runCli(recover("kill-new", "--resume"), { cwd: d });
    expect(done.code, done.stderr).toBe(0);
    expect(doc(join(d, "r.json"))).toEqual(doc(join(ref, "r.json")));
    const html = readFileSync(join(d, "r.html"), "utf8");
    expect(html).toContain("kill-new");
    expect(html).not.toContain("kill-old");
    expect(stateLines(d)).toHaveLength(3); // header + 2 batches: nothing lost, nothing twice
    expect(existsSync(lock(d))).toBe(false);
    expect(leftovers(d)).toEqual([]);
  });
});

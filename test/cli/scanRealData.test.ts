// `chirpsieve scan` on data as recordings come: zero-filled and NaN stretches, interval files,
// contiguous files, a file too short among several, mixed sample rates.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { existsSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { ajith2011, writeStrain } from "@chirpsieve/core";
import { arrivalTime, atSnr, injectionAt, simulatedData } from "../search/fixtures.js";
import { runCli } from "./helpers.js";

const FS = 1024;
const FMIN = 30;
let dir: string;
let data: Float64Array;
const inj = atSnr(injectionAt(10, 9, 150.3), 14, ajith2011, FS, FMIN);
const base = ["--mass-range", "8:12", "--fmin", String(FMIN), "--quiet", "--json"];

const summaryOf = (stdout: string) => JSON.parse(stdout.trim().split("\n").at(-1)!);
const candidatesOf = (stdout: string) => stdout.trim().split("\n").map((l) => JSON.parse(l)).filter((l) => l.type === "candidate");

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "chirpsieve-realdata-"));
  data = simulatedData({ psd: ajith2011, fs: FS, seconds: 256, seed: "cli-real-data", fMin: FMIN, injections: [inj] });
  await writeStrain(join(dir, "whole.f64"), { data, sampleRate: FS, startTime: 0 });
  const zeros = data.slice();
  zeros.fill(0, 40 * FS, 60 * FS);
  await writeStrain(join(dir, "zeros.f64"), { data: zeros, sampleRate: FS, startTime: 0 });
  await writeStrain(join(dir, "allzero.f64"), { data: new Float64Array(64 * FS), sampleRate: FS, startTime: 0 });
  // The same data in two contiguous files, the chirp's last seconds across the boundary.
  await writeStrain(join(dir, "part-a.f64"), { data: data.slice(0, 148 * FS), sampleRate: FS, startTime: 0 });
  await writeStrain(join(dir, "part-b.f64"), { data: data.slice(148 * FS), sampleRate: FS, startTime: 148 });
  await writeStrain(join(dir, "short.f64"), { data: data.slice(0, 4 * FS), sampleRate: FS, startTime: 1000 });
  const other = simulatedData({ psd: ajith2011, fs: 2 * FS, seconds: 128, seed: "cli-real-data-2", fMin: FMIN });
  await writeStrain(join(dir, "fast.f64"), { data: other, sampleRate: 2 * FS, startTime: 5000 });
  writeFileSync(join(dir, "keep.txt"), "# synthetic analysis intervals\n0 100\n120 256\n");
  writeFileSync(join(dir, "drop.txt"), "10 12.5\n");
  writeFileSync(join(dir, "bad-intervals.txt"), "0 100\n50 40\n");
});

afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("scan of recorded-style data", () => {
  it("refuses a zero-filled stretch with one line naming the file, the time and the flag that leaves it out", () => {
    const r = runCli(["scan", join(dir, "zeros.f64"), ...base]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr.trim().split("\n")).toHaveLength(1);
    expect(r.stderr).toContain("zeros.f64: zero-filled samples at t = 40.0000 s");
    expect(r.stderr).toContain("--skip-bad-data");
  });

  it("with --skip-bad-data leaves out only the stretch (and the filter around it) and still finds the chirp", () => {
    const r = runCli(["scan", join(dir, "zeros.f64"), ...base, "--skip-bad-data"]);
    expect(r.code).toBe(0);
    const s = summaryOf(r.stdout);
    expect(s.skipped).toEqual([{ file: join(dir, "zeros.f64"), startTime: 40, endTime: 60, reason: "zero-filled samples" }]);
    expect(s.skippedSeconds).toBe(20);
    expect(s.lostToEdgesSeconds).toBeLessThanOrEqual(2 * (s.leadInSeconds + s.tailSeconds) + 1e-9);
    expect(s.analysedSeconds + s.skippedSeconds + s.lostToEdgesSeconds).toBeCloseTo(256, 6);
    const best = candidatesOf(r.stdout).reduce((a, b) => (b.snr > a.snr ? b : a));
    expect(Math.abs(best.coalescenceTime - arrivalTime(inj))).toBeLessThan(0.01);
  });

  it("an all-zero file is an error naming it, or with --skip-bad-data a left-out stretch and nothing searched", () => {
    const f = join(dir, "allzero.f64");
    const r = runCli(["scan", f, ...base]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(`${f}: zero-filled samples at t = 0.0000 s`);
    const k = runCli(["scan", f, ...base, "--skip-bad-data"]);
    expect(k.code).toBe(0);
    const s = summaryOf(k.stdout);
    expect(s.analysedSeconds).toBe(0);
    expect(s.skippedSeconds).toBe(64);
    expect(s.streams[0].unsearchable).toBe("nothing is left after the exclusions");
  });

  it("searches only inside --keep-times and never inside --drop-times, and accounts for both", () => {
    const r = runCli(["scan", join(dir, "whole.f64"), ...base, "--keep-times", join(dir, "keep.txt"), "--drop-times", join(dir, "drop.txt")]);
    expect(r.code).toBe(0);
    const s = summaryOf(r.stdout);
    expect(s.skipped.map((k: { reason: string; startTime: number; endTime: number }) => [k.reason, k.startTime, k.endTime])).toEqual([
      ["excluded interval", 10, 12.5],
      ["outside the analysis intervals", 100, 120],
    ]);
    expect(s.skippedSeconds).toBeCloseTo(22.5, 9);
    expect(s.analysedSeconds + s.skippedSeconds + s.lostToEdgesSeconds).toBeCloseTo(256, 6);
    for (const c of candidatesOf(r.stdout)) expect(c.coalescenceTime < 100 || c.coalescenceTime >= 120).toBe(true);
  });

  it("refuses a malformed interval file naming the file and line", () => {
    const r = runCli(["scan", join(dir, "whole.f64"), ...base, "--keep-times", join(dir, "bad-intervals.txt")]);
    expect(r.code).toBe(2);
    expect(r.stderr).toBe(`chirpsieve: ${join(dir, "bad-intervals.txt")}:2: the end 40 must be after the start 50\n`);
  });

  it("reads contiguous files as one stream: same candidates and searched time as the whole file", () => {
    const whole = runCli(["scan", join(dir, "whole.f64"), ...base]);
    const parts = runCli(["scan", join(dir, "part-b.f64"), join(dir, "part-a.f64"), ...base]);
    expect(parts.code).toBe(0);
    const a = summaryOf(whole.stdout);
    const b = summaryOf(parts.stdout);
    expect(b.streams).toHaveLength(1);
    expect(b.analysedSeconds).toBe(a.analysedSeconds);
    const strip = (c: Record<string, unknown>) => ({ ...c, file: undefined });
    expect(candidatesOf(parts.stdout).map(strip)).toEqual(candidatesOf(whole.stdout).map(strip));
    // The chirp coalesces in the second file, and is reported there.
    const best = candidatesOf(parts.stdout).reduce((x, y) => (y.snr > x.snr ? y : x));
    expect(best.file).toBe(join(dir, "part-b.f64"));
  });

  it("among several files, one too short to search is reported and passed over; mixed rates are reported per stream", () => {
    const r = runCli(["scan", join(dir, "whole.f64"), join(dir, "short.f64"), join(dir, "fast.f64"), "--mass-range", "8:12", "--fmin", String(FMIN), "--json"]);
    expect(r.code).toBe(0);
    expect(r.stderr).toContain(`${join(dir, "short.f64")}: not searched: 4.0 s of data is too short to search`);
    const s = summaryOf(r.stdout);
    expect(s.sampleRate).toBeNull();
    expect(s.streams.map((x: { sampleRate: number }) => x.sampleRate)).toEqual([FS, FS, 2 * FS]);
    expect(s.streams[1].segments).toBe(0);
    expect(candidatesOf(r.stdout).length).toBeGreaterThan(0);
  });

  it("a single file too short to search is an error naming it", () => {
    const r = runCli(["scan", join(dir, "short.f64"), ...base]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(`${join(dir, "short.f64")}: 4.0 s of data is too short to search`);
    expect(existsSync(join(dir, "out.jsonl"))).toBe(false);
  });
});

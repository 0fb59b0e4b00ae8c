// Inputs that must not pass silently: byte order, unknown sidecar keys, constant files, header
// lines, strain units; and what the scan's outputs say (CSV summary trailer, progress lines).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { ajith2011, writeStrain } from "@chirpsieve/core";
import { atSnr, injectionAt, simulatedData } from "../search/fixtures.js";
import { runCli } from "./helpers.js";

const FS = 2048;
let dir: string;
let data: Float64Array;
let file: string;
const inj = atSnr(injectionAt(10, 9, 40.3), 14, ajith2011, FS, 30);
const base = ["--mass-range", "8:12", "--fmin", "30", "--quiet"];

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "chirpsieve-inputs-"));
  file = join(dir, "little.f32");
  data = simulatedData({ psd: ajith2011, fs: FS, seconds: 64, seed: "cli-inputs", fMin: 30, injections: [inj] });
  await writeStrain(file, { data, sampleRate: FS, startTime: 0 });
});

afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Candidate records of a --json scan, without the file name. */
function candidatesOf(stdout: string): Record<string, unknown>[] {
  return stdout
    .trim()
    .split("\n")
    .map((l) => JSON.parse(l))
    .filter((r) => r.type === "candidate")
    .map(({ file: _f, ...rest }) => rest);
}

/** A bad input: one line on stderr naming `name`, exit 2, nothing written to `out`. */
function expectRefused(args: string[], name: string, out: string): string {
  const r = runCli([...args, "--out", out]);
  expect(r.code).toBe(2);
  const lines = r.stderr.trim().split("\n");
  expect(lines).toHaveLength(1);
  expect(lines[0]).toMatch(/^chirpsieve: /);
  expect(lines[0]).toContain(name);
  expect(r.stderr).not.toMatch(/\bat .*\.js:\d+/);
  expect(existsSync(out)).toBe(false);
  return lines[0];
}

describe("scan: byte order and sidecar keys", () => {
  it("a big-endian copy (sidecar byteOrder big) scans to the same candidates as the little-endian file", () => {
    const big = join(dir, "big.f32");
    const bytes = new Uint8Array(4 * data.length);
    const view = new DataView(bytes.buffer);
    for (let i = 0; i < data.length; i++) view.setFloat32(4 * i, data[i], false); // the test's own encoder
    writeFileSync(big, bytes);
    writeFileSync(`${big}.json`, JSON.stringify({ sampleRate: FS, startTime: 0, byteOrder: "big" }));
    const a = runCli(["scan", file, ...base, "--json"]);
    const b = runCli(["scan", big, ...base, "--json"]);
    expect(a.code).toBe(0);
    expect(b.code).toBe(0);
    expect(b.stderr).toBe("");
    const ca = candidatesOf(a.stdout);
    expect(ca.length).toBeGreaterThan(0);
    expect(candidatesOf(b.stdout)).toEqual(ca);
  });

  it("an unknown sidecar key is a one-line warning naming the sidecar; the scan goes on", () => {
    const p = join(dir, "extra.f32");
    writeFileSync(p, readFileSync(file));
    writeFileSync(`${p}.json`, JSON.stringify({ sampleRate: FS, startTime: 0, endianness: "big" }));
    const r = runCli(["scan", p, ...base, "--json"]);
    expect(r.code).toBe(0);
    const lines = r.stderr.trim().split("\n");
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(/^chirpsieve: warning: /);
    expect(lines[0]).toContain(`${p}.json`);
    expect(lines[0]).toContain('"endianness"');
  });
});

describe("scan: files with no strain", () => {
  it("an all-zero file and a constant text file are refused: one line naming the file, exit 2, nothing written", async () => {
    const zeros = join(dir, "zeros.f32");
    await writeStrain(zeros, { data: new Float64Array(64 * FS), sampleRate: FS, startTime: 0 });
    expect(expectRefused(["scan", zeros, ...base], zeros, join(dir, "z.jsonl"))).toContain(`chirpsieve: ${zeros}: zero-filled samples at t = 0.0000 s`);
    const flat = join(dir, "flat.txt");
    writeFileSync(flat, Array.from({ length: 4096 }, (_, i) => `${i / 64} 2.5e-21`).join("\n") + "\n");
    expectRefused(["scan", flat, ...base], flat, join(dir, "f.jsonl"));
    expectRefused(["psd", zeros], zeros, join(dir, "p.csv"));
  });

  it("with --skip-bad-data a zero file is skipped and reported, the others searched, exit 0", async () => {
    const zeros = join(dir, "zeros2.f32");
    await writeStrain(zeros, { data: new Float64Array(64 * FS), sampleRate: FS, startTime: 100 });
    const r = runCli(["scan", zeros, file, ...base, "--json", "--skip-bad-data"]);
    expect(r.code).toBe(0);
    expect(r.stderr.trim()).toBe(`chirpsieve: warning: ${zeros}: not searched: nothing is left after the exclusions`);
    const lines = r.stdout.trim().split("\n").map((l) => JSON.parse(l));
    const summary = lines.at(-1);
    expect(summary.files).toBe(2);
    expect(summary.skipped).toEqual([{ file: zeros, startTime: 100, endTime: 164, reason: "zero-filled samples" }]);
    expect(summary.skippedSeconds).toBe(64);
    expect(summary.dataSeconds).toBe(128);
    expect(lines.filter((l) => l.type === "candidate").every((c) => c.file === file)).toBe(true);
    expect(candidatesOf(r.stdout).length).toBeGreaterThan(0);
  });
});

describe("scan: malformed inputs of the new kinds", () => {
  it("a byteOrder other than little/big, or a header naming the wrong number of columns: one line, exit 2, nothing written", () => {
    const p = join(dir, "odd.f32");
    writeFileSync(p, readFileSync(file));
    writeFileSync(`${p}.json`, JSON.stringify({ sampleRate: FS, startTime: 0, byteOrder: "middle" }));
    expect(expectRefused(["scan", p, ...base], `${p}.json`, join(dir, "o.jsonl"))).toContain("byteOrder");
    const t = join(dir, "cols.csv");
    writeFileSync(t, "time,strain,extra\n0,1,2\n");
    expectRefused(["scan", t, ...base], t, join(dir, "t.jsonl"));
  });
});

describe("scan: text with a header line", () => {
  it("time,strain as the first line is accepted and scans like the raw file", () => {
    const csv = join(dir, "header.csv");
    const f32 = Float32Array.from(data);
    writeFileSync(csv, "time,strain\n" + Array.from(f32, (x, i) => `${i / FS},${x}`).join("\n") + "\n");
    const a = runCli(["scan", file, ...base, "--json"]);
    const b = runCli(["scan", csv, ...base, "--json"]);
    expect(b.stderr).toBe("");
    expect(b.code).toBe(0);
    expect(candidatesOf(b.stdout)).toEqual(candidatesOf(a.stdout));
  });
});

describe("scan: strain units other than strain", () => {
  it("counts: effective distances are null in JSON, empty in CSV, — in tables, with one note saying why", async () => {
    const counts = join(dir, "counts.f64");
    await writeStrain(counts, { data, sampleRate: FS, startTime: 0, units: "counts" });
    const j = runCli(["scan", counts, ...base, "--json"]);
    expect(j.code).toBe(0);
    const note = j.stderr.trim().split("\n");
    expect(note).toHaveLength(1);
    expect(note[0]).toContain(counts);
    expect(note[0]).toContain('"counts"');
    expect(note[0]).toContain("not dimensionless strain");
    const cands = j.stdout.trim().split("\n").map((l) => JSON.parse(l)).filter((l) => l.type === "candidate");
    expect(cands.length).toBeGreaterThan(0);
    for (const c of cands) {
      expect(c.effectiveDistanceMpc).toBeNull();
      expect(c.snr).toBeGreaterThan(0);
    }
    const out = join(dir, "counts.csv");
    expect(runCli(["scan", counts, ...base, "--out", out]).code).toBe(0);
    const rows = readFileSync(out, "utf8").split("\n").filter((l) => l !== "" && !l.startsWith("#"));
    const col = rows[0].split(",").indexOf("effectiveDistanceMpc");
    for (const row of rows.slice(1)) expect(row.split(",")[col]).toBe("");
    const t = runCli(["scan", counts, ...base, "--format", "table"]);
    expect(t.stdout).toContain("—");
    expect(t.stdout).toContain("D_eff unavailable");
    // The same samples as strain give a number.
    const s = runCli(["scan", file, ...base, "--json"]);
    expect(s.stdout.split("\n").some((l) => /"effectiveDistanceMpc":\d/.test(l))).toBe(true);
  });
});

describe("scan outputs", () => {
  it("CSV ends with the summary as # key: value lines, every field and the caution", () => {
    const out = join(dir, "cands.csv");
    expect(runCli(["scan", file, ...base, "--out", out]).code).toBe(0);
    const j = runCli(["scan", file, ...base, "--json"]);
    const summary = JSON.parse(j.stdout.trim().split("\n").at(-1)!);
    const lines = readFileSync(out, "utf8").trim().split("\n");
    const trailer = lines.filter((l) => l.startsWith("# "));
    const rows = lines.filter((l) => !l.startsWith("#"));
    expect(lines.slice(rows.length)).toEqual(trailer); // the trailer comes after every row
    const keys = trailer.map((l) => l.slice(2, l.indexOf(":")));
    expect(keys).toEqual(Object.keys(summary));
    expect(trailer).toContain(`# candidates: ${summary.candidates}`);
    expect(trailer).toContain(`# skipped: []`);
    expect(trailer.find((l) => l.startsWith("# caution: "))).toContain("not a detection");
  });

  it("without a terminal, progress is logged as lines on stderr; --quiet silences them", () => {
    const loud = runCli(["scan", file, "--mass-range", "8:12", "--fmin", "30", "--json"]);
    expect(loud.code).toBe(0);
    const lines = loud.stderr.trim().split("\n");
    expect(lines.length).toBeGreaterThanOrEqual(1);
    expect(lines[0]).toMatch(/^chirpsieve: scan \d+\/\d+ segments, \d+%, \d+:\d\d elapsed$/);
    const quiet = runCli(["scan", file, ...base, "--json"]);
    expect(quiet.stderr).toBe("");
  });
});

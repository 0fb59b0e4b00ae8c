import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { ajith2011, writeStrain } from "@chirpsieve/core";
import { arrivalTime, atSnr, injectionAt, simulatedData } from "../search/fixtures.js";
import { runCli } from "./helpers.js";

const FS = 2048;
let dir: string;
let file: string;
const inj = atSnr(injectionAt(10, 9, 40.3), 14, ajith2011, FS, 30);

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "chirpsieve-scan-"));
  file = join(dir, "site.f32");
  const data = simulatedData({ psd: ajith2011, fs: FS, seconds: 64, seed: "cli-scan", fMin: 30, injections: [inj] });
  await writeStrain(file, { data, sampleRate: FS, startTime: 0 });
});

afterAll(() => rmSync(dir, { recursive: true, force: true }));

const base = ["--mass-range", "8:12", "--fmin", "30", "--quiet"];

describe("chirpsieve scan", () => {
  it("finds the injected chirp and prints JSON lines: candidates, then a summary", () => {
    const r = runCli(["scan", file, ...base, "--json"]);
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    const lines = r.stdout.trim().split("\n").map((l) => JSON.parse(l));
    const summary = lines.at(-1);
    expect(summary.type).toBe("summary");
    for (const key of ["files", "templates", "segments", "segmentSamples", "sampleRate", "analysedSeconds", "skippedSeconds", "wallSeconds", "fftBackend"]) {
      expect(summary).toHaveProperty(key);
    }
    const cands = lines.filter((l) => l.type === "candidate");
    const best = cands.reduce((a, b) => (b.snr > a.snr ? b : a));
    for (const key of ["coalescenceTime", "snr", "chi2", "chi2Dof", "reweightedSnr", "chirpMassSolar", "primaryMassSolar", "secondaryMassSolar", "effectiveDistanceMpc", "phase", "templateIndex", "file"]) {
      expect(best).toHaveProperty(key);
    }
    expect(Math.abs(best.coalescenceTime - arrivalTime(inj))).toBeLessThan(0.01);
    expect(best.snr).toBeGreaterThan(10);
    expect(best.file).toBe(file);
  });

  it("writes CSV and table formats, and an --out file atomically", () => {
    const out = join(dir, "cands.csv");
    const r = runCli(["scan", file, ...base, "--out", out]);
    expect(r.code).toBe(0);
    const csv = readFileSync(out, "utf8").trim().split("\n");
    expect(csv[0]).toBe("coalescenceTime,snr,reweightedSnr,chi2,chi2Dof,phase,chirpMassSolar,primaryMassSolar,secondaryMassSolar,primarySpin,secondarySpin,effectiveSpin,effectiveDistanceMpc,templateIndex,file");
    expect(csv.length).toBeGreaterThan(1);
    expect(readdirSync(dir).filter((f) => f.includes(".partial"))).toEqual([]);
    const t = runCli(["scan", file, ...base, "--format", "table"]);
    expect(t.code).toBe(0);
    expect(t.stdout).toContain("candidate");
    expect(t.stdout).toContain("not a detection");
    expect(t.stdout).toMatch(/searched [\d.]+ s of [\d.]+ s of data/);
    expect(t.stdout).toMatch(/no coalescence time can be searched in the first [\d.]+ s of a file/);
  });

  describe("bad input: one line on stderr, exit code 2, no output file", () => {
    const expectBad = (args: string[], mention: string) => {
      const out = join(dir, `bad-${Math.random().toString(36).slice(2)}.jsonl`);
      const r = runCli(["scan", ...args, "--out", out]);
      expect(r.code).toBe(2);
      const lines = r.stderr.trim().split("\n");
      expect(lines).toHaveLength(1);
      expect(r.stderr).toContain(mention);
      expect(r.stderr).not.toMatch(/\n\s+at /);
      expect(existsSync(out)).toBe(false);
    };

    it("NaN samples", async () => {
      const f = join(dir, "nan.f64");
      const data = new Float64Array(64 * FS);
      data[1000] = NaN;
      await writeStrain(f, { data, sampleRate: FS, startTime: 0 }, { nonFinite: "allow" });
      expectBad([f, ...base], "nan.f64");
    });

    it("an empty file", () => {
      const f = join(dir, "empty.f32");
      writeFileSync(f, "");
      writeFileSync(`${f}.json`, JSON.stringify({ sampleRate: FS, startTime: 0 }));
      expectBad([f, ...base], "empty.f32");
    });

    it("a sidecar with a wrong sample rate", () => {
      const f = join(dir, "badrate.f32");
      writeFileSync(f, Buffer.alloc(4 * 1024));
      writeFileSync(`${f}.json`, JSON.stringify({ sampleRate: "4k", startTime: 0 }));
      expectBad([f, ...base], "sampleRate");
    });

    it("an unknown option", () => expectBad([file, ...base, "--no-such-option"], "--no-such-option"));
    it("a malformed mass range", () => expectBad([file, "--mass-range", "3:1", "--quiet"], "--mass-range"));
    it("a missing file", () => expectBad([join(dir, "nope.f32"), ...base], "nope.f32"));
    it("a negative chi-squared allowance", () => expectBad([file, ...base, "--chi2-allowance", "-0.1"], "--chi2-allowance"));
    it("a PSD segment of a few samples names --welch-segment", () => expectBad([file, ...base, "--welch-segment", "0.0001"], "--welch-segment: 0.0001 s is 0 samples"));
    it("a PSD segment too long for the data says so, not the template", () =>
      expectBad([file, ...base, "--welch-segment", "1000"], "use a shorter --welch-segment"));

    it("--out naming an input (the sidecar) is refused and the input is left intact", () => {
      const sidecar = `${file}.json`;
      const before = readFileSync(sidecar, "utf8");
      const r = runCli(["scan", file, ...base, "--out", sidecar]);
      expect(r.code).toBe(2);
      expect(r.stderr).toContain("--out");
      expect(readFileSync(sidecar, "utf8")).toBe(before);
    });
  });
});

describe("chirpsieve scan: the edge of the inspiral", () => {
  it("warns once, naming the total-mass range of templates whose inspiral carries < 90% of the SNR, and records it in the summary", () => {
    const r = runCli(["scan", file, "--mass-range", "8:12", "--fmin", "30", "--noise-curve", "ajith2011", "--json"]);
    expect(r.code, r.stderr).toBe(0);
    const warnings = r.stderr.split("\n").filter((l) => l.startsWith("chirpsieve: warning:"));
    expect(warnings).toHaveLength(1);
    expect(warnings[0]).toMatch(/templates \(total mass [\d.]+–24\.0 M_sun\) carry less than 90% .* lighter chirp masses and earlier times/);
    const summary = JSON.parse(r.stdout.trim().split("\n").at(-1)!);
    expect(summary.type).toBe("summary");
    expect(summary.inspiralEdge.threshold).toBe(0.9);
    expect(summary.inspiralEdge.below).toBeGreaterThan(0);
    expect(summary.inspiralEdge.totalMassRangeSolar[1]).toBeCloseTo(24, 6);
    expect(summary.inspiralEdge.psd).toBe("ajith2011");
  });
  it("with --quiet keeps stderr clear but still records the edge (with the design curve standing in for an estimated PSD)", () => {
    const r = runCli(["scan", file, ...base, "--json"]);
    expect(r.stderr).toBe("");
    const summary = JSON.parse(r.stdout.trim().split("\n").at(-1)!);
    expect(summary.inspiralEdge.below).toBeGreaterThan(0);
    expect(summary.inspiralEdge.psd).toMatch(/^ajith2011 \(design curve standing in for the estimated PSD\)$/);
  });
});

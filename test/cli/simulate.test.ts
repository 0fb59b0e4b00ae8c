import { existsSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { readStrain } from "@chirpsieve/core";
import { injectInto } from "../../packages/core/src/inject/injection.js";
import { SITE_A } from "../../packages/core/src/waveform/antenna.js";
import { runCli } from "./helpers.js";

const tmp = (): string => mkdtempSync(join(tmpdir(), "chirpsieve-simulate-"));

const oneInjection = {
  primaryMassSolar: 12,
  secondaryMassSolar: 9,
  coalescenceTime: 1000000010.3,
  distanceMpc: 150,
  inclination: 0.4,
  rightAscension: 2,
  declination: 0.3,
  polarisation: 1,
  phase: 0.5,
};

function expectOneLineError(r: { code: number; stderr: string }, pattern: RegExp): void {
  expect(r.code).toBe(2);
  expect(r.stderr.trim().split("\n")).toHaveLength(1);
  expect(r.stderr).toMatch(pattern);
}

describe("chirpsieve simulate", () => {
  it("writes the strain, its sidecar and the injection manifest; the same seed gives the same bytes", () => {
    const runs = [tmp(), tmp()].map((dir) => {
      const out = join(dir, "sim.f32");
      const r = runCli([
        "simulate", "--noise-curve", "ajith2011", "--duration", "16", "--rate", "1024", "--seed", "7", "--start", "1000000000",
        "--fmin", "30", "--inject-random", "2", "--mass-range", "5:15", "--snr-range", "8:20", "--edge-margin", "2", "--out", out, "--label", "test run",
      ]);
      expect(r.stderr).toBe("");
      expect(r.code).toBe(0);
      expect(r.stdout).toMatch(/synthetic/);
      return { out, data: readFileSync(out), manifest: readFileSync(`${out}.injections.json`, "utf8") };
    });
    expect(runs[0].data.length).toBe(16 * 1024 * 4);
    expect(runs[1].data.equals(runs[0].data)).toBe(true);
    expect(runs[1].manifest).toBe(runs[0].manifest);
    const sidecar = JSON.parse(readFileSync(`${runs[0].out}.json`, "utf8"));
    expect(sidecar).toMatchObject({ sampleRate: 1024, startTime: 1000000000, label: "test run" });
    const m = JSON.parse(runs[0].manifest);
    expect(m).toMatchObject({ synthetic: true, noiseCurve: "ajith2011", sampleRate: 1024, startTime: 1e9, duration: 16, seed: 7, detector: "site-a" });
    expect(m.injections).toHaveLength(2);
    for (const inj of m.injections) {
      expect(inj.optimalSnr).toBeGreaterThanOrEqual(8);
      expect(inj.optimalSnr).toBeLessThanOrEqual(20);
      expect(inj.coalescenceTime).toBeGreaterThan(1e9);
      expect(inj.coalescenceTime).toBeLessThan(1e9 + 16);
      expect(inj.chirpMassSolar).toBeCloseTo(Math.pow(inj.primaryMassSolar * inj.secondaryMassSolar, 0.6) / Math.pow(inj.primaryMassSolar + inj.secondaryMassSolar, 0.2), 10);
    }
  });

  it("injects the records of an --inject file exactly where injectInto puts them (no noise)", async () => {
    const dir = tmp();
    const injFile = join(dir, "inj.json");
    writeFileSync(injFile, JSON.stringify({ injections: [oneInjection] }));
    const out = join(dir, "signal.f64");
    const manifest = join(dir, "what.json");
    const r = runCli([
      "simulate", "--duration", "16", "--rate", "1024", "--start", "1000000000", "--fmin", "30", "--inject", injFile,
      "--no-noise", "--out", out, "--manifest", manifest,
    ]);
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    const strain = await readStrain(out);
    const ref = new Float64Array(16 * 1024);
    injectInto(ref, 1024, 1e9, oneInjection, SITE_A, 30);
    expect(strain.data).toEqual(ref);
    const m = JSON.parse(readFileSync(manifest, "utf8"));
    expect(m.noise).toBe(false);
    expect(m.injections[0].optimalSnr).toBeGreaterThan(0);
    expect(m.injections[0].primaryMassSolar).toBe(12);
  });

  it("rejects bad flags and bad injection files with one line and exit code 2", () => {
    const dir = tmp();
    const out = join(dir, "x.f32");
    expectOneLineError(runCli(["simulate", "--duration", "16", "--rate", "fast", "--out", out]), /--rate/);
    expectOneLineError(runCli(["simulate", "--rate", "1024", "--out", out]), /--duration/);
    expectOneLineError(runCli(["simulate", "--duration", "16", "--rate", "1024", "--out", out, "--inject-random", "2"]), /--snr-range|--distance-range/);
    const bad = join(dir, "bad.json");
    writeFileSync(bad, JSON.stringify([oneInjection, { ...oneInjection, distanceMpc: -3 }]));
    expectOneLineError(runCli(["simulate", "--duration", "16", "--rate", "1024", "--out", out, "--inject", bad]), /bad\.json: injection 1: distanceMpc must be a positive/);
    const late = join(dir, "late.json");
    writeFileSync(late, JSON.stringify([{ ...oneInjection, coalescenceTime: 1000 }]));
    expectOneLineError(
      runCli(["simulate", "--duration", "16", "--rate", "1024", "--out", out, "--inject", late]),
      /--inject: .*late\.json: injection 0 coalesces at 1000, outside the simulated data \(0 to 16/,
    );
    expect(existsSync(out)).toBe(false);
  });
});

describe("chirpsieve simulate --spin-range", () => {
  it("draws aligned spins in the range, prints them and records them and the range in the manifest", () => {
    const out = join(tmp(), "spin.f32");
    const r = runCli([
      "simulate", "--duration", "64", "--rate", "1024", "--seed", "4", "--fmin", "30", "--inject-random", "2",
      "--mass-range", "5:15", "--spin-range=-0.5:0.6", "--snr-range", "8:20", "--out", out,
    ]);
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/spins -?\d\.\d{3}, -?\d\.\d{3}/);
    const m = JSON.parse(readFileSync(`${out}.injections.json`, "utf8"));
    expect(m.spinRange).toEqual([-0.5, 0.6]);
    for (const inj of m.injections) {
      expect(inj.primarySpin).toBeGreaterThanOrEqual(-0.5);
      expect(inj.secondarySpin).toBeLessThanOrEqual(0.6);
    }
  });
  it("refuses a spin of 1, and a spin range without random injections (one line, exit 2)", () => {
    const out = join(tmp(), "bad.f32");
    expectOneLineError(runCli(["simulate", "--duration", "16", "--out", out, "--inject-random", "1", "--spin-range", "0:1", "--snr-range", "8:9"]), /--spin-range: .*between −1 and 1/);
    expectOneLineError(runCli(["simulate", "--duration", "16", "--out", out, "--spin-range", "0:0.5"]), /--spin-range: only applies with --inject-random/);
    expect(existsSync(out)).toBe(false);
  });
});

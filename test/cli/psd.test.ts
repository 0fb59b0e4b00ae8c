import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { existsSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { ajith2011, colouredNoise, horizonDistance, writeStrain } from "@chirpsieve/core";
import { readPsdTable } from "../../packages/core/src/noise/psdTable.js";
import { runCli } from "./helpers.js";

// Synthetic data: 32 s of seeded ajith2011-coloured Gaussian noise at 2048 Hz (no real event).
const fs = 2048;
const dir = mkdtempSync(join(tmpdir(), "chirpsieve-psd-cli-"));
const strainFile = join(dir, "synthetic-noise.f64");
const zerosFile = join(dir, "zero-stretch.f64");
const nanFile = join(dir, "nan.f64");

beforeAll(async () => {
  const noise = colouredNoise(ajith2011, 32 * fs, fs, "psd-cli");
  await writeStrain(strainFile, { data: noise, sampleRate: fs, startTime: 100 });
  // The same noise with 6–10 s zero-filled, and with one NaN at 20 s.
  const zeros = noise.slice();
  zeros.fill(0, 6 * fs, 10 * fs);
  await writeStrain(zerosFile, { data: zeros, sampleRate: fs, startTime: 100 });
  const nan = noise.slice();
  nan[20 * fs] = Number.NaN;
  await writeStrain(nanFile, { data: nan, sampleRate: fs, startTime: 100 }, { nonFinite: "allow" });
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function expectUsageError(args: string[], mention: string): void {
  const r = runCli(args);
  expect(r.code).toBe(2);
  expect(r.stderr.trim().split("\n")).toHaveLength(1);
  expect(r.stderr).toContain(mention);
}

describe("chirpsieve psd", () => {
  it("--json gives the Welch estimate, close to the model, and the 1.4+1.4 horizon", () => {
    const r = runCli(["psd", strainFile, "--json", "--average", "mean", "--segment", "2"]);
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.file).toBe(strainFile);
    expect(j.sampleRate).toBe(fs);
    expect(j.segmentSeconds).toBe(2);
    expect(j.average).toBe("mean");
    expect(j.segments).toBe(31);
    expect(j.frequency).toHaveLength(2049);
    expect(j.psd).toHaveLength(2049);
    expect(j.frequency[2]).toBe(1);
    let ratio = 0;
    for (let k = 50; k < 900; k++) ratio += j.psd[k] / ajith2011.evaluate(j.frequency[k]);
    expect(Math.abs(ratio / 850 - 1)).toBeLessThan(0.02);
    // Nyquist 1024 Hz is below the ISCO frequency, so the integral stops there. Estimating S from
    // the data raises 1/S on average (Jensen), so allow a few % above the model's horizon.
    const model = horizonDistance({ massSolar1: 1.4, massSolar2: 1.4, psd: ajith2011, fMinHz: 20, fMaxHz: 1024 });
    expect(j.horizonMpc1p4 / model.horizonMpc).toBeGreaterThan(0.97);
    expect(j.horizonMpc1p4 / model.horizonMpc).toBeLessThan(1.08);
    expect(j.rangeMpc1p4).toBeCloseTo(j.horizonMpc1p4 / 2.264, 10);
  });

  it("prints a readable summary and writes the CSV and the SVG plot", () => {
    const csv = join(dir, "psd.csv");
    const svg = join(dir, "asd.svg");
    const r = runCli(["psd", strainFile, "--out", csv, "--plot", svg, "--fmin", "30"]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/Welch median of 15 segments of 4 s/);
    expect(r.stdout).toMatch(/horizon \d+\.\d Mpc/);
    expect(r.stdout).toMatch(/averaged range \d+\.\d Mpc/);
    expect(r.stdout).toContain("30.00–1024 Hz");
    const text = readFileSync(csv, "utf8");
    expect(text.startsWith("# frequency_hz,psd_per_hz\n")).toBe(true);
    const table = readPsdTable(csv);
    expect(table.fMinHz).toBe(0.25);
    expect(table.fMaxHz).toBe(1024);
    expect(Math.abs(table.evaluate(200) / ajith2011.evaluate(200) - 1)).toBeLessThan(0.5);
    const plot = readFileSync(svg, "utf8");
    expect(plot.startsWith("<svg")).toBe(true);
    expect(plot).toContain('xmlns="http://www.w3.org/2000/svg"');
    expect(plot).toContain("frequency (Hz)");
    expect(plot).toContain("amplitude spectral density");
  });

  it("refuses a zero-filled stretch or a NaN as scan does: exit 2, one line naming the file, time and kind, nothing written", () => {
    const csv = join(dir, "refused.csv");
    const z = runCli(["psd", zerosFile, "--out", csv]);
    expect(z.code).toBe(2);
    expect(z.stdout).toBe("");
    expect(z.stderr.trim().split("\n")).toHaveLength(1);
    expect(z.stderr).toContain(`chirpsieve: ${zerosFile}: zero-filled samples at t = 106.0000 s (samples 12288–20479, 4.00 s)`);
    expect(z.stderr).toContain("--skip-bad-data");
    const n = runCli(["psd", nanFile, "--out", csv]);
    expect(n.code).toBe(2);
    expect(n.stderr.trim().split("\n")).toHaveLength(1);
    expect(n.stderr).toContain(`chirpsieve: ${nanFile}: non-finite samples (NaN or infinite) at t = 120.0000 s`);
    expect(existsSync(csv)).toBe(false);
  });

  it("--skip-bad-data estimates from the data around the zero-filled stretch and reports it", () => {
    const r = runCli(["psd", zerosFile, "--json", "--average", "mean", "--segment", "2", "--skip-bad-data"]);
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.skipped).toEqual([{ startTime: 106, endTime: 110, reason: "zero-filled samples" }]);
    expect(j.skippedSeconds).toBe(4);
    // 2 s segments every 1 s: ⌊(6 − 2)/1⌋ + 1 = 5 before the stretch and ⌊(22 − 2)/1⌋ + 1 = 21 after it.
    expect(j.segments).toBe(26);
    let ratio = 0;
    for (let k = 50; k < 900; k++) ratio += j.psd[k] / ajith2011.evaluate(j.frequency[k]);
    expect(Math.abs(ratio / 850 - 1)).toBeLessThan(0.03);
    const text = runCli(["psd", zerosFile, "--skip-bad-data"]);
    expect(text.code).toBe(0);
    expect(text.stdout).toContain("left out 1 bad stretch (4.000 s), the first zero-filled samples at t = 106.0000–110.0000 s; estimated from the rest");
  });

  it("rejects bad flags with one line naming the flag and exit code 2", () => {
    // Each run starts a node process (~2 s on a loaded machine), so only a few cases are run here.
    expectUsageError(["psd", strainFile, "--segment", "64"], "--segment");
    expectUsageError(["psd", strainFile, "--segment", "four"], "--segment");
    expectUsageError(["psd", strainFile, "--segment", "0.0001"], "--segment: 0.0001 s is 0 samples");
    expectUsageError(["psd", strainFile, "--out", join(dir, "no-such-dir", "p.csv")], "--out");
  });
});

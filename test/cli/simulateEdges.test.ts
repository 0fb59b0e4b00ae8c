// simulate --inject-random puts chirps where a scan can search them; multi-site SNR is network SNR.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { runCli } from "./helpers.js";

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "chirpsieve-simedges-"));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const manifestOf = (p: string) => JSON.parse(readFileSync(`${p}.injections.json`, "utf8"));

describe("simulate --inject-random and the scan's unsearchable edges", () => {
  it("every random coalescence lies where a scan with the same --fmin and --mass-range searches", () => {
    const out = join(dir, "edges.f32");
    const sim = runCli([
      "simulate", "--duration", "96", "--rate", "2048", "--seed", "11", "--start", "500", "--fmin", "30",
      "--inject-random", "4", "--mass-range", "8:12", "--snr-range", "10:15", "--out", out,
    ]);
    expect(sim.stderr).toBe("");
    expect(sim.code).toBe(0);
    expect(sim.stdout).toMatch(/kept clear of the first [\d.]+ s and the last 4\.1 s/);
    const scan = runCli(["scan", out, "--mass-range", "8:12", "--fmin", "30", "--json", "--quiet"]);
    expect(scan.code).toBe(0);
    const summary = JSON.parse(scan.stdout.trim().split("\n").at(-1)!);
    const injections = manifestOf(out).injections as { coalescenceTime: number }[];
    expect(injections).toHaveLength(4);
    for (const inj of injections) {
      // The scan's own statement of what it cannot search (its summary), not simulate's.
      expect(inj.coalescenceTime - 0.0214).toBeGreaterThan(500 + summary.leadInSeconds);
      expect(inj.coalescenceTime + 0.0214).toBeLessThan(596 - summary.tailSeconds);
    }
  });

  it("--edge-margin sets the clear stretches; it needs --inject-random", () => {
    const out = join(dir, "margin.f32");
    const r = runCli([
      "simulate", "--duration", "16", "--rate", "1024", "--seed", "3", "--fmin", "30",
      "--inject-random", "1", "--mass-range", "8:12", "--snr-range", "10:10", "--edge-margin", "7.5", "--out", out,
    ]);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain("kept clear of the first 7.5 s and the last 7.5 s (--edge-margin)");
    const t = manifestOf(out).injections[0].coalescenceTime;
    expect(t).toBeGreaterThanOrEqual(7.5);
    expect(t).toBeLessThanOrEqual(8.5);
    const bad = runCli(["simulate", "--duration", "16", "--rate", "1024", "--edge-margin", "2", "--out", join(dir, "x.f32")]);
    expect(bad.code).toBe(2);
    expect(bad.stderr.trim().split("\n")).toHaveLength(1);
    expect(bad.stderr).toContain("--edge-margin");
  });

  it("a file too short for the default margins is refused, naming --edge-margin", () => {
    const r = runCli([
      "simulate", "--duration", "64", "--rate", "1024", "--fmin", "20", "--inject-random", "1", "--mass-range", "1:2",
      "--snr-range", "8:10", "--out", join(dir, "short.f32"),
    ]);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split("\n")).toHaveLength(1);
    expect(r.stderr).toMatch(/kept clear at the start.*--edge-margin/);
  });
});

describe("simulate on several sites: --snr-range is the network SNR", () => {
  it("per-site optimal SNRs in the manifests add in quadrature to the drawn network SNR within 1e-9", () => {
    const out = join(dir, "net.f32");
    const r = runCli([
      "simulate", "--duration", "128", "--rate", "2048", "--seed", "5", "--fmin", "30", "--detector", "site-a,site-b",
      "--inject-random", "3", "--mass-range", "6:14", "--snr-range", "12:20", "--out", out,
    ]);
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    const a = manifestOf(join(dir, "net.site-a.f32")).injections;
    const b = manifestOf(join(dir, "net.site-b.f32")).injections;
    expect(a).toHaveLength(3);
    for (let k = 0; k < a.length; k++) {
      const drawn = a[k].networkOptimalSnr;
      expect(b[k].networkOptimalSnr).toBe(drawn);
      expect(drawn).toBeGreaterThanOrEqual(12);
      expect(drawn).toBeLessThanOrEqual(20);
      expect(a[k].distanceMpc).toBe(b[k].distanceMpc); // one distance for both sites
      expect(Math.abs(Math.hypot(a[k].optimalSnr, b[k].optimalSnr) - drawn)).toBeLessThan(1e-9 * drawn);
    }
  });
});

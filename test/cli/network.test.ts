import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { runCli } from "./helpers.js";

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "chirpsieve-net-"));
  writeFileSync(
    join(dir, "inj.json"),
    JSON.stringify([
      { primaryMassSolar: 10, secondaryMassSolar: 8, coalescenceTime: 100.5, distanceMpc: 150, inclination: 0.4, rightAscension: 1.0, declination: 0.3, polarisation: 0.5, phase: 0.2 },
    ]),
  );
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("two sites: simulate writes one file per site, scan forms coincidences with a time-slide background", () => {
  it("finds the injection at both sites as one coincidence with a false-alarm rate and the background livetime", () => {
    const sim = runCli(["simulate", "--duration", "128", "--rate", "2048", "--seed", "5", "--fmin", "30", "--detector", "site-a,site-b", "--inject", join(dir, "inj.json"), "--out", join(dir, "sim.f32")]);
    expect(sim.stderr).toBe("");
    expect(sim.code).toBe(0);
    for (const site of ["site-a", "site-b"]) {
      expect(existsSync(join(dir, `sim.${site}.f32`))).toBe(true);
      const manifest = JSON.parse(readFileSync(join(dir, `sim.${site}.f32.injections.json`), "utf8"));
      expect(manifest.detector).toBe(site);
      expect(manifest.injections[0].optimalSnr).toBeGreaterThan(15);
    }
    const r = runCli(["scan", "--site", `site-a=${join(dir, "sim.site-a.f32")}`, "--site", `site-b=${join(dir, "sim.site-b.f32")}`, "--mass-range", "6:14", "--fmin", "30", "--json", "--quiet"]);
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    const lines = r.stdout.trim().split("\n").map((l) => JSON.parse(l));
    const coincidences = lines.filter((l) => l.type === "coincidence");
    expect(coincidences).toHaveLength(1);
    const c = coincidences[0];
    expect(Math.abs(c.coalescenceTime - 100.5)).toBeLessThan(0.05);
    expect(Object.keys(c.sites).sort()).toEqual(["site-a", "site-b"]);
    for (const key of ["falseAlarmRatePerYear", "falseAlarmProbability", "falseAlarmRateIsUpperLimit", "slides", "rankingStatistic"]) {
      expect(c).toHaveProperty(key);
    }
    const summary = lines.at(-1);
    expect(summary.type).toBe("summary");
    expect(summary.background.backgroundSeconds).toBeGreaterThan(0);
    expect(summary.background.slides).toBeGreaterThan(0);
  });

  it("rejects a site that is not known, naming the flag (exit 2)", () => {
    const r = runCli(["scan", "--site", "nowhere=x.f32", "--site", "site-a=y.f32", "--mass-range", "6:14", "--quiet"]);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split("\n")).toHaveLength(1);
    expect(r.stderr).toContain("--site");
  });
});

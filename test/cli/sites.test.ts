import { afterAll, describe, expect, it } from "vitest";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { C, lightTravelTime, siteByName } from "@chirpsieve/core";
import { runCli } from "./helpers.js";

const dir = mkdtempSync(join(tmpdir(), "chirpsieve-sites-cli-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function file(name: string, content: unknown): string {
  const p = join(dir, name);
  writeFileSync(p, typeof content === "string" ? content : JSON.stringify(content));
  return p;
}

describe("chirpsieve sites", () => {
  it("--json lists the built-in invented sites and the light-travel time of each pair", () => {
    const r = runCli(["sites", "--json"]);
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.sites.map((s: { name: string }) => s.name)).toEqual(["site-a", "site-b", "site-c"]);
    expect(j.sites[0]).toMatchObject({ name: "site-a", latitude: 52, longitude: -30, elevation: 0, xArmAzimuth: 30, yArmAzimuth: 120, origin: "built-in" });
    expect(j.lightTravelTimes).toHaveLength(3);
    expect(j.lightTravelTimes[0].sites).toEqual(["site-a", "site-b"]);
    expect(j.lightTravelTimes[0].seconds).toBeCloseTo(lightTravelTime(siteByName("site-a").detector, siteByName("site-b").detector), 15);
    // Any two points on the Earth are less than one Earth diameter (≈ 12 742 km) apart.
    for (const p of j.lightTravelTimes) expect(p.seconds).toBeLessThan(12_742_000 / C);
  });

  it("adds the sites of --sites FILE (elevation optional) and prints a table by default", () => {
    const f = file("my-sites.json", [
      { name: "ridge", latitude: -33.5, longitude: 200, xArmAzimuth: 10, yArmAzimuth: 100, elevation: 1200 },
      { name: "plain", latitude: 0, longitude: 0, xArmAzimuth: 45, yArmAzimuth: 135 },
    ]);
    const j = JSON.parse(runCli(["sites", "--sites", f, "--json"]).stdout);
    expect(j.sites.map((s: { name: string }) => s.name)).toEqual(["site-a", "site-b", "site-c", "ridge", "plain"]);
    expect(j.sites[3]).toMatchObject({ elevation: 1200, origin: f });
    expect(j.sites[4].elevation).toBe(0);
    expect(j.lightTravelTimes).toHaveLength(10);
    const t = runCli(["sites", "--sites", f]);
    expect(t.code).toBe(0);
    expect(t.stdout).toContain("33.500 S");
    expect(t.stdout).toContain("160.000 W");
    expect(t.stdout).toMatch(/site-a - site-b\s+\d+\.\d{3} ms/);
    expect(t.stdout).toMatch(/ridge - plain\s+\d+\.\d{3} ms/);
  });

  it("rejects a bad sites file with one line naming the file, the entry and the field (exit 2)", () => {
    // (Every other validation message is checked on the library in test/coinc/sites.test.ts.)
    const cases: [string, unknown, string][] = [
      ["lat.json", [{ name: "x", latitude: 91, longitude: 0, xArmAzimuth: 0, yArmAzimuth: 90 }], "entry 0: latitude must be a number in [-90, 90] degrees (got 91)"],
      ["arm.json", [{ name: "x", latitude: 1, longitude: 0, xArmAzimuth: 0, yArmAzimuth: 90 }, { name: "y", latitude: 1, longitude: 0, xArmAzimuth: 0 }], "entry 1: yArmAzimuth must be"],
    ];
    for (const [name, content, message] of cases) {
      const f = file(name, content);
      const r = runCli(["sites", "--sites", f]);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe("");
      expect(r.stderr.trim().split("\n")).toHaveLength(1);
      expect(r.stderr).toContain(`chirpsieve: ${f}: ${message}`);
    }
  });
});

import { afterAll, describe, expect, it } from "vitest";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { siteByName } from "@chirpsieve/core";
import { interSiteDelay } from "../../packages/core/src/coinc/interSiteDelay.js";
import { C } from "../../packages/core/src/physics/constants.js";
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
    expect(j.sites[0]).toMatchObject({ name: "site-a", degreesNorth: 52, degreesEast: -30, heightMetres: 0, armBearingsDegrees: [30, 120], origin: "built-in" });
    expect(j.interSiteDelays).toHaveLength(3);
    expect(j.interSiteDelays[0].sites).toEqual(["site-a", "site-b"]);
    expect(j.interSiteDelays[0].seconds).toBeCloseTo(interSiteDelay(siteByName("site-a").detector, siteByName("site-b").detector), 15);
    // Any two points on the Earth are less than one Earth diameter (≈ 12 742 km) apart.
    for (const p of j.interSiteDelays) expect(p.seconds).toBeLessThan(12_742_000 / C);
  });

  it("adds the sites of --sites FILE (height optional) and prints a table by default", () => {
    const f = file("my-sites.json", [
      { name: "ridge", degreesNorth: -33.5, degreesEast: 200, armBearingsDegrees: [10, 100], heightMetres: 1200 },
      { name: "plain", degreesNorth: 0, degreesEast: 0, armBearingsDegrees: [45, 135] },
    ]);
    const j = JSON.parse(runCli(["sites", "--sites", f, "--json"]).stdout);
    expect(j.sites.map((s: { name: string }) => s.name)).toEqual(["site-a", "site-b", "site-c", "ridge", "plain"]);
    expect(j.sites[3]).toMatchObject({ heightMetres: 1200, armBearingsDegrees: [10, 100], origin: f });
    expect(j.sites[4].heightMetres).toBe(0);
    expect(j.interSiteDelays).toHaveLength(10);
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
      ["north.json", [{ name: "x", degreesNorth: 91, degreesEast: 0, armBearingsDegrees: [0, 90] }], "entry 0: degreesNorth must be a number in [-90, 90] degrees (got 91)"],
      ["arm.json", [{ name: "x", degreesNorth: 1, degreesEast: 0, armBearingsDegrees: [0, 90] }, { name: "y", degreesNorth: 1, degreesEast: 0, armBearingsDegrees: [0] }], "entry 1: armBearingsDegrees must be"],
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

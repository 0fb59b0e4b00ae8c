import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { InputError, interSiteDelays, siteByName, siteCatalogue, type Injection } from "@chirpsieve/core";
import { interSiteDelay } from "../../packages/core/src/coinc/interSiteDelay.js";
import { injectionAtSites } from "../../packages/core/src/coinc/siteResponse.js";
import { BUILTIN_SITES, parseSites, readSitesFile } from "../../packages/core/src/coinc/sites.js";
import { C } from "../../packages/core/src/physics/constants.js";
import { SITE_A, SITE_B, detectorFromGeodetic, geocentreDelay, siderealAngle, plusCrossResponse } from "../../packages/core/src/waveform/antenna.js";

const GOOD = { name: "my-site", degreesNorth: 10, degreesEast: 20, armBearingsDegrees: [0, 90] };

function errorOf(text: string): string {
  try {
    parseSites(text, "sites.json");
  } catch (err) {
    expect(err).toBeInstanceOf(InputError);
    return (err as Error).message;
  }
  throw new Error("expected an InputError");
}

describe("built-in invented sites", () => {
  it("reuses the antenna module's site-a and site-b and adds site-c", () => {
    expect(BUILTIN_SITES.map((s) => s.name)).toEqual(["site-a", "site-b", "site-c"]);
    expect(siteByName("site-a").detector).toBe(SITE_A);
    expect(siteByName("site-b").detector).toBe(SITE_B);
    // The restated geodetic numbers rebuild exactly the antenna module's detectors.
    for (const s of BUILTIN_SITES) {
      const d = detectorFromGeodetic({ ...s, name: s.name });
      for (let i = 0; i < 3; i++) expect(d.vertex[i]).toBeCloseTo(s.detector.vertex[i], 6);
      for (let i = 0; i < 9; i++) expect(d.tensor[i]).toBeCloseTo(s.detector.tensor[i], 14);
    }
    expect(() => siteByName("nowhere")).toThrow(/unknown site "nowhere" \(known: site-a, site-b, site-c\)/);
  });
});

describe("light-travel time", () => {
  it("equals |r1 − r2| / c (common practice, no source)", () => {
    const [a, b, c] = BUILTIN_SITES.map((s) => s.detector);
    const direct = (p: typeof a, q: typeof a) =>
      Math.sqrt((p.vertex[0] - q.vertex[0]) ** 2 + (p.vertex[1] - q.vertex[1]) ** 2 + (p.vertex[2] - q.vertex[2]) ** 2) / C;
    expect(interSiteDelay(a, b)).toBeCloseTo(direct(a, b), 15);
    expect(interSiteDelay(b, a)).toBe(interSiteDelay(a, b));
    expect(interSiteDelay(a, a)).toBe(0);
    const pairs = interSiteDelays([a, b, c]);
    expect(pairs.map((p) => p.sites)).toEqual([["site-a", "site-b"], ["site-a", "site-c"], ["site-b", "site-c"]]);
    expect(pairs[2].seconds).toBe(interSiteDelay(b, c));
    // Spherical-Earth cross-check (R = 6371 km; chord 2R sin(θ/2) from the great-circle angle θ;
    // common practice, no source): within 0.5 % of the WGS-84 value.
    const deg = Math.PI / 180;
    const cosTheta = Math.sin(52 * deg) * Math.sin(-20 * deg) + Math.cos(52 * deg) * Math.cos(-20 * deg) * Math.cos(190 * deg);
    const chord = 2 * 6_371_000 * Math.sin(Math.acos(cosTheta) / 2);
    expect(interSiteDelay(a, b) / (chord / C)).toBeCloseTo(1, 2);
  });

  it("bounds the arrival-time difference of the antenna module's plane-wave delays, with equality along the baseline", () => {
    const a = SITE_A;
    const b = SITE_B;
    const ltt = interSiteDelay(a, b);
    const rng = seedrandom("sky");
    for (let i = 0; i < 500; i++) {
      const ra = 2 * Math.PI * rng();
      const dec = Math.asin(2 * rng() - 1);
      const g = 2 * Math.PI * rng();
      const sky = { rightAscension: ra, declination: dec };
      const dt = geocentreDelay(a, sky, g) - geocentreDelay(b, sky, g);
      expect(Math.abs(dt)).toBeLessThanOrEqual(ltt * (1 + 1e-12));
    }
    // A source in the direction of r_a − r_b (at sidereal angle 0) reaches site-a first by exactly |r_a − r_b| / c.
    const d = [0, 1, 2].map((i) => a.vertex[i] - b.vertex[i]);
    const norm = Math.hypot(d[0], d[1], d[2]);
    const baseline = { rightAscension: Math.atan2(d[1], d[0]), declination: Math.asin(d[2] / norm) };
    const dt = geocentreDelay(a, baseline, 0) - geocentreDelay(b, baseline, 0);
    expect(dt).toBeCloseTo(-ltt, 12);
  });
});

describe("injectionAtSites", () => {
  it("takes antenna factors and delays from the shared antenna code", () => {
    const inj: Injection = {
      primaryMassSolar: 1.4, secondaryMassSolar: 1.3, coalescenceTime: 12_345.6, distanceMpc: 50, inclination: 0.4,
      rightAscension: 2.1, declination: -0.3, polarisation: 0.8, phase: 0.1,
    };
    const dets = BUILTIN_SITES.map((s) => s.detector);
    const out = injectionAtSites(inj, dets);
    const g = siderealAngle(inj.coalescenceTime);
    out.forEach((r, i) => {
      const f = plusCrossResponse(dets[i], inj, inj.polarisation, g);
      expect(r.site).toBe(dets[i].name);
      expect(r.plus).toBe(f.plus);
      expect(r.cross).toBe(f.cross);
      expect(r.delaySeconds).toBe(geocentreDelay(dets[i], inj, g));
      expect(r.arrivalTime).toBe(inj.coalescenceTime + r.delaySeconds);
      expect(r.relativeAmplitude).toBeGreaterThanOrEqual(0);
      expect(r.relativeAmplitude).toBeLessThanOrEqual(1);
    });
    expect(Math.abs(out[0].arrivalTime - out[1].arrivalTime)).toBeLessThanOrEqual(interSiteDelay(dets[0], dets[1]));
  });
});

describe("sites files", () => {
  it("parses user sites (height optional) and appends them to the built-in ones", () => {
    const [s] = parseSites(JSON.stringify([GOOD]), "sites.json");
    expect(s).toMatchObject({ name: "my-site", degreesNorth: 10, degreesEast: 20, heightMetres: 0, armBearingsDegrees: [0, 90], origin: "sites.json" });
    expect(s.detector.name).toBe("my-site");
    const dot = s.detector.armX[0] * s.detector.armY[0] + s.detector.armX[1] * s.detector.armY[1] + s.detector.armX[2] * s.detector.armY[2];
    expect(dot).toBeCloseTo(0, 14);
    const dir = mkdtempSync(join(tmpdir(), "chirpsieve-sites-"));
    const file = join(dir, "sites.json");
    writeFileSync(file, JSON.stringify([GOOD, { ...GOOD, name: "high", heightMetres: 2500, description: "synthetic" }]));
    expect(readSitesFile(file).map((x) => x.heightMetres)).toEqual([0, 2500]);
    expect(siteCatalogue(file).map((x) => x.name)).toEqual(["site-a", "site-b", "site-c", "my-site", "high"]);
    expect(siteCatalogue().length).toBe(3);
  });

  it("names the file, the entry and the field in each error", () => {
    expect(errorOf("[{")).toMatch(/^sites\.json: not valid JSON/);
    expect(errorOf("{}")).toMatch(/^sites\.json: expected a JSON array of sites/);
    expect(errorOf("[]")).toBe("sites.json: the array lists no sites");
    expect(errorOf("[3]")).toMatch(/^sites\.json: entry 0: must be an object/);
    expect(errorOf(JSON.stringify([GOOD, { ...GOOD, name: "x", degreesNorth: 95 }]))).toBe(
      "sites.json: entry 1: degreesNorth must be a number in [-90, 90] degrees (got 95)",
    );
    const { degreesEast: _e, ...noEast } = GOOD;
    expect(errorOf(JSON.stringify([noEast]))).toBe("sites.json: entry 0: degreesEast must be a number in [-180, 360] degrees (got nothing)");
    expect(errorOf(JSON.stringify([{ ...GOOD, armBearingsDegrees: ["north", 90] }]))).toBe(
      'sites.json: entry 0: armBearingsDegrees[0] must be a number in [-360, 360] degrees (got "north")',
    );
    expect(errorOf(JSON.stringify([{ ...GOOD, armBearingsDegrees: [0] }]))).toBe(
      "sites.json: entry 0: armBearingsDegrees must be an array of two bearings in degrees, [first, second] (got [0])",
    );
    expect(errorOf(JSON.stringify([{ ...GOOD, armBearingsDegrees: 45 }]))).toMatch(/entry 0: armBearingsDegrees must be an array of two bearings/);
    expect(errorOf(JSON.stringify([{ ...GOOD, heightMetres: 1e6 }]))).toMatch(/entry 0: heightMetres must be a number in \[-11000, 10000\] metres/);
    expect(errorOf(JSON.stringify([{ ...GOOD, north: 3 }]))).toMatch(/entry 0: unknown field "north"/);
    expect(errorOf(JSON.stringify([{ ...GOOD, name: "" }]))).toMatch(/entry 0: name must be a non-empty string/);
    expect(errorOf(JSON.stringify([{ ...GOOD, name: "a=b" }]))).toMatch(/entry 0: name must be/);
    expect(errorOf(JSON.stringify([{ ...GOOD, name: "site-a" }]))).toBe('sites.json: entry 0: name "site-a" is already used by the built-in site');
    expect(errorOf(JSON.stringify([GOOD, GOOD]))).toBe('sites.json: entry 1: name "my-site" is already used by entry 0');
    expect(errorOf(JSON.stringify([{ ...GOOD, armBearingsDegrees: [10, 190] }]))).toMatch(/entry 0: armBearingsDegrees must not point along one line/);
    expect(errorOf(JSON.stringify([{ ...GOOD, description: 5 }]))).toMatch(/entry 0: description must be a string/);
  });
});

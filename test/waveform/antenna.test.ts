import { describe, expect, it } from "vitest";
import { InputError, detectorByName } from "@chirpsieve/core";
import { C } from "../../packages/core/src/physics/constants.js";
import { EARTH_ROTATION_RATE, SITE_A, SITE_B, detectorFromGeodetic, geocentreDelay, plusCrossResponse, siderealAngle } from "../../packages/core/src/waveform/antenna.js";

const dot = (a: readonly number[], b: readonly number[]): number => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];

describe("detector geometry", () => {
  it("puts the invented sites' vertices on the WGS-84 ellipsoid with orthogonal unit arms", () => {
    for (const d of [SITE_A, SITE_B]) {
      const r = Math.hypot(...d.vertex);
      // Between the polar (6356752 m) and equatorial (6378137 m) radii of WGS-84 (NIMA TR8350.2).
      expect(r).toBeGreaterThan(6_356_752);
      expect(r).toBeLessThan(6_378_137);
      expect(dot(d.armX, d.armX)).toBeCloseTo(1, 14);
      expect(dot(d.armY, d.armY)).toBeCloseTo(1, 14);
      expect(dot(d.armX, d.armY)).toBeCloseTo(0, 14);
      // Arms are horizontal: orthogonal to the ellipsoid normal (cos φ cos λ, cos φ sin λ, sin φ) at
      // the geodetic latitude φ and longitude λ of the site (WGS-84, NIMA TR8350.2).
      const [latDeg, lonDeg] = d === SITE_A ? [52, -30] : [-20, 160];
      const phi = (latDeg * Math.PI) / 180;
      const lam = (lonDeg * Math.PI) / 180;
      const up = [Math.cos(phi) * Math.cos(lam), Math.cos(phi) * Math.sin(lam), Math.sin(phi)];
      expect(Math.abs(dot(d.armX, up))).toBeLessThan(1e-14);
      expect(Math.abs(dot(d.armY, up))).toBeLessThan(1e-14);
      // D = (X X − Y Y)/2 of two orthogonal unit arms is traceless.
      const t = d.tensor;
      expect(t[0] + t[4] + t[8]).toBeCloseTo(0, 14);
    }
    expect(detectorByName("site-a")).toBe(SITE_A);
    expect(() => detectorByName("nowhere")).toThrow(/unknown detector "nowhere"/);
  });

  it("rejects a position north of the pole", () => {
    expect(() => detectorFromGeodetic({ name: "x", degreesNorth: 95, degreesEast: 0, armBearingsDegrees: [0, 90] })).toThrow(InputError);
  });
});

describe("plus/cross response", () => {
  it("gives F+ = cos 2ψ, F× = −sin 2ψ for a source overhead of an East/North detector", () => {
    // Our sign convention (documented in plusCrossResponse); |F|² = 1 overhead is common practice, no source.
    const d = detectorFromGeodetic({ name: "eq", degreesNorth: 0, degreesEast: 0, armBearingsDegrees: [90, 0] });
    for (const psi of [0, 0.3, 1.1, 2.5]) {
      const gmst = 1.7;
      const f = plusCrossResponse(d, { rightAscension: gmst, declination: 0 }, psi, gmst); // overhead of 0° N, 0° E
      expect(f.plus).toBeCloseTo(Math.cos(2 * psi), 12);
      expect(f.cross).toBeCloseTo(-Math.sin(2 * psi), 12);
    }
  });

  it("has F+² + F×² = 1 for a source at the zenith of any site", () => {
    for (const site of [SITE_A, SITE_B]) {
      const north = site === SITE_A ? 52 : -20;
      const east = site === SITE_A ? -30 : 160;
      const gmst = 0.4;
      const ra = (east * Math.PI) / 180 + gmst;
      const dec = (north * Math.PI) / 180; // the ellipsoid normal points at declination = the geodetic angle north
      for (const psi of [0, 0.7]) {
        const f = plusCrossResponse(site, { rightAscension: ra, declination: dec }, psi, gmst);
        expect(f.plus ** 2 + f.cross ** 2).toBeCloseTo(1, 12);
      }
    }
  });

  it("averages F+² and F×² to 1/5 each over the sky and polarisation", () => {
    // ⟨F+²⟩ = ⟨F×²⟩ = 1/5 for a 90° L-shaped detector (common practice, no source). Midpoint grid in
    // sin δ, right ascension and ψ (exact for the low-order trigonometric polynomials involved).
    let sp = 0;
    let sx = 0;
    let n = 0;
    const nMu = 120;
    const nRa = 48;
    const nPsi = 8;
    for (let a = 0; a < nMu; a++) {
      const dec = Math.asin(-1 + (2 * (a + 0.5)) / nMu);
      for (let b = 0; b < nRa; b++) {
        const ra = (2 * Math.PI * (b + 0.5)) / nRa;
        for (let c = 0; c < nPsi; c++) {
          const f = plusCrossResponse(SITE_A, { rightAscension: ra, declination: dec }, (Math.PI * (c + 0.5)) / nPsi, 0.9);
          sp += f.plus ** 2;
          sx += f.cross ** 2;
          n++;
        }
      }
    }
    expect(sp / n).toBeCloseTo(0.2, 4);
    expect(sx / n).toBeCloseTo(0.2, 4);
    expect((sp + sx) / n).toBeCloseTo(0.4, 4);
  });

  it("rotates (F+, F×) by 2Δψ when ψ grows: ψ + π/4 maps (F+, F×) to (F×, −F+)", () => {
    const sky = { rightAscension: 1.2, declination: -0.4 };
    const a = plusCrossResponse(SITE_B, sky, 0.3, 2.0);
    const b = plusCrossResponse(SITE_B, sky, 0.3 + Math.PI / 4, 2.0);
    expect(b.plus).toBeCloseTo(a.cross, 12);
    expect(b.cross).toBeCloseTo(-a.plus, 12);
  });
});

describe("delay from the geocentre", () => {
  it("is −|r|/c overhead, +|r|/c at the nadir and 0 on the horizon plane", () => {
    const gmst = 0.25;
    const r = Math.hypot(...SITE_A.vertex);
    const v = SITE_A.vertex;
    const dec = Math.asin(v[2] / r); // geocentric direction of the vertex
    const ra = Math.atan2(v[1], v[0]) + gmst;
    expect(geocentreDelay(SITE_A, { rightAscension: ra, declination: dec }, gmst)).toBeCloseTo(-r / C, 12);
    expect(geocentreDelay(SITE_A, { rightAscension: ra + Math.PI, declination: -dec }, gmst)).toBeCloseTo(r / C, 12);
    // Along an arm (horizontal for the ellipsoid normal, which is 0.19° from the geocentric radius at 52°).
    const arm = SITE_A.armX;
    const armDec = Math.asin(arm[2]);
    const armRa = Math.atan2(arm[1], arm[0]) + gmst;
    expect(Math.abs(geocentreDelay(SITE_A, { rightAscension: armRa, declination: armDec }, gmst))).toBeLessThan(5e-3 * (r / C));
  });
});

describe("sidereal angle convention", () => {
  it("is 0 at t = 0 and turns once per sidereal day", () => {
    // Sidereal day 86164.09 s (common practice, no source).
    expect(siderealAngle(0)).toBe(0);
    expect((2 * Math.PI) / EARTH_ROTATION_RATE).toBeCloseTo(86164.09, 1);
    expect(siderealAngle(86164.0989 / 4)).toBeCloseTo(Math.PI / 2, 5);
    expect(siderealAngle(-1)).toBeGreaterThan(6);
  });
});

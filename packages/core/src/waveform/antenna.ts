import { InputError } from "../errors.js";
import { C } from "../physics/constants.js";

/** A 3-vector in Earth-fixed Cartesian coordinates (x toward 0° east on the equator, z toward the North pole). */
export type Vec3 = readonly [number, number, number];

/** An L-shaped interferometer: its vertex and the unit vectors of its two arms, Earth-fixed. */
export interface Detector {
  /** Our label for the site, e.g. "site-a". */
  readonly name: string;
  /** Position of the vertex (beam splitter), m, Earth-fixed. */
  readonly vertex: Vec3;
  /** Unit vectors along the x and y arms, Earth-fixed. */
  readonly armX: Vec3;
  readonly armY: Vec3;
  /** Detector tensor D = (u u − v v) / 2, row-major 3×3. */
  readonly tensor: Float64Array;
  /** Where the site came from (a note for people). */
  readonly description?: string;
}

/** The plus and cross response factors F+ and F× of a detector for one sky position and polarisation angle. */
export interface PlusCrossFactors {
  plus: number;
  cross: number;
}

/** Where a source sits on the sky: right ascension α and declination δ, rad. */
export interface SkyPosition {
  readonly rightAscension: number;
  readonly declination: number;
}

/**
 * WGS-84 reference ellipsoid: semi-major axis a = 6378137 m and flattening f = 1/298.257223563
 * (NIMA TR8350.2, "Department of Defense World Geodetic System 1984", 3rd ed. (2000), Table 3.1).
 */
export const WGS84_SEMI_MAJOR_AXIS = 6_378_137;
export const WGS84_FLATTENING = 1 / 298.257223563;

/**
 * Nominal mean angular velocity of the Earth, rad/s: 7.292115e-5
 * (NIMA TR8350.2 (2000), Table 3.1, WGS-84 defining parameter ω).
 */
export const EARTH_ROTATION_RATE = 7.292115e-5;

function unitOrThrow(name: string, v: Vec3): Vec3 {
  const n = Math.hypot(v[0], v[1], v[2]);
  if (!(n > 0) || !Number.isFinite(n)) throw new InputError(`detector ${name} must be a finite non-zero vector`);
  return [v[0] / n, v[1] / n, v[2] / n];
}

/**
 * A detector from its vertex (m) and arm directions (normalised here), Earth-fixed Cartesian.
 * The detector tensor is D = (u u − v v) / 2 (Anderson, Brady, Creighton & Flanagan, Phys. Rev. D 63,
 * 042003 (2001), Appendix B).
 */
export function detectorFromArms(name: string, vertex: Vec3, armX: Vec3, armY: Vec3, description?: string): Detector {
  if (!vertex.every(Number.isFinite)) throw new InputError(`detector "${name}": vertex must be three finite numbers`);
  const u = unitOrThrow(`"${name}" x arm`, armX);
  const v = unitOrThrow(`"${name}" y arm`, armY);
  const tensor = new Float64Array(9);
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) tensor[3 * i + j] = 0.5 * (u[i] * u[j] - v[i] * v[j]);
  }
  return { name, vertex: [vertex[0], vertex[1], vertex[2]], armX: u, armY: v, tensor, description };
}

/**
 * Where an L-shaped detector stands and where its arms point. Angles in degrees.
 * Position on the WGS-84 ellipsoid: `degreesNorth` (geodetic, −90..90) and `degreesEast` (−180..360);
 * `heightMetres` above the ellipsoid (default 0). `armBearingsDegrees` holds the bearings of the first
 * and the second arm, clockwise from local north seen from above (90 = east); the detector tensor is
 * (u u − v v) / 2 with u along the first arm.
 */
export interface GeodeticSite {
  name: string;
  degreesNorth: number;
  degreesEast: number;
  heightMetres?: number;
  armBearingsDegrees: readonly [number, number];
  description?: string;
}

/**
 * Converts a geodetic site to Earth-fixed vectors on the WGS-84 ellipsoid. The vertex is
 * ((N + h) cos φ cos λ, (N + h) cos φ sin λ, (N (1 − e²) + h) sin φ) with N = a / √(1 − e² sin² φ),
 * φ the geodetic angle north and λ the angle east (standard geodetic-to-ECEF conversion,
 * NIMA TR8350.2 (2000), Eq. 4-14). The arms lie in the local horizontal plane (normal to the
 * ellipsoid): an arm of bearing A points along cos A n̂ + sin A ê with local North
 * n̂ = (−sin φ cos λ, −sin φ sin λ, cos φ) and East ê = (−sin λ, cos λ, 0).
 * Arm tilts out of that plane are ignored.
 */
export function detectorFromGeodetic(site: GeodeticSite): Detector {
  const { name } = site;
  const check = (label: string, value: number, lo: number, hi: number): void => {
    if (!Number.isFinite(value) || value < lo || value > hi) {
      throw new InputError(`detector "${name}": ${label} must be a number in [${lo}, ${hi}] (got ${value})`);
    }
  };
  check("degreesNorth", site.degreesNorth, -90, 90);
  check("degreesEast", site.degreesEast, -180, 360);
  const [firstArmDeg, secondArmDeg] = site.armBearingsDegrees;
  check("armBearingsDegrees[0]", firstArmDeg, -360, 360);
  check("armBearingsDegrees[1]", secondArmDeg, -360, 360);
  const h = site.heightMetres ?? 0;
  check("heightMetres", h, -11_000, 10_000);
  const deg = Math.PI / 180;
  const lat = site.degreesNorth * deg;
  const lon = site.degreesEast * deg;
  const e2 = WGS84_FLATTENING * (2 - WGS84_FLATTENING);
  const sinLat = Math.sin(lat);
  const cosLat = Math.cos(lat);
  const nRad = WGS84_SEMI_MAJOR_AXIS / Math.sqrt(1 - e2 * sinLat * sinLat);
  const vertex: Vec3 = [
    (nRad + h) * cosLat * Math.cos(lon),
    (nRad + h) * cosLat * Math.sin(lon),
    (nRad * (1 - e2) + h) * sinLat,
  ];
  const north: Vec3 = [-sinLat * Math.cos(lon), -sinLat * Math.sin(lon), cosLat];
  const east: Vec3 = [-Math.sin(lon), Math.cos(lon), 0];
  const arm = (bearingDeg: number): Vec3 => {
    const a = bearingDeg * deg;
    const c = Math.cos(a);
    const s = Math.sin(a);
    return [c * north[0] + s * east[0], c * north[1] + s * east[1], c * north[2] + s * east[2]];
  };
  return detectorFromArms(name, vertex, arm(firstArmDeg), arm(secondArmDeg), site.description);
}

/**
 * Unit vector from the Earth's centre toward a source at right ascension α and declination δ (rad),
 * in Earth-fixed coordinates at Greenwich mean sidereal angle `gmstRad`: the source's Earth-fixed
 * angle east is λ = α − GMST, so n̂ = (cos δ cos λ, cos δ sin λ, sin δ).
 */
export function sourceDirection(rightAscension: number, declination: number, gmstRad: number): Vec3 {
  const lam = rightAscension - gmstRad;
  const cd = Math.cos(declination);
  return [cd * Math.cos(lam), cd * Math.sin(lam), Math.sin(declination)];
}

/**
 * Antenna factors F+ = e+ : D and F× = e× : D of an L-shaped detector (Anderson, Brady, Creighton &
 * Flanagan, Phys. Rev. D 63, 042003 (2001), Appendix B), with e+ = X X − Y Y, e× = X Y + Y X.
 * Our orientation of the wave frame: with ê_α = (−sin λ, cos λ, 0) (toward increasing right ascension)
 * and ê_δ = (−sin δ cos λ, −sin δ sin λ, cos δ) (toward North) at the source direction,
 * X = cos ψ ê_α + sin ψ ê_δ and Y = −sin ψ ê_α + cos ψ ê_δ. So for a source overhead of a
 * detector whose x arm points East and y arm North, F+ = cos 2ψ and F× = −sin 2ψ.
 * Angles in radians; `siderealAngleRad` is the Greenwich sidereal angle ({@link siderealAngle}).
 */
export function plusCrossResponse(detector: Detector, sky: SkyPosition, polarisationRad: number, siderealAngleRad: number): PlusCrossFactors {
  const { rightAscension, declination } = sky;
  const lam = rightAscension - siderealAngleRad;
  const sl = Math.sin(lam);
  const cl = Math.cos(lam);
  const sd = Math.sin(declination);
  const cd = Math.cos(declination);
  const ea = [-sl, cl, 0];
  const ed = [-sd * cl, -sd * sl, cd];
  const cp = Math.cos(polarisationRad);
  const sp = Math.sin(polarisationRad);
  const x = [cp * ea[0] + sp * ed[0], cp * ea[1] + sp * ed[1], cp * ea[2] + sp * ed[2]];
  const y = [-sp * ea[0] + cp * ed[0], -sp * ea[1] + cp * ed[1], -sp * ea[2] + cp * ed[2]];
  const d = detector.tensor;
  let plus = 0;
  let cross = 0;
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) {
      const dij = d[3 * i + j];
      plus += dij * (x[i] * x[j] - y[i] * y[j]);
      cross += dij * (x[i] * y[j] + y[i] * x[j]);
    }
  }
  return { plus, cross };
}

/**
 * Arrival time at the detector minus arrival time at the Earth's centre, s, for a plane wave from
 * the sky position (α, δ): Δt = −(n̂ · r_detector) / c, with n̂ from {@link sourceDirection}
 * (plane-wave geometry; common practice, no source). Positive when the detector is farther from
 * the source than the Earth's centre.
 */
export function geocentreDelay(detector: Detector, sky: SkyPosition, siderealAngleRad: number): number {
  const n = sourceDirection(sky.rightAscension, sky.declination, siderealAngleRad);
  const r = detector.vertex;
  return -(n[0] * r[0] + n[1] * r[1] + n[2] * r[2]) / C;
}

/**
 * Greenwich mean sidereal angle (rad, in [0, 2π)) for a time in a file's time base, under
 * chirpsieve's convention for synthetic data: the angle is 0 at time 0 and advances at the Earth's
 * rotation rate, GMST(t) = ω_E t mod 2π. It is not the astronomical sidereal time of any calendar
 * date; it only fixes how sky positions map onto the (invented) detector.
 */
export function siderealAngle(timeSeconds: number): number {
  const turns = (EARTH_ROTATION_RATE * timeSeconds) / (2 * Math.PI);
  return 2 * Math.PI * (turns - Math.floor(turns));
}

/**
 * Invented detector sites for demos and synthetic data (no real observatory):
 * - "site-a": vertex at 52.0° N, 30.0° W (mid-Atlantic, sea level), arms at bearings 30° and 120°.
 * - "site-b": vertex at 20.0° S, 160.0° E (Coral Sea, sea level), arms at bearings 75° and 165°.
 */
export const SITE_A: Detector = detectorFromGeodetic({
  name: "site-a",
  degreesNorth: 52,
  degreesEast: -30,
  armBearingsDegrees: [30, 120],
  description: "invented L-shaped site at 52.0 N, 30.0 W (synthetic; no real observatory)",
});

export const SITE_B: Detector = detectorFromGeodetic({
  name: "site-b",
  degreesNorth: -20,
  degreesEast: 160,
  armBearingsDegrees: [75, 165],
  description: "invented L-shaped site at 20.0 S, 160.0 E (synthetic; no real observatory)",
});

/** Names accepted by {@link detectorByName}. */
export const DETECTOR_NAMES = ["site-a", "site-b"] as const;

/** The built-in invented detector with this name. */
export function detectorByName(name: string): Detector {
  if (name === "site-a") return SITE_A;
  if (name === "site-b") return SITE_B;
  throw new InputError(`unknown detector "${name}" (known: ${DETECTOR_NAMES.join(", ")})`);
}

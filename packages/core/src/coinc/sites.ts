import { readTextInput } from "../io/readTextInput.js";
import { InputError } from "../errors.js";
import { type Detector, type GeodeticSite, SITE_A, SITE_B, detectorFromGeodetic } from "../waveform/antenna.js";

/**
 * A detector site as data: where its vertex is on the Earth and where its arms point, plus the
 * Detector (vertex, arms, tensor) built from that by {@link detectorFromGeodetic}.
 */
export interface Site {
  readonly name: string;
  /** Geodetic angle north of the equator, degrees. */
  readonly degreesNorth: number;
  /** Angle east of the prime meridian, degrees. */
  readonly degreesEast: number;
  /** Height of the vertex above the WGS-84 ellipsoid, m. */
  readonly heightMetres: number;
  /** Bearings of the first and second arms, degrees clockwise from local north. */
  readonly armBearingsDegrees: readonly [number, number];
  readonly description?: string;
  /** "built-in", or the path of the sites file the site came from. */
  readonly origin: string;
  readonly detector: Detector;
}

/**
 * The invented built-in sites (synthetic; no real observatory). "site-a" and "site-b" are the
 * antenna module's SITE_A and SITE_B (the same Detector objects; the geodetic numbers restated
 * here are checked against them in the tests); "site-c" is a third invented site so that
 * three-site networks can be exercised.
 * - site-a: 52.0° N, 30.0° W, sea level, arms at bearings 30° and 120°.
 * - site-b: 20.0° S, 160.0° E, sea level, arms at bearings 75° and 165°.
 * - site-c: 12.0° S, 55.0° E (western Indian Ocean), sea level, arms at bearings 0° and 90°.
 */
export const BUILTIN_SITES: readonly Site[] = [
  {
    name: "site-a",
    degreesNorth: 52,
    degreesEast: -30,
    heightMetres: 0,
    armBearingsDegrees: [30, 120],
    description: SITE_A.description,
    origin: "built-in",
    detector: SITE_A,
  },
  {
    name: "site-b",
    degreesNorth: -20,
    degreesEast: 160,
    heightMetres: 0,
    armBearingsDegrees: [75, 165],
    description: SITE_B.description,
    origin: "built-in",
    detector: SITE_B,
  },
  siteFromGeodetic(
    {
      name: "site-c",
      degreesNorth: -12,
      degreesEast: 55,
      heightMetres: 0,
      armBearingsDegrees: [0, 90],
      description: "invented L-shaped site at 12.0 S, 55.0 E (synthetic; no real observatory)",
    },
    "built-in",
  ),
];

function siteFromGeodetic(g: GeodeticSite & { heightMetres: number }, origin: string): Site {
  return { ...g, origin, detector: detectorFromGeodetic(g) };
}

/** Fields a site entry of a sites file may hold (angles in degrees, height in metres). */
export const SITE_FILE_FIELDS = ["name", "degreesNorth", "degreesEast", "heightMetres", "armBearingsDegrees", "description"] as const;

/** The fields every site entry must have, for error messages. */
const REQUIRED_FIELDS = `"name", "degreesNorth", "degreesEast", "armBearingsDegrees": [first, second]`;

const NAME_PATTERN = /^[A-Za-z0-9][A-Za-z0-9_.-]*$/;

/**
 * Parses a sites file: a JSON array of `{"name", "degreesNorth", "degreesEast", "armBearingsDegrees":
 * [first, second]}` (geodetic position on the WGS-84 ellipsoid, degrees; the bearings of the two arms,
 * degrees clockwise from local north), with optional `"heightMetres"` (above the ellipsoid, default 0)
 * and `"description"`. Names are letters, digits, '-', '_' and '.' (so they fit `NAME=FILE` flags)
 * and must differ from each other and from the names in `reserved` (by default the built-in sites).
 * Every error is an InputError naming the file, the entry index and the field.
 */
export function parseSites(text: string, file: string, reserved: readonly Site[] = BUILTIN_SITES): Site[] {
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch (err) {
    throw new InputError(`${file}: not valid JSON (${String((err as Error).message).split("\n")[0]})`);
  }
  if (!Array.isArray(value)) throw new InputError(`${file}: expected a JSON array of sites, each {${REQUIRED_FIELDS}}`);
  if (value.length === 0) throw new InputError(`${file}: the array lists no sites`);
  const taken = new Map<string, string>(reserved.map((s) => [s.name, `the ${s.origin === "built-in" ? "built-in site" : `site from ${s.origin}`}`]));
  const out: Site[] = [];
  value.forEach((entry: unknown, i: number) => {
    const where = `${file}: entry ${i}`;
    if (entry === null || typeof entry !== "object" || Array.isArray(entry)) {
      throw new InputError(`${where}: must be an object {${REQUIRED_FIELDS}}`);
    }
    const rec = entry as Record<string, unknown>;
    for (const key of Object.keys(rec)) {
      if (!(SITE_FILE_FIELDS as readonly string[]).includes(key)) {
        throw new InputError(`${where}: unknown field "${key}" (expected ${SITE_FILE_FIELDS.join(", ")})`);
      }
    }
    const name = rec.name;
    if (typeof name !== "string" || !NAME_PATTERN.test(name)) {
      throw new InputError(`${where}: name must be a non-empty string of letters, digits, '-', '_' or '.' (got ${show(name)})`);
    }
    const clash = taken.get(name);
    if (clash !== undefined) throw new InputError(`${where}: name "${name}" is already used by ${clash}`);
    const check = (key: string, x: unknown, lo: number, hi: number, unit: string): number => {
      if (typeof x !== "number" || !Number.isFinite(x) || x < lo || x > hi) {
        throw new InputError(`${where}: ${key} must be a number in [${lo}, ${hi}] ${unit} (got ${show(x)})`);
      }
      return x;
    };
    const degreesNorth = check("degreesNorth", rec.degreesNorth, -90, 90, "degrees");
    const degreesEast = check("degreesEast", rec.degreesEast, -180, 360, "degrees");
    const heightMetres = rec.heightMetres === undefined ? 0 : check("heightMetres", rec.heightMetres, -11_000, 10_000, "metres");
    const arms = rec.armBearingsDegrees;
    if (!Array.isArray(arms) || arms.length !== 2) {
      throw new InputError(`${where}: armBearingsDegrees must be an array of two bearings in degrees, [first, second] (got ${show(arms)})`);
    }
    const first = check("armBearingsDegrees[0]", arms[0], -360, 360, "degrees");
    const second = check("armBearingsDegrees[1]", arms[1], -360, 360, "degrees");
    // Parallel (or anti-parallel) arms give a zero detector tensor: a site that sees nothing.
    const gap = (((second - first) % 180) + 180) % 180;
    if (Math.min(gap, 180 - gap) < 1e-6) {
      throw new InputError(`${where}: armBearingsDegrees must not point along one line (got ${first} and ${second})`);
    }
    const description = rec.description;
    if (description !== undefined && typeof description !== "string") {
      throw new InputError(`${where}: description must be a string (got ${show(description)})`);
    }
    taken.set(name, `entry ${i}`);
    out.push(siteFromGeodetic({ name, degreesNorth, degreesEast, heightMetres, armBearingsDegrees: [first, second], description }, file));
  });
  return out;
}

function show(x: unknown): string {
  if (x === undefined) return "nothing";
  const s = JSON.stringify(x);
  return s.length > 40 ? `${s.slice(0, 37)}...` : s;
}

/** Reads and parses a sites file (see {@link parseSites}). */
export function readSitesFile(path: string, reserved: readonly Site[] = BUILTIN_SITES): Site[] {
  return parseSites(readTextInput(path, "sites file"), path, reserved);
}

/** The sites a command can use: the built-in ones, followed by those of `sitesFile` when given. */
export function siteCatalogue(sitesFile?: string): Site[] {
  return sitesFile === undefined ? [...BUILTIN_SITES] : [...BUILTIN_SITES, ...readSitesFile(sitesFile)];
}

/** The site called `name` in `sites` (default the built-in ones); InputError if there is none. */
export function siteByName(name: string, sites: readonly Site[] = BUILTIN_SITES): Site {
  const s = sites.find((x) => x.name === name);
  if (s === undefined) throw new InputError(`unknown site "${name}" (known: ${sites.map((x) => x.name).join(", ")})`);
  return s;
}

import type { Command } from "commander";
import {
  AU,
  L_SUN,
  M_SUN,
  describeBinary,
  describeChirp,
  type BinaryDescription,
  type ChirpDescription,
} from "@chirpsieve/core";
import { UsageError } from "../errors.js";
import { formatDuration, formatLength, formatNumber, formatSi, parsePair, parsePlainNumber, parseQuantity } from "../units.js";

/** Raw flag values as commander hands them over (strings; parsed here so errors name the flag). */
interface SourceFlags {
  masses?: string;
  separation?: string;
  gwFrequency?: string;
  orbitalPeriod?: string;
  distance?: string;
  eccentricity?: string;
  inclination?: string;
  frequencyDerivative?: string;
  strain?: string;
  json?: boolean;
}

const ORBIT_FLAGS = [
  ["separation", "--separation"],
  ["gwFrequency", "--gw-frequency"],
  ["orbitalPeriod", "--orbital-period"],
] as const;

const ORBIT_LIST = "--separation, --gw-frequency or --orbital-period";

/** Registers `chirpsieve source`: describe a binary (forward form) or read a chirp (inverse form). */
export function registerSource(program: Command): void {
  program
    .command("source")
    .description(
      "Describe a compact binary at leading (quadrupole) order: orbit, GW frequency, strain, luminosity, " +
        "frequency derivative, decay and time to coalescence. Forward form: --masses with one of " +
        "--separation, --gw-frequency, --orbital-period. Inverse form: --gw-frequency with " +
        "--frequency-derivative [--strain] gives the chirp mass [and distance].",
    )
    .option("--masses <m1,m2>", "component masses, solar masses (e.g. 1.4,1.4 or 10Msun,1.4Msun)")
    .option("--separation <length>", "orbital separation (m, km, AU, pc, kpc, Mpc, Gpc, ly; bare number = m)")
    .option("--gw-frequency <freq>", "GW frequency, twice the orbital frequency (Hz, mHz, kHz, uHz, nHz)")
    .option("--orbital-period <time>", "orbital period (s, ms, min, h, d, yr, Myr, Gyr; bare number = s)")
    .option("--distance <length>", "distance to the source, for the strain amplitude (e.g. 10pc, 410Mpc)")
    .option("--eccentricity <e>", "orbital eccentricity in [0, 1); affects only the orbital-period decay rate")
    .option("--inclination <angle>", "inclination with unit (e.g. 30deg, 0.5rad); adds h+ and h× (needs --distance)")
    .option("--frequency-derivative <Hz/s>", "inverse form: measured GW frequency derivative, Hz/s")
    .option("--strain <h>", "inverse form: measured optimally oriented strain amplitude (dimensionless)")
    .option("--json", "print one JSON object (SI units unless the key names another)")
    .addHelpText(
      "after",
      "\nExamples (synthetic):\n" +
        "  chirpsieve source --masses 1,1 --separation 50AU --distance 10pc\n" +
        "  chirpsieve source --masses 1.4,1.4 --gw-frequency 10Hz --distance 40Mpc --json\n" +
        "  chirpsieve source --gw-frequency 35Hz --frequency-derivative 80 --strain 1e-21\n",
    )
    .action((flags: SourceFlags) => {
      const out = isInverse(flags) ? runInverse(flags) : runForward(flags);
      process.stdout.write(out);
    });
}

function isInverse(f: SourceFlags): boolean {
  return f.frequencyDerivative !== undefined || f.strain !== undefined;
}

/** Throws when `flag` is set together with the inverse form's `inverseFlag`. */
function forbidWithInverse(f: SourceFlags, inverseFlag: string): void {
  const clash: [unknown, string][] = [
    [f.masses, "--masses"],
    [f.separation, "--separation"],
    [f.orbitalPeriod, "--orbital-period"],
    [f.distance, "--distance"],
    [f.eccentricity, "--eccentricity"],
    [f.inclination, "--inclination"],
  ];
  for (const [value, flag] of clash) {
    if (value !== undefined) {
      throw new UsageError(
        `${flag} cannot be combined with ${inverseFlag}: the inverse form takes only --gw-frequency, --frequency-derivative and --strain`,
      );
    }
  }
}

// ---------------- forward form ----------------

function runForward(f: SourceFlags): string {
  const orbit = ORBIT_FLAGS.filter(([key]) => f[key] !== undefined);
  if (f.masses === undefined) {
    throw new UsageError(
      `give --masses with one of ${ORBIT_LIST} (or --gw-frequency with --frequency-derivative for the inverse form)`,
    );
  }
  if (orbit.length === 0) throw new UsageError(`--masses needs one of ${ORBIT_LIST}`);
  if (orbit.length > 1) {
    throw new UsageError(`${orbit.map(([, flag]) => flag).join(" and ")} conflict: give only one of ${ORBIT_LIST}`);
  }
  if (f.inclination !== undefined && f.distance === undefined) throw new UsageError("--inclination needs --distance");

  const [m1, m2] = parsePair("--masses", f.masses, "mass", "1.4,1.4");
  const d = describeBinary({
    m1,
    m2,
    separation: f.separation !== undefined ? parseQuantity("--separation", f.separation, "length") : undefined,
    gwFrequency: f.gwFrequency !== undefined ? parseQuantity("--gw-frequency", f.gwFrequency, "frequency") : undefined,
    orbitalPeriod:
      f.orbitalPeriod !== undefined ? parseQuantity("--orbital-period", f.orbitalPeriod, "time") : undefined,
    distance: f.distance !== undefined ? parseQuantity("--distance", f.distance, "length") : undefined,
    eccentricity:
      f.eccentricity !== undefined
        ? parsePlainNumber("--eccentricity", f.eccentricity, { min: 0, max: 1, maxInclusive: false })
        : undefined,
    inclination:
      f.inclination !== undefined ? parseQuantity("--inclination", f.inclination, "angle", { sign: "any" }) : undefined,
  });
  const notes = forwardNotes(d);
  return f.json ? `${JSON.stringify(forwardJson(d, notes), null, 2)}\n` : forwardTable(d, notes);
}

function forwardNotes(d: BinaryDescription): string[] {
  const notes: string[] = [];
  if (d.insideIsco) {
    notes.push(
      `the separation ${formatLength(d.separation)} is inside the ISCO of the total mass (${formatLength(d.iscoSeparation)}): ` +
        "no inspiral is left, so decay, luminosity, chirp and strain are not given",
    );
  }
  if (d.eccentricity > 0) {
    notes.push(
      `eccentricity ${formatNumber(d.eccentricity)} enters only the orbital-period decay rate ` +
        `(Peters-Mathews factor f(e) = ${formatNumber(d.eccentricityEnhancement)}); everything else assumes a circular orbit`,
    );
  }
  if (d.strainAmplitude !== null && d.strainPlus === null) {
    notes.push("strain amplitude h0 is for an optimally oriented (face-on) source; add --inclination for h+ and hx");
  }
  notes.push("leading-order (Newtonian quadrupole) point-mass physics; coalescence time from GW emission alone");
  return notes;
}

function forwardJson(d: BinaryDescription, notes: string[]): Record<string, unknown> {
  const o: Record<string, unknown> = {
    form: "binary",
    massesSolar: [d.m1 / M_SUN, d.m2 / M_SUN],
    totalMassSolar: d.totalMass / M_SUN,
    chirpMassSolar: d.chirpMass / M_SUN,
    symmetricMassRatio: d.symmetricMassRatio,
    massRatio: d.massRatio,
    separationMeters: d.separation,
    orbitalPeriodSeconds: d.orbitalPeriod,
    orbitalFrequencyHz: d.orbitalFrequency,
    gwFrequencyHz: d.gwFrequency,
    gwPeriodSeconds: d.gwPeriod,
    eccentricity: d.eccentricity,
    eccentricityEnhancement: d.eccentricityEnhancement,
    insideIsco: d.insideIsco,
    iscoSeparationMeters: d.iscoSeparation,
    iscoGwFrequencyHz: d.iscoGwFrequency,
    frequencyDerivativeHzPerSecond: d.frequencyDerivative,
    timeToCoalescenceSeconds: d.timeToCoalescence,
    luminosityWatts: d.luminosity,
    separationDecayRateMetersPerSecond: d.separationDecayRate,
    orbitalPeriodDerivative: d.orbitalPeriodDerivative,
  };
  if (d.distance !== null) {
    o.distanceMeters = d.distance;
    o.strainAmplitude = d.strainAmplitude;
  }
  if (d.inclination !== null) {
    o.inclinationRadians = d.inclination;
    o.strainPlus = d.strainPlus;
    o.strainCross = d.strainCross;
  }
  o.notes = notes;
  return o;
}

/** Rows of [label, human value, SI value]; a null row is a section heading in the label. */
type Row = [string, string, string];

function renderTable(title: string, sections: [string, Row[]][], notes: string[]): string {
  const all = sections.flatMap(([, rows]) => rows);
  const w0 = Math.max(...all.map((r) => r[0].length));
  const w1 = Math.max(...all.map((r) => r[1].length));
  const lines = [title];
  for (const [heading, rows] of sections) {
    if (rows.length === 0) continue;
    lines.push("", heading);
    for (const [a, b, c] of rows) lines.push(`  ${a.padEnd(w0)}   ${b.padEnd(w1)}   ${c}`.trimEnd());
  }
  if (notes.length) {
    lines.push("", "Notes");
    for (const n of notes) lines.push(`  - ${n}`);
  }
  return `${lines.join("\n")}\n`;
}

function forwardTable(d: BinaryDescription, notes: string[]): string {
  const m = (kg: number): string => `${formatNumber(kg / M_SUN)} M_sun`;
  const masses: Row[] = [
    ["component masses", `${formatNumber(d.m1 / M_SUN)} + ${formatNumber(d.m2 / M_SUN)} M_sun`, ""],
    ["total mass", m(d.totalMass), formatSi(d.totalMass, "kg")],
    ["chirp mass", m(d.chirpMass), formatSi(d.chirpMass, "kg")],
    ["symmetric mass ratio", formatNumber(d.symmetricMassRatio), ""],
    ["mass ratio m2/m1", formatNumber(d.massRatio), ""],
  ];
  const orbit: Row[] = [
    [d.eccentricity > 0 ? "semi-major axis" : "separation", formatLength(d.separation), formatSi(d.separation, "m")],
    ["orbital period", formatDuration(d.orbitalPeriod), formatSi(d.orbitalPeriod, "s")],
    ["orbital frequency", "", formatSi(d.orbitalFrequency, "Hz")],
    ["GW frequency (2 x orbital)", "", formatSi(d.gwFrequency, "Hz")],
    ["GW period", formatDuration(d.gwPeriod), formatSi(d.gwPeriod, "s")],
  ];
  if (d.eccentricity > 0) orbit.push(["eccentricity", formatNumber(d.eccentricity), ""]);
  const signal: Row[] = [];
  if (d.distance !== null) {
    signal.push(["distance", formatLength(d.distance), formatSi(d.distance, "m")]);
    if (d.strainAmplitude !== null) {
      signal.push(["strain amplitude h0 (face-on)", "", formatNumber(d.strainAmplitude)]);
    }
    if (d.strainPlus !== null && d.strainCross !== null && d.inclination !== null) {
      signal.push(["inclination", `${formatNumber((d.inclination * 180) / Math.PI)} deg`, formatSi(d.inclination, "rad")]);
      signal.push(["strain amplitude h+", "", formatNumber(d.strainPlus)]);
      signal.push(["strain amplitude hx", "", formatNumber(d.strainCross)]);
    }
  }
  const evolution: Row[] = [];
  if (d.luminosity !== null) evolution.push(["GW luminosity", `${formatNumber(d.luminosity / L_SUN)} L_sun`, formatSi(d.luminosity, "W")]);
  if (d.frequencyDerivative !== null) evolution.push(["GW frequency derivative", "", formatSi(d.frequencyDerivative, "Hz/s")]);
  if (d.separationDecayRate !== null) {
    const auPerYr = (d.separationDecayRate * 365.25 * 86_400) / AU;
    evolution.push(["separation decay rate", `${formatNumber(auPerYr)} AU/yr`, formatSi(d.separationDecayRate, "m/s")]);
  }
  if (d.orbitalPeriodDerivative !== null) {
    const label = d.eccentricity > 0 ? "orbital period derivative (with f(e))" : "orbital period derivative";
    evolution.push([label, "", formatSi(d.orbitalPeriodDerivative, "s/s")]);
  }
  if (d.timeToCoalescence !== null) {
    evolution.push(["time to coalescence", formatDuration(d.timeToCoalescence), formatSi(d.timeToCoalescence, "s")]);
  }
  const limits: Row[] = [
    ["ISCO separation (6GM/c^2)", formatLength(d.iscoSeparation), formatSi(d.iscoSeparation, "m")],
    ["ISCO GW frequency", "", formatSi(d.iscoGwFrequency, "Hz")],
  ];
  const title = `Binary source: ${formatNumber(d.m1 / M_SUN)} + ${formatNumber(d.m2 / M_SUN)} M_sun, ${
    d.insideIsco ? "separation inside the ISCO" : d.eccentricity > 0 ? "eccentric orbit" : "circular orbit"
  } (leading-order quadrupole physics)`;
  return renderTable(
    title,
    [
      ["Masses", masses],
      ["Orbit", orbit],
      [d.distance !== null ? "Signal at the distance given" : "Signal", signal],
      ["Evolution by GW emission", evolution],
      ["Limits", limits],
    ],
    notes,
  );
}

// ---------------- inverse form ----------------

function runInverse(f: SourceFlags): string {
  const inverseFlag = f.frequencyDerivative !== undefined ? "--frequency-derivative" : "--strain";
  forbidWithInverse(f, inverseFlag);
  if (f.frequencyDerivative === undefined) throw new UsageError("--strain needs --frequency-derivative and --gw-frequency");
  if (f.gwFrequency === undefined) throw new UsageError("--frequency-derivative needs --gw-frequency");
  const c = describeChirp({
    gwFrequency: parseQuantity("--gw-frequency", f.gwFrequency, "frequency"),
    frequencyDerivative: parseQuantity("--frequency-derivative", f.frequencyDerivative, "frequencyDerivative"),
    strain: f.strain !== undefined ? parseStrain(f.strain) : undefined,
  });
  const notes = inverseNotes(c);
  return f.json ? `${JSON.stringify(inverseJson(c, notes), null, 2)}\n` : inverseTable(c, notes);
}

function parseStrain(text: string): number {
  const m = /^\s*[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?\s*$/.exec(text);
  const h = m ? Number(text) : NaN;
  if (!Number.isFinite(h) || !(h > 0)) {
    throw new UsageError(`--strain: must be a positive dimensionless number, e.g. 1e-21 (got "${text}")`);
  }
  return h;
}

function inverseNotes(c: ChirpDescription): string[] {
  const notes = [
    "chirp mass from (f, fdot) at leading order; for a distant source it is the redshifted (detector-frame) chirp mass",
  ];
  if (c.luminosityDistance !== null) {
    notes.push("distance assumes an optimally oriented source; any other orientation puts it closer, so this is an upper bound");
  }
  if (c.beyondIsco) {
    notes.push(
      `the GW frequency is above ${formatSi(c.maxIscoGwFrequency, "Hz")}, the highest ISCO frequency of any binary with this chirp mass: ` +
        "the leading-order inspiral does not apply there",
    );
  }
  return notes;
}

function inverseJson(c: ChirpDescription, notes: string[]): Record<string, unknown> {
  const o: Record<string, unknown> = {
    form: "chirp",
    gwFrequencyHz: c.gwFrequency,
    frequencyDerivativeHzPerSecond: c.frequencyDerivative,
    chirpMassSolar: c.chirpMass / M_SUN,
    timeToCoalescenceSeconds: c.timeToCoalescence,
    maxIscoGwFrequencyHz: c.maxIscoGwFrequency,
    beyondIsco: c.beyondIsco,
  };
  if (c.strain !== null) {
    o.strainAmplitude = c.strain;
    o.luminosityDistanceMeters = c.luminosityDistance;
  }
  o.notes = notes;
  return o;
}

function inverseTable(c: ChirpDescription, notes: string[]): string {
  const rows: Row[] = [
    ["GW frequency", "", formatSi(c.gwFrequency, "Hz")],
    ["GW frequency derivative", "", formatSi(c.frequencyDerivative, "Hz/s")],
  ];
  if (c.strain !== null) rows.push(["strain amplitude h0", "", formatNumber(c.strain)]);
  const derived: Row[] = [
    ["chirp mass", `${formatNumber(c.chirpMass / M_SUN)} M_sun`, formatSi(c.chirpMass, "kg")],
    ["time to coalescence", formatDuration(c.timeToCoalescence), formatSi(c.timeToCoalescence, "s")],
  ];
  if (c.luminosityDistance !== null) {
    derived.push(["luminosity distance", formatLength(c.luminosityDistance), formatSi(c.luminosityDistance, "m")]);
  }
  return renderTable(
    "Chirp: what a leading-order (f, fdot) measurement says about its source",
    [
      ["Measured", rows],
      ["Derived", derived],
    ],
    notes,
  );
}

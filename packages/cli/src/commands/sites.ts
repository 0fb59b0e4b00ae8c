import type { Command } from "commander";
import { interSiteDelays, siteCatalogue, type Site } from "@chirpsieve/core";

interface SitesFlags {
  sites?: string;
  json?: boolean;
}

/** Registers `chirpsieve sites`: list the built-in and user-defined detector sites. */
export function registerSites(program: Command): void {
  program
    .command("sites")
    .description(
      "List the detector sites: the built-in invented ones (synthetic; no real observatory) and those of a " +
        "sites file, with their positions, arm bearings and the light-travel time between each pair.",
    )
    .option(
      "--sites <file>",
      'add the sites of a JSON file: an array of {"name", "degreesNorth", "degreesEast", "armBearingsDegrees": [first, second]} ' +
        '(arm bearings clockwise from north), optional "heightMetres" and "description"',
    )
    .option("--json", "print one JSON object (angles in degrees, heights in metres, times in seconds)")
    .addHelpText("after", "\nExamples:\n  chirpsieve sites\n  chirpsieve sites --sites my-sites.json --json\n")
    .action((flags: SitesFlags) => {
      const sites = siteCatalogue(flags.sites);
      process.stdout.write(flags.json ? formatJson(sites) : formatTable(sites));
    });
}

function formatJson(sites: Site[]): string {
  const out = {
    sites: sites.map((s) => ({
      name: s.name,
      degreesNorth: s.degreesNorth,
      degreesEast: s.degreesEast,
      heightMetres: s.heightMetres,
      armBearingsDegrees: s.armBearingsDegrees,
      ...(s.description === undefined ? {} : { description: s.description }),
      origin: s.origin,
    })),
    interSiteDelays: interSiteDelays(sites.map((s) => s.detector)),
  };
  return `${JSON.stringify(out, null, 2)}\n`;
}

function formatTable(sites: Site[]): string {
  const angle = (x: number, pos: string, neg: string) => `${Math.abs(x).toFixed(3)} ${x < 0 ? neg : pos}`;
  const rows = [
    ["name", "north/south", "east/west", "height", "first arm", "second arm", "origin"],
    ...sites.map((s) => [
      s.name,
      angle(s.degreesNorth, "N", "S"),
      angle(s.degreesEast > 180 ? s.degreesEast - 360 : s.degreesEast, "E", "W"),
      `${s.heightMetres} m`,
      `${s.armBearingsDegrees[0]} deg`,
      `${s.armBearingsDegrees[1]} deg`,
      s.origin,
    ]),
  ];
  const widths = rows[0].map((_, c) => Math.max(...rows.map((r) => r[c].length)));
  const line = (r: string[]) => r.map((x, c) => (c === 0 || c === r.length - 1 ? x.padEnd(widths[c]) : x.padStart(widths[c]))).join("  ").trimEnd();
  const out = ["Detector sites (built-in ones are invented: synthetic, no real observatory)", "", ...rows.map(line), ""];
  out.push("Arm bearings are measured clockwise from local north (90 deg = east).", "", "Light-travel time between sites:");
  const pairs = interSiteDelays(sites.map((s) => s.detector));
  const nameWidth = Math.max(...pairs.map((p) => `${p.sites[0]} - ${p.sites[1]}`.length));
  for (const p of pairs) out.push(`  ${`${p.sites[0]} - ${p.sites[1]}`.padEnd(nameWidth)}  ${(p.seconds * 1000).toFixed(3)} ms`);
  return `${out.join("\n")}\n`;
}

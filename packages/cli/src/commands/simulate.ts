import type { Command } from "commander";
import {
  type Injection,
  InputError,
  planSimulationSites,
  simulateSiteStrain,
  simulationRunId,
  type SimulationSettings,
  writeFileSet,
  chirpMass,
  checkTimeBaseParameters,
  siteByName,
  siteCatalogue,
  type Detector,
  drawInjections,
  injectionManifest,
  optimalSnr,
  psdModelFromSpec,
  readInjectionFile,
  strainFormatOf,
  unsearchableEdges,
  writeInjectionManifest,
  writeStrain,
} from "@chirpsieve/core";
import { UsageError } from "../errors.js";
import { checkFilePlan, noiseCurveInput } from "../outputPath.js";
import { VERSION } from "../version.js";
import { parseNumberFlag, parseRateFlag, parseRangeFlag } from "../options.js";
import { DEFAULT_PSD_SEGMENT_SECONDS } from "../searchFlags.js";
import { SPIN_RANGE_HELP, parseSpinRangeFlag } from "../spinRange.js";

interface SimulateFlags {
  noiseCurve: string;
  duration?: string;
  rate: string;
  seed: string;
  out?: string;
  start: string;
  fmin: string;
  inject?: string;
  injectRandom?: string;
  massRange?: string;
  spinRange?: string;
  snrRange?: string;
  distanceRange?: string;
  edgeMargin?: string;
  detector: string;
  noise: boolean;
  label?: string;
  manifest?: string;
  sites?: string;
}

/** Registers `chirpsieve simulate`: seeded coloured noise plus TaylorT4 inspiral injections. */
export function registerSimulate(program: Command): void {
  program
    .command("simulate")
    .description(
      "Write synthetic strain: seeded Gaussian noise coloured by an analytic noise curve plus time-domain " +
        "(TaylorT4) inspiral injections projected onto an invented detector, with a JSON manifest of what was injected.",
    )
    .option("--noise-curve <name|file>", "noise curve: dis2001, ajith2011, flat, flat:LEVEL or a two-column table file", "ajith2011")
    .option("--duration <s>", "length of the series in seconds (required)")
    .option("--rate <Hz>", "sample rate", "4096")
    .option("--seed <text>", "seed of the noise and of random injections (same seed, same bytes)", "0")
    .option("--out <file>", "output strain file (.f32/.f64 with a .json sidecar, .txt/.csv, .h5) (required)")
    .option("--start <s>", "time of the first sample, seconds", "0")
    .option("--fmin <Hz>", "GW frequency where injected chirps start (and of the SNR integral)", "20")
    .option("--inject <file>", "injections to add: a JSON array, or an object with an \"injections\" array")
    .option(
      "--inject-random <N>",
      "add N random injections (masses, sky, orientation and times drawn from the seed); their coalescence times " +
        "keep clear of the start and end that a scan with the same --fmin and --mass-range cannot search (see --edge-margin)",
    )
    .option("--mass-range <min:max>", "component masses of random injections, M_sun", "1:3")
    .option("--spin-range <min:max>", SPIN_RANGE_HELP)
    .option(
      "--snr-range <min:max>",
      "optimal SNR range of random injections (distance scaled to hit it); with several --detector sites this is the " +
        "network SNR, the quadrature sum of the sites' optimal SNRs, each site at the same distance",
    )
    .option(
      "--edge-margin <s>",
      `seconds at each end kept clear of random coalescence times (default: the longest template of --mass-range from --fmin ` +
        `plus a scan's ${DEFAULT_PSD_SEGMENT_SECONDS} s inverse-PSD filter and 0.1 s at the start, the filter and 0.1 s at the end)`,
    )
    .option("--distance-range <min:max>", "distance range of random injections, Mpc (uniform in volume)")
    .option("--detector <names>", "site(s) the signals are projected onto: one name, or a comma-separated list for one file per site (built-in invented sites, or from --sites)", "site-a")
    .option("--sites <file>", "JSON file of extra site definitions (see `chirpsieve sites`)")
    .option("--no-noise", "write the injected signals alone, without noise")
    .option("--label <text>", "label stored with the strain")
    .option("--manifest <file>", "where to write the injection manifest (default <out>.injections.json)")
    .action(async (flags: SimulateFlags, cmd: Command) => {
      await runSimulate(flags, cmd);
    });
}


/** True when the user typed this option (not just its default). */
function given(cmd: Command, name: string): boolean {
  return cmd.getOptionValueSource(name) === "cli";
}

async function runSimulate(flags: SimulateFlags, cmd: Command): Promise<void> {
  if (flags.duration === undefined) throw new UsageError("--duration: required (seconds of data to simulate)");
  if (flags.out === undefined) throw new UsageError("--out: required (the strain file to write)");
  const duration = parseNumberFlag("--duration", flags.duration, { min: 0, minExclusive: true });
  const rate = parseRateFlag("--rate", flags.rate);
  const start = parseNumberFlag("--start", flags.start);
  const fmin = parseNumberFlag("--fmin", flags.fmin, { min: 0, minExclusive: true });
  if (fmin >= rate / 2) throw new UsageError(`--fmin: must be below the Nyquist frequency ${rate / 2} Hz (got ${flags.fmin})`);
  const samples = Math.round(duration * rate);
  // One series is held in memory while it is written: keep it within what a typed array and this
  // machine can hold (2^30 samples is 72 h at 4096 Hz).
  if (samples > 2 ** 30) throw new UsageError(`--duration: ${flags.duration} s at ${flags.rate} Hz is ${samples.toExponential(2)} samples; at most 2^30 per file`);
  if (Math.abs(samples - duration * rate) > 1e-6 * Math.max(1, samples)) {
    throw new UsageError(`--duration: ${flags.duration} s at ${flags.rate} Hz is not a whole number of samples`);
  }
  // Times whose float64 spacing is coarser than a 16th of a sample step would collapse: refuse them now.
  checkTimeBaseParameters(rate, start, samples);
  if (flags.seed.trim() === "") throw new UsageError("--seed: must not be empty");
  const seed: string | number = /^-?\d+$/.test(flags.seed) && Number.isSafeInteger(Number(flags.seed)) ? Number(flags.seed) : flags.seed;
  if (flags.label !== undefined && /[\r\n]/.test(flags.label)) throw new UsageError("--label: must be one line");
  let psd;
  try {
    psd = psdModelFromSpec(flags.noiseCurve);
  } catch (err) {
    if (err instanceof InputError) throw new UsageError(`--noise-curve: ${err.message}`);
    throw err;
  }
  const names = flags.detector.split(",").map((n) => n.trim());
  if (names.some((n) => n === "") || new Set(names).size !== names.length) {
    throw new UsageError(`--detector: expected a name or a comma-separated list of distinct names (got "${flags.detector}")`);
  }
  let detectors: Detector[];
  try {
    const catalogue = siteCatalogue(flags.sites);
    detectors = names.map((n) => siteByName(n, catalogue).detector);
  } catch (err) {
    if (err instanceof InputError) throw new UsageError(`--detector: ${err.message}`);
    throw err;
  }
  // With several sites, each gets its own file: sim.f32 -> sim.site-a.f32 (and its own manifest).
  const multi = detectors.length > 1;
  if (multi && flags.manifest !== undefined) throw new UsageError("--manifest: with several sites each file gets <file>.injections.json");
  const detector = detectors[0];
  let format;
  try {
    format = strainFormatOf(flags.out);
  } catch (err) {
    if (err instanceof InputError) throw new UsageError(`--out: ${err.message}`);
    throw err;
  }
  const outputs = detectors.map((d) => {
    const out = multi ? siteFileName(flags.out!, d.name) : flags.out!;
    return { detector: d, out, manifest: multi ? `${out}.injections.json` : (flags.manifest ?? `${out}.injections.json`) };
  });
  const raw = format === "f32" || format === "f64";
  checkFilePlan({
    inputs: [
      ...(flags.inject ? [{ flag: "--inject", path: flags.inject }] : []),
      ...noiseCurveInput("--noise-curve", flags.noiseCurve),
      ...(flags.sites ? [{ flag: "--sites", path: flags.sites }] : []),
    ],
    outputs: outputs.flatMap((o) => [
      { flag: "--out", path: o.out },
      ...(raw ? [{ flag: "--out", path: `${o.out}.json` }] : []),
      { flag: "--manifest", path: o.manifest },
    ]),
  });

  const random = flags.injectRandom !== undefined;
  if (random && flags.inject !== undefined) throw new UsageError("--inject-random: cannot be combined with --inject");
  for (const name of ["massRange", "spinRange", "snrRange", "distanceRange", "edgeMargin"] as const) {
    if (!random && given(cmd, name)) {
      const flag = `--${name.replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`)}`;
      throw new UsageError(`${flag}: only applies with --inject-random`);
    }
  }

  let injections: Injection[] = [];
  let edgeNote: string | undefined;
  let spinRange: [number, number] | undefined;
  if (flags.inject !== undefined) {
    injections = readInjectionFile(flags.inject);
    // An injection that coalesces outside the data could never be recovered from it: refuse it.
    const outside = injections.findIndex((inj) => !(inj.coalescenceTime >= start && inj.coalescenceTime <= start + duration));
    if (outside >= 0) {
      throw new UsageError(
        `--inject: ${flags.inject}: injection ${outside} coalesces at ${injections[outside].coalescenceTime}, outside the simulated data ` +
          `(${start} to ${start + duration}; set --start and --duration to cover it)`,
      );
    }
    injections.forEach((inj, i) => {
      try {
        inj.optimalSnr = optimalSnr(inj, psd, rate, fmin, detector);
      } catch (err) {
        if (err instanceof InputError) throw new InputError(`${flags.inject}: injection ${i}: ${err.message}`);
        throw err;
      }
    });
  } else if (random) {
    const count = parseNumberFlag("--inject-random", flags.injectRandom!, { min: 0, integer: true });
    const massRangeSolar = parseRangeFlag("--mass-range", flags.massRange ?? "1:3");
    spinRange = flags.spinRange === undefined ? undefined : parseSpinRangeFlag("--spin-range", flags.spinRange);
    if (flags.snrRange !== undefined && flags.distanceRange !== undefined) {
      throw new UsageError("--snr-range: give either --snr-range or --distance-range, not both");
    }
    if (flags.snrRange === undefined && flags.distanceRange === undefined) {
      throw new UsageError("--inject-random: needs --snr-range MIN:MAX or --distance-range MIN:MAX");
    }
    const snrRange = flags.snrRange === undefined ? undefined : parseRangeFlag("--snr-range", flags.snrRange);
    const distanceMpc = flags.distanceRange === undefined ? undefined : parseRangeFlag("--distance-range", flags.distanceRange);
    // Keep coalescences where a scan of this file can find them (or where --edge-margin says).
    const edges = flags.edgeMargin !== undefined
      ? (() => {
          const m = parseNumberFlag("--edge-margin", flags.edgeMargin, { min: 0 });
          return { leadInSeconds: m, tailSeconds: m };
        })()
      : unsearchableEdges(massRangeSolar, fmin, DEFAULT_PSD_SEGMENT_SECONDS);
    edgeNote =
      `random coalescence times kept clear of the first ${edges.leadInSeconds.toFixed(1)} s and the last ${edges.tailSeconds.toFixed(1)} s` +
      (flags.edgeMargin !== undefined
        ? " (--edge-margin)"
        : ` (what a scan from ${fmin} Hz over ${massRangeSolar.join(":")} M_sun with a ${DEFAULT_PSD_SEGMENT_SECONDS} s PSD filter cannot search; --edge-margin sets it)`);
    try {
      injections = drawInjections({
        ...edges,
        ...(multi ? { detectors } : {}),
        count,
        massRangeSolar,
        ...(spinRange ? { spinRange } : {}),
        snrRange,
        distanceMpc,
        seed: `${seed}:injections`,
        startTime: start,
        duration,
        fMinHz: fmin,
        psd,
        sampleRate: rate,
        detector,
      });
    } catch (err) {
      // An error on one parameter names its own flag (parameterFlags.ts); others concern the draw.
      if (err instanceof InputError && err.parameter === undefined) {
        const hint = flags.edgeMargin === undefined && /kept clear/.test(err.message) ? " (or set --edge-margin)" : "";
        throw new UsageError(`--inject-random: ${err.message}${hint}`);
      }
      throw err;
    }
  }

  const settings: SimulationSettings = { psd, sampleRate: rate, startTime: start, duration, fMinHz: fmin, seed, noise: flags.noise };
  const sites = planSimulationSites(settings, detectors, injections, random);
  const run = {
    id: simulationRunId(settings, detectors.map((d) => d.name), injections, { version: VERSION, label: flags.label ?? null }),
    sites: detectors.map((d) => d.name),
  };
  const lines: string[] = [];
  if (edgeNote) lines.push(edgeNote);
  // Every file of every site is staged first and renamed into place together (writeFileSet): a kill
  // leaves the whole old set or the whole new one.
  await writeFileSet(flags.out, async (staged) => {
    for (const [oi, o] of outputs.entries()) {
      const siteInjections = sites[oi].injections;
      // Held once, as float32 when the file is float32, to keep memory down.
      const data = simulateSiteStrain(settings, sites[oi], format === "f32");
      await writeStrain(
        staged(o.out),
        { data, sampleRate: rate, startTime: start, label: flags.label ?? `synthetic ${o.detector.name}`, units: "strain", run },
        { format, sidecarPath: raw ? staged(`${o.out}.json`) : undefined },
      );
      writeInjectionManifest(
        staged(o.manifest),
        injectionManifest(
          {
            noiseCurve: psd.name,
            noise: flags.noise,
            sampleRate: rate,
            startTime: start,
            duration,
            fMinHz: fmin,
            seed,
            detector: o.detector.name,
            ...(spinRange ? { spinRange } : {}),
          },
          siteInjections,
        ),
      );
      lines.push(
        `wrote ${o.out}: ${duration} s at ${rate} Hz, ${flags.noise ? `${psd.name} noise` : "no noise"}, ` +
          `${siteInjections.length} injection${siteInjections.length === 1 ? "" : "s"} on ${o.detector.name} (synthetic data)`,
        `manifest ${o.manifest}`,
      );
      for (const inj of siteInjections) {
        lines.push(
          `  t_c ${inj.coalescenceTime.toFixed(4)} s  ${inj.primaryMassSolar.toFixed(3)}+${inj.secondaryMassSolar.toFixed(3)} M_sun ` +
            `(chirp mass ${chirpMass(inj.primaryMassSolar, inj.secondaryMassSolar).toFixed(4)})  ${inj.distanceMpc.toPrecision(4)} Mpc  ` +
            `optimal SNR ${(inj.optimalSnr ?? Number.NaN).toFixed(2)}${inj.networkOptimalSnr !== undefined ? ` (network ${inj.networkOptimalSnr.toFixed(2)})` : ""}` +
            (inj.primarySpin !== undefined || inj.secondarySpin !== undefined
              ? `  spins ${(inj.primarySpin ?? 0).toFixed(3)}, ${(inj.secondarySpin ?? 0).toFixed(3)}`
              : ""),
        );
      }
    }
  });
  process.stdout.write(`${lines.join("\n")}\n`);
}

/** `sim.f32` + `site-a` → `sim.site-a.f32` (the site name goes before the extension). */
function siteFileName(path: string, site: string): string {
  const m = path.match(/^(.*?)(\.[^./\\]+)$/);
  return m ? `${m[1]}.${site}${m[2]}` : `${path}.${site}`;
}

import type { Command } from "commander";
import {
  isDimensionlessStrain,
  formatPsdTable,
  horizonDistance,
  InputError,
  readStrain,
  validDataPsd,
  writeFileAtomic,
  type HorizonResult,
  type StrainSeries,
  type WelchPsd,
} from "@chirpsieve/core";
import { UsageError } from "../errors.js";
import { checkFilePlan, strainInputs } from "../outputPath.js";
import { parseChoiceFlag, parseNumberFlag, parseRateFlag } from "../options.js";
import { nonStrainInputs, printStrainWarnings } from "../strainInputs.js";

interface PsdFlags {
  segment: string;
  average: string;
  fmin?: string;
  out?: string;
  json?: boolean;
  plot?: string;
  rate?: string;
  start?: string;
  dataset?: string;
  skipBadData?: boolean;
}

/** A bad stretch left out of the estimate, in the file's time base (s). */
interface SkippedStretch {
  startTime: number;
  endTime: number;
  reason: string;
}

/** Component masses (M_sun) of the reference binary whose horizon is reported. */
const REFERENCE_MASS_SOLAR = 1.4;
/** Default low-frequency limit of the horizon integral (Hz). */
const DEFAULT_FMIN_HZ = 20;

/** Registers `chirpsieve psd <strain-file>`: Welch PSD estimate, horizon distance, CSV/JSON/SVG. */
export function registerPsd(program: Command): void {
  program
    .command("psd")
    .description(
      "Estimate the noise power spectral density of a strain file (Welch's method, Hann window, 50% overlap) " +
        "and the distance to which a 1.4+1.4 M_sun inspiral would be seen at SNR 8.",
    )
    .argument("<strain-file>", "strain file (.f32/.f64 with a .json sidecar, .txt/.dat/.csv, .h5/.hdf5)")
    .option("--segment <s>", "Welch segment length (s, rounded up to a power of two samples)", "4")
    .option("--average <kind>", "how segments are averaged: median (bias-corrected) or mean", "median")
    .option("--fmin <Hz>", `low-frequency limit of the horizon integral (Hz; default ${DEFAULT_FMIN_HZ}, or the first bin if higher)`)
    .option("--out <file>", "write the PSD as CSV (frequency_hz,psd_per_hz; DC bin left out)")
    .option("--json", "print the estimate and the horizon as JSON")
    .option("--plot <file>", "write an SVG log–log plot of the amplitude spectral density")
    .option("--rate <Hz>", "sample rate for one-column text files or HDF5 files without one")
    .option("--start <s>", "start time for one-column text files or HDF5 files without one")
    .option("--dataset <path>", "HDF5 dataset holding the strain")
    .option("--skip-bad-data", "leave out (and report) stretches of non-finite, zero-filled or constant, or corrupt (over 1e8 times the median) samples and estimate from the rest, instead of stopping")
    .action(async (file: string, flags: PsdFlags) => {
      await runPsd(file, flags);
    });
}

async function runPsd(file: string, flags: PsdFlags): Promise<void> {
  const segmentSeconds = parseNumberFlag("--segment", flags.segment, { min: 0, minExclusive: true });
  const average = parseChoiceFlag("--average", flags.average, ["median", "mean"] as const);
  const fminFlag = flags.fmin === undefined ? undefined : parseNumberFlag("--fmin", flags.fmin, { min: 0, minExclusive: true });
  const rate = flags.rate === undefined ? undefined : parseRateFlag("--rate", flags.rate);
  const start = flags.start === undefined ? undefined : parseNumberFlag("--start", flags.start);
  checkFilePlan({
    inputs: strainInputs("strain file", [file]),
    outputs: [...(flags.out ? [{ flag: "--out", path: flags.out }] : []), ...(flags.plot ? [{ flag: "--plot", path: flags.plot }] : [])],
  });

  const strain = await readStrain(file, { rate, start, dataset: flags.dataset, nonFinite: "allow" });
  printStrainWarnings(strain.warnings);
  const nyquist = strain.sampleRate / 2;
  if (fminFlag !== undefined && fminFlag >= nyquist) {
    throw new UsageError(`--fmin: must be below the Nyquist frequency ${nyquist} Hz (got ${flags.fmin})`);
  }
  // Screened as a scan screens its input: bad stretches are refused, or left out with --skip-bad-data.
  const { estimate, segmentLength, excluded, excludedSamples } = await validDataPsd(strain, { segmentSeconds, average, badData: flags.skipBadData ? "exclude" : "reject" });
  const fs = strain.sampleRate;
  const skipped: SkippedStretch[] = excluded.map((e) => ({ startTime: strain.startTime + e.start / fs, endTime: strain.startTime + e.end / fs, reason: e.reason }));
  const skippedSeconds = excludedSamples / fs;
  // A horizon in Mpc assumes dimensionless strain; for other units (e.g. counts) it is not given.
  const physical = isDimensionlessStrain(strain.units);
  if (!physical) nonStrainInputs([strain], "the horizon and range are unavailable (null in JSON)");
  const fMinHz = fminFlag ?? Math.max(DEFAULT_FMIN_HZ, estimate.df);
  let horizon: HorizonResult | null = null;
  if (physical) try {
    horizon = horizonDistance({
      massSolar1: REFERENCE_MASS_SOLAR,
      massSolar2: REFERENCE_MASS_SOLAR,
      psd: { df: estimate.df, psd: estimate.psd },
      fMinHz: fMinHz,
    });
  } catch (err) {
    // E.g. a PSD that is zero in the band: no meaningful horizon. Anything else is a bug and propagates.
    if (!(err instanceof InputError)) throw err;
  }
  const segmentUsed = segmentLength / fs;

  if (flags.out) {
    const comments = [
      `noise PSD of ${strain.file} (one-sided, 1/Hz): Welch ${average} of ${estimate.segments} Hann-windowed segment${estimate.segments === 1 ? "" : "s"} ` +
        `of ${segmentUsed} s, 50% overlap, df = ${estimate.df} Hz`,
      ...(skipped.length > 0 ? [skippedLine(skipped, skippedSeconds)] : []),
    ];
    writeFileAtomic(flags.out, formatPsdTable(estimate.frequencies, estimate.psd, comments));
  }
  if (flags.plot) writeFileAtomic(flags.plot, (await import("../psdPlot.js")).renderAsdPlot(estimate, fMinHz, strain.file));

  if (flags.json) {
    const record = {
      file: strain.file,
      sampleRate: fs,
      segmentSeconds: segmentUsed,
      average,
      segments: estimate.segments,
      df: estimate.df,
      fMinHz: fMinHz,
      horizonMpc1p4: horizon?.horizonMpc ?? null,
      rangeMpc1p4: horizon?.rangeMpc ?? null,
      skipped,
      skippedSeconds,
      frequency: Array.from(estimate.frequencies),
      psd: Array.from(estimate.psd),
    };
    process.stdout.write(JSON.stringify(record) + "\n");
  } else {
    process.stdout.write(summaryText(strain, estimate, segmentUsed, fMinHz, horizon, flags, skipped, skippedSeconds));
  }
}

/** One line saying which bad stretches were left out of the estimate. */
function skippedLine(skipped: readonly SkippedStretch[], seconds: number): string {
  const first = skipped[0];
  return (
    `left out ${skipped.length} bad stretch${skipped.length === 1 ? "" : "es"} (${fmt(seconds)} s), the first ${first.reason} ` +
    `at t = ${first.startTime.toFixed(4)}–${first.endTime.toFixed(4)} s; estimated from the rest`
  );
}

function fmt(x: number, digits = 4): string {
  return Number.isFinite(x) ? x.toPrecision(digits) : String(x);
}

/** A short readable report: what was averaged, the horizon, and the PSD at a few frequencies. */
function summaryText(
  strain: StrainSeries,
  estimate: WelchPsd,
  segmentSeconds: number,
  fMinHz: number,
  horizon: HorizonResult | null,
  flags: PsdFlags,
  skipped: readonly SkippedStretch[],
  skippedSeconds: number,
): string {
  const fs = strain.sampleRate;
  const lines: string[] = [];
  lines.push(`${strain.file}: ${strain.data.length} samples at ${fs} Hz (${fmt(strain.data.length / fs)} s)`);
  lines.push(
    `PSD: Welch ${estimate.average} of ${estimate.segments} segment${estimate.segments === 1 ? "" : "s"} of ${segmentSeconds} s (Hann window, 50% overlap), df = ${fmt(estimate.df)} Hz`,
  );
  if (skipped.length > 0) lines.push(skippedLine(skipped, skippedSeconds));
  if (horizon) {
    lines.push(
      `1.4+1.4 M_sun at SNR 8, ${fmt(horizon.fMinHz)}–${fmt(horizon.fMaxHz)} Hz: horizon ${horizon.horizonMpc.toFixed(1)} Mpc ` +
        `(optimal orientation), averaged range ${horizon.rangeMpc.toFixed(1)} Mpc`,
    );
  } else {
    const why = isDimensionlessStrain(strain.units)
      ? `the PSD is not positive everywhere from ${fmt(fMinHz)} Hz up`
      : `the units ${JSON.stringify(strain.units)} are not dimensionless strain`;
    lines.push(`1.4+1.4 M_sun horizon: not available (${why})`);
  }
  lines.push("  frequency (Hz)      PSD (1/Hz)   ASD (1/√Hz)");
  for (const f of [10, 20, 50, 100, 300, 1000, 2000]) {
    if (f < estimate.df || f > fs / 2) continue;
    const k = Math.round(f / estimate.df);
    const s = estimate.psd[k];
    lines.push(`  ${fmt(k * estimate.df, 6).padStart(14)}  ${fmt(s).padStart(14)}  ${fmt(Math.sqrt(s)).padStart(12)}`);
  }
  if (flags.out) lines.push(`PSD written to ${flags.out}`);
  if (flags.plot) lines.push(`plot written to ${flags.plot}`);
  return lines.join("\n") + "\n";
}


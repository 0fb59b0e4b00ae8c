import type { Command } from "commander";
import { mkdirSync } from "node:fs";
import {
  analyseCoincidences,
  siteByName,
  siteCatalogue,
  type Coincidence,
  type Detector,
  type SingleSiteCandidate,
  type StrainSource,
  loadFftBackends,
  openStrain,
  psdModelFromSpec,
  resolveFftBackend,
  searchSource,
  writeFileAtomic,
  type Candidate,
  type PsdSource,
  type SearchSummary,
  journalPathFor,
  parseShardSpec,
  startScanRun,
  runSummaryRecord,
} from "@chirpsieve/core";
import { UsageError } from "../errors.js";
import { checkOutputDirectory, checkOutputFile, strainInputPaths } from "../outputPath.js";
import { parseNumberFlag, parseRateFlag, parseRangeFlag } from "../options.js";
import { createProgress } from "../progress.js";
import { addSearchOptions, parseSearchFlags, resolveTemplates, type SearchFlags } from "../searchFlags.js";
import {
  CANDIDATE_CAUTION,
  candidateRecord,
  chooseCandidateFormat,
  renderCandidates,
  type CandidateFormat,
  formatCoincidencesCsv,
  formatCoincidencesTable,
} from "../candidateFormat.js";
import { VERSION } from "../version.js";

interface ScanFlags extends SearchFlags {
  shard?: string;
  shardBy: string;
  resume?: boolean;
  massRange?: string;
  out?: string;
  format?: string;
  json?: boolean;
  plot?: string;
  quiet?: boolean;
  skipBadData?: boolean;
  rate?: string;
  start?: string;
  dataset?: string;
  site: string[];
  sites?: string;
  timingTolerance: string;
  slideStep: string;
  slides: string;
}

function collect(value: string, previous: string[]): string[] {
  return [...previous, value];
}

/** Registers `chirpsieve scan <strain-file>...`: the matched-filter search. */
export function registerScan(program: Command): void {
  const cmd = program
    .command("scan")
    .description(
      "Search strain files for inspiral chirps with a TaylorF2 template bank and report SNR peaks with " +
        "chirp mass and coalescence time. Reported peaks are candidates, not detections.",
    )
    .argument("[strain-file...]", "strain files (.f32/.f64 with a .json sidecar, .txt/.dat/.csv, .h5/.hdf5)");
  addSearchOptions(cmd, { fmin: "20" })
    .option("--mass-range <min:max>", "component-mass range of a bank built on the fly (solar masses)")
    .option("--noise-curve <name|file>", "use a known noise curve (dis2001, ajith2011, flat, flat:LEVEL, or a two-column table) instead of estimating the PSD")
    .option("--segment <s>", "analysis segment length (s, rounded up to a power of two samples); default from the longest template")
    .option("--out <file>", "write candidates to this file (format from --format or the extension: .jsonl, .csv, .txt)")
    .option("--format <fmt>", "table, jsonl or csv (default: table on a terminal, jsonl otherwise)")
    .option("--json", "same as --format jsonl to stdout")
    .option("--plot <dir>", "write SVG plots of the SNR around the loudest candidates and of the PSD into this directory")
    .option("--skip-bad-data", "skip (and report) segments with non-finite or corrupt (over 1e8 times the median) samples instead of stopping")
    .option("--rate <Hz>", "sample rate for one-column text files or HDF5 files without one")
    .option("--start <s>", "start time for one-column text files or HDF5 files without one")
    .option("--dataset <path>", "HDF5 dataset holding the strain")
    .option("--site <name=file>", "strain of one detector site (repeat for each site): coincidences and time-slide false-alarm rates", collect, [])
    .option("--sites <file>", "JSON file of extra site definitions (see `chirpsieve sites`)")
    .option("--timing-tolerance <s>", "added to the light-travel time between sites for a coincidence", "0.005")
    .option("--slide-step <s>", "time-slide step for the background", "7")
    .option("--slides <n>", "time slides on each side of zero (capped by the data length)", "100")
    .option("--shard <I/N>", "scan only piece I of N (0-based) and write it for `chirpsieve merge`; auto/N takes I from SLURM_ARRAY_TASK_ID or JOB_COMPLETION_INDEX")
    .option("--shard-by <how>", "split the work by templates, time or both", "both")
    .option("--resume", "keep a journal beside --out and continue a killed scan rerun with the same arguments")
    .option("--quiet", "no progress bar")
    .action(async (files: string[], flags: ScanFlags, cmd: Command) => {
      await runScan(files, flags, cmd);
    });
}

async function runScan(positional: string[], flags: ScanFlags, cmd: Command): Promise<void> {
  const network = parseSiteFlags(flags);
  if (network.length > 0 && positional.length > 0) {
    throw new UsageError("give strain files either as arguments or with --site NAME=FILE, not both");
  }
  const files = network.length > 0 ? network.map((s) => s.file) : positional;
  if (files.length === 0) throw new UsageError("no strain file given (pass files, or --site NAME=FILE for each site)");
  const coincidenceOptions = network.length > 0 ? {
    timingToleranceSeconds: parseNumberFlag("--timing-tolerance", flags.timingTolerance, { min: 0 }),
    slideStepSeconds: parseNumberFlag("--slide-step", flags.slideStep, { min: 0, minExclusive: true }),
    slidesPerSide: parseNumberFlag("--slides", flags.slides, { min: 0, integer: true }),
  } : undefined;
  const { fMinHz: fMinFlag, snrThreshold, chi2Bins, chi2Allowance, clusterWindowSeconds, psdSegmentSeconds, psdAverage, segmentSeconds, fftChoice, threads } = parseSearchFlags(flags);
  const format = chooseCandidateFormat(flags);
  // A shard creates its output directory itself (every task of a job array may race to do so).
  if (flags.out && !flags.shard) checkOutputFile("--out", flags.out, [...strainInputPaths(files), ...(flags.bank ? [flags.bank] : []), ...(flags.sites ? [flags.sites] : [])]);
  if (flags.plot) checkOutputDirectory("--plot", flags.plot);
  const rate = flags.rate === undefined ? undefined : parseRateFlag("--rate", flags.rate);
  const start = flags.start === undefined ? undefined : parseNumberFlag("--start", flags.start);
  if (flags.bank && flags.massRange) throw new UsageError("--bank and --mass-range: give one, not both");
  if (!flags.bank && !flags.massRange) throw new UsageError("--mass-range or --bank: one is needed to know which templates to use");
  const shard = flags.shard === undefined ? undefined : parseShardSpec(flags.shard, flags.shardBy, process.env);
  if ((shard || flags.resume) && !flags.out) throw new UsageError(`${shard ? "--shard" : "--resume"}: needs --out (its records and journal are kept beside it)`);
  if (shard && network.length > 0) throw new UsageError("--shard: not available with --site (coincidences need every site's whole scan)");

  const psd: PsdSource = flags.noiseCurve
    ? { kind: "model", model: psdModelFromSpec(flags.noiseCurve) }
    : { kind: "estimate", segmentSeconds: psdSegmentSeconds, average: psdAverage };

  const massRangeSolar = flags.massRange === undefined ? undefined : parseRangeFlag("--mass-range", flags.massRange);
  const { templates, description: bankDescription, fMinHz } = resolveTemplates(flags, massRangeSolar, fMinFlag, cmd.getOptionValueSource("fmin") === "cli");

  await loadFftBackends();
  const fftBackend = resolveFftBackend(fftChoice);
  const sources: StrainSource[] = [];
  for (const f of files) {
    sources.push(await openStrain(f, { rate, start, dataset: flags.dataset, nonFinite: flags.skipBadData ? "allow" : "error" }));
  }
  const searchOptions = { templates, fMinHz, snrThreshold, chi2Bins, chi2Allowance, clusterWindowSeconds, psd, segmentSeconds, fftBackend, skipNonFinite: !!flags.skipBadData };
  const run = shard || flags.resume
    ? await startScanRun({
        version: VERSION, inputs: sources, options: searchOptions, shard,
        journalPath: flags.resume ? journalPathFor(flags.out!) : undefined,
        arguments: { bank: bankDescription, rate, start, dataset: flags.dataset },
      })
    : undefined;
  const progress = createProgress(!flags.quiet, "scan");
  const candidates: Candidate[] = [];
  const summaries: SearchSummary[] = [];
  const wallStart = performance.now();
  try {
    for (const [i, source] of sources.entries()) {
      const r = await searchSource(source, {
        ...searchOptions,
        threads, // not part of the run id: results do not depend on it
        onProgress: (done, total) => progress.update(i, sources.length, done, total),
        segmentHook: run?.hook(i),
      });
      for (const c of r.candidates) candidates.push(c);
      summaries.push(r.summary);
    }
  } finally {
    progress.stop();
    for (const s of sources) await s.close();
    run?.close();
  }
  if (run && shard) {
    run.writeShard(flags.out!, Math.max(1, ...summaries.map((sm) => sm.threads)));
    run.finish();
    if (!flags.quiet) process.stderr.write(`chirpsieve: shard ${shard.index}/${shard.count} written to ${flags.out}; merge the ${shard.count} shards with \`chirpsieve merge\`\n`);
    return;
  }
  // A resumed run: its result and seconds come from every segment's record, journaled or new.
  const merged = run?.result();
  if (merged) {
    candidates.splice(0, candidates.length, ...merged.candidates);
    merged.perInput.forEach((p, i) => Object.assign(summaries[i], { analysedSeconds: p.analysedSeconds, skippedSeconds: p.skippedSeconds, skipped: p.skipped }));
  }
  const summary = runSummaryRecord({
    inputs: summaries,
    templates: templates.length,
    bank: bankDescription,
    candidates: candidates.length,
    minSnr: snrThreshold,
    chi2Allowance,
    fMinHz,
    psd: psd.kind === "model" ? psd.model.name : `welch-${psd.average}-${psdSegmentSeconds}s`,
    fftBackend,
    wallSeconds: (performance.now() - wallStart) / 1000,
    caution: CANDIDATE_CAUTION,
  });

  let text: string;
  if (network.length > 0) {
    const byFile = new Map(summaries.map((sm) => [sm.file, sm]));
    const result = analyseCoincidences(
      network.map((site, i) => {
        const src = sources[i];
        return {
          detector: site.detector,
          candidates: candidates.filter((c) => c.file === site.file),
          analysedSeconds: byFile.get(site.file)?.analysedSeconds ?? 0,
          startTime: src.startTime,
          endTime: src.startTime + src.length / src.sampleRate,
        };
      }),
      { ...coincidenceOptions, clusterWindowSeconds },
    );
    summary.sites = network.map((s) => ({ name: s.name, file: s.file }));
    summary.coincidences = result.coincidences.length;
    summary.background = result.summary;
    text = renderNetwork(format, result.coincidences, result.singles, summary);
  } else {
    text = renderCandidates(format, candidates, summary);
  }
  if (flags.out) writeFileAtomic(flags.out, text);
  else process.stdout.write(text);
  run?.finish();
  if (flags.out && !flags.quiet) {
    process.stderr.write(`chirpsieve: ${candidates.length} candidate(s) written to ${flags.out}\n`);
  }
  if (flags.plot) {
    mkdirSync(flags.plot, { recursive: true });
    const { writeScanPlots } = await import("../scanPlots.js");
    await writeScanPlots(flags.plot, sources.length ? files : [], candidates, {
      templates, fMinHz, snrThreshold, chi2Bins, chi2Allowance, clusterWindowSeconds, psd, segmentSeconds, fftBackend,
      open: (f) => openStrain(f, { rate, start, dataset: flags.dataset, nonFinite: flags.skipBadData ? "allow" : "error" }),
    });
  }
}


interface NetworkSite {
  name: string;
  file: string;
  detector: Detector;
}

/** `--site NAME=FILE` flags resolved against the built-in and --sites catalogue. */
function parseSiteFlags(flags: ScanFlags): NetworkSite[] {
  if (flags.site.length === 0) {
    if (flags.sites) throw new UsageError("--sites: only used with --site NAME=FILE");
    return [];
  }
  const catalogue = siteCatalogue(flags.sites);
  const out: NetworkSite[] = [];
  for (const spec of flags.site) {
    const eq = spec.indexOf("=");
    if (eq <= 0 || eq === spec.length - 1) throw new UsageError(`--site: expected NAME=FILE (got "${spec}")`);
    const name = spec.slice(0, eq);
    if (out.some((s) => s.name === name)) throw new UsageError(`--site: site "${name}" given twice`);
    let site;
    try {
      site = siteByName(name, catalogue);
    } catch (err) {
      throw new UsageError(`--site: ${(err as Error).message}`);
    }
    out.push({ name, file: spec.slice(eq + 1), detector: site.detector });
  }
  if (out.length < 2) throw new UsageError("--site: coincidence needs at least two sites");
  return out;
}

function renderNetwork(
  format: CandidateFormat,
  coincidences: Coincidence[],
  singles: SingleSiteCandidate[],
  summary: Record<string, unknown>,
): string {
  if (format === "jsonl") {
    const lines = [
      ...coincidences.map((c) => JSON.stringify({ type: "coincidence", ...c })),
      ...singles.map((c) => JSON.stringify({ ...candidateRecord(c), type: "single", falseAlarmRatePerYear: c.falseAlarmRatePerYear, falseAlarmRateIsUpperLimit: c.falseAlarmRateIsUpperLimit, falseAlarmProbability: c.falseAlarmProbability, falseAlarmRateSource: c.falseAlarmRateSource })),
      JSON.stringify(summary),
    ];
    return lines.join("\n") + "\n";
  }
  if (format === "csv") return formatCoincidencesCsv(coincidences);
  return formatCoincidencesTable(coincidences, singles.length, summary);
}



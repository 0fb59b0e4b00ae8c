import type { Command } from "commander";
import { mkdirSync } from "node:fs";
import {
  analyseCoincidences,
  siteByName,
  siteCatalogue,
  type Coincidence,
  type Detector,
  type SingleSiteCandidate,
  type StrainReader,
  loadFftBackends,
  openStrain,
  psdModelFromSpec,
  resolveFftBackend,
  searchEach,
  writeFileAtomic,
  type Candidate,
  type PsdMethod,
  type SearchSummary,
  journalPathFor,
  manifestPathFor,
  startScanRun,
  joinContiguousInputs,
  readIntervalFile,
  runSummaryRecord,
  psdLabel,
  type SearchInput,
  type SearchOptions,
  type ShardSpec,
  type TimeInterval,
} from "@chirpsieve/core";
import { UsageError } from "../errors.js";
import { parseShardSpec } from "../shardFlag.js";
import { checkFilePlan, noiseCurveInput, strainInputs, type FilePlan } from "../outputPath.js";
import { parseNumberFlag, parseRateFlag, parseRangeFlag } from "../options.js";
import { createProgress } from "../progress.js";
import { nonStrainInputs, openStrainInput, type NonStrainInput } from "../strainInputs.js";
import { BANK_SPIN_RANGE_HELP, parseSpinRangeFlag } from "../spinRange.js";
import { addSearchOptions, parseSearchFlags, resolveTemplates, type ParsedSearchFlags, type SearchFlags } from "../searchFlags.js";
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
import { checkInspiralEdge, warnInspiralEdge, type InspiralEdgeRecord } from "../inspiralEdge.js";

type FftBackendName = ReturnType<typeof resolveFftBackend>;
type ScanRun = Awaited<ReturnType<typeof startScanRun>>;

interface ScanFlags extends SearchFlags {
  shard?: string;
  shardBy: string;
  resume?: boolean;
  massRange?: string;
  spinRange?: string;
  out?: string;
  format?: string;
  json?: boolean;
  plot?: string;
  quiet?: boolean;
  skipBadData?: boolean;
  keepTimes?: string;
  dropTimes?: string;
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
    .option("--spin-range <min:max>", `with --mass-range: ${BANK_SPIN_RANGE_HELP}`)
    .option("--noise-curve <name|file>", "use a known noise curve (dis2001, ajith2011, flat, flat:LEVEL, or a two-column table) instead of estimating the PSD")
    .option("--segment <s>", "analysis segment length (s, rounded up to a power of two samples); default from the longest template")
    .option("--out <file>", "write candidates to this file (format from --format or the extension: .jsonl, .csv, .txt)")
    .option("--format <fmt>", "table, jsonl or csv (default: table on a terminal, jsonl otherwise)")
    .option("--json", "same as --format jsonl to stdout")
    .option("--plot <dir>", "write SVG plots of the SNR around the loudest candidates and of the PSD into this directory")
    .option("--skip-bad-data", "leave out (and report) stretches of non-finite, zero-filled or constant, or corrupt (over 1e8 times the median) samples, plus the filter lengths around them, and search the rest, instead of stopping")
    .option("--keep-times <file>", "search only inside the intervals listed in this file (lines of `start end` in seconds of the data's time base; # comments)")
    .option("--drop-times <file>", "never search inside the intervals listed in this file (same format)")
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
    .option("--quiet", "no progress (bar on a terminal, periodic lines otherwise) and no advisory warnings (the summary still records them; data that cannot be searched is always reported)")
    .action(async (files: string[], flags: ScanFlags, cmd: Command) => {
      await runScan(files, flags, cmd);
    });
}

/**
 * `scan` in stages: resolve the flags, files and bank; open the inputs; build the search options
 * (and the run, when sharded or resumed); search each stream; then write a shard, or complete the
 * result, summarise, render and write it, and the plots.
 */
async function runScan(positional: string[], flags: ScanFlags, cmd: Command): Promise<void> {
  const setup = resolveScanSetup(positional, flags, cmd);
  await loadFftBackends();
  const fftBackend = resolveFftBackend(setup.search.fftChoice);
  const inputs = await openScanInputs(setup, flags);
  const searchOptions = scanSearchOptions(setup, fftBackend, flags);
  const run = setup.shard || flags.resume
    ? await startScanRun({
        version: VERSION, inputs: inputs.streams, options: searchOptions, shard: setup.shard,
        journalPath: flags.resume ? journalPathFor(flags.out!) : undefined,
        arguments: { bank: setup.bankDescription, rate: setup.rate, start: setup.start, dataset: flags.dataset },
      })
    : undefined;
  const wallStart = performance.now();
  let found: { candidates: Candidate[]; summaries: SearchSummary[] };
  try {
    found = await searchStreams(inputs.streams, searchOptions, setup.search.threads, run, flags.quiet);
  } finally {
    for (const s of inputs.sources) await s.close();
    run?.close();
  }
  const { candidates, summaries } = found;
  if (run && setup.shard) {
    finishShard(run, setup, summaries, flags);
    return;
  }
  completeResult(run, inputs, candidates, summaries);
  const summary = scanSummaryRecord(setup, inputs, candidates, summaries, fftBackend, (performance.now() - wallStart) / 1000);
  const text = renderScanResult(setup, inputs.sources, candidates, summaries, summary);
  if (flags.out) writeFileAtomic(flags.out, text);
  else process.stdout.write(text);
  run?.finish(); // the journal goes once the output is safely written
  printScanNotes(candidates.length, setup, flags);
  if (flags.plot) await writePlots(flags.plot, setup, inputs.sources, candidates, fftBackend, flags);
}

/** What a scan's flags resolve to before any strain file is opened: inputs, sites, search settings, bank. */
interface ScanSetup {
  files: string[];
  network: NetworkSite[];
  coincidenceOptions?: { timingToleranceSeconds: number; slideStepSeconds: number; slidesPerSide: number };
  search: ParsedSearchFlags;
  analysisIntervals?: TimeInterval[];
  excludedIntervals?: TimeInterval[];
  format: CandidateFormat;
  rate?: number;
  start?: number;
  shard?: ShardSpec;
  psd: PsdMethod;
  templates: ReturnType<typeof resolveTemplates>["templates"];
  bankDescription: string;
  fMinHz: number;
  inspiralEdge: InspiralEdgeRecord;
}

/** Parses and checks every flag, checks the files to read and write, and resolves the bank (built or read). */
function resolveScanSetup(positional: string[], flags: ScanFlags, cmd: Command): ScanSetup {
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
  const search = parseSearchFlags(flags);
  const analysisIntervals = flags.keepTimes === undefined ? undefined : readIntervalFile(flags.keepTimes);
  const excludedIntervals = flags.dropTimes === undefined ? undefined : readIntervalFile(flags.dropTimes);
  const format = chooseCandidateFormat(flags);
  checkFilePlan(scanFilePlan(files, network, flags));
  const rate = flags.rate === undefined ? undefined : parseRateFlag("--rate", flags.rate);
  const start = flags.start === undefined ? undefined : parseNumberFlag("--start", flags.start);
  if (flags.bank && flags.massRange) throw new UsageError("--bank and --mass-range: give one, not both");
  if (!flags.bank && !flags.massRange) throw new UsageError("--mass-range or --bank: one is needed to know which templates to use");
  const shard = flags.shard === undefined ? undefined : parseShardSpec(flags.shard, flags.shardBy, process.env);
  if ((shard || flags.resume) && !flags.out) throw new UsageError(`${shard ? "--shard" : "--resume"}: needs --out (its records and journal are kept beside it)`);
  if (shard && network.length > 0) throw new UsageError("--shard: not available with --site (coincidences need every site's whole scan)");

  const psd: PsdMethod = flags.noiseCurve
    ? { kind: "model", model: psdModelFromSpec(flags.noiseCurve) }
    : { kind: "estimate", segmentSeconds: search.welchSegmentSeconds, average: search.welchAverage };

  const massRangeSolar = flags.massRange === undefined ? undefined : parseRangeFlag("--mass-range", flags.massRange);
  const spinRange = flags.spinRange === undefined ? undefined : parseSpinRangeFlag("--spin-range", flags.spinRange);
  if (spinRange && flags.bank) throw new UsageError("--spin-range: only for a bank built on the fly over --mass-range (a bank file carries its own spins)");
  if (spinRange && !(spinRange[0] < spinRange[1])) throw new UsageError(`--spin-range: a bank needs MIN below MAX (got "${flags.spinRange}")`);
  const { templates, description: bankDescription, fMinHz } = resolveTemplates(flags, massRangeSolar, search.fMinHz, cmd.getOptionValueSource("fmin") === "cli", spinRange);
  const inspiralEdge = checkInspiralEdge(templates, psd.kind === "model" ? psd.model : undefined, fMinHz);
  return {
    files, network, coincidenceOptions, search, analysisIntervals, excludedIntervals, format, rate, start, shard, psd,
    templates, bankDescription, fMinHz, inspiralEdge,
  };
}

/** The opened strain files, the streams searched (contiguous files joined) and the files not in strain units. */
interface ScanInputs {
  sources: StrainReader[];
  streams: SearchInput[];
  nonStrain: NonStrainInput[];
}

/** Opens every strain file (closing those opened if one fails), notes non-strain units, and joins contiguous files. */
async function openScanInputs(setup: ScanSetup, flags: ScanFlags): Promise<ScanInputs> {
  const sources: StrainReader[] = [];
  try {
    for (const f of setup.files) {
      // Bad samples (non-finite, zero-filled or constant, corrupt) are found by the search's
      // screening, which rejects them or reports them as left-out stretches.
      sources.push(await openStrainInput(f, { rate: setup.rate, start: setup.start, dataset: flags.dataset, nonFinite: "allow" }));
    }
  } catch (err) {
    for (const s of sources) await s.close();
    throw err;
  }
  const nonStrain = nonStrainInputs(sources);
  if (setup.network.length > 0) checkSitesFromOneRun(setup.network, sources);
  // Files of one site whose samples continue each other are searched as one stream (no lead-in
  // lost at their boundaries); --site files are one per site.
  const streams: SearchInput[] = setup.network.length > 0 ? sources : joinContiguousInputs(sources);
  return { sources, streams, nonStrain };
}

/** The core search options of a scan (those that shape its result; threads and callbacks are added per run). */
function scanSearchOptions(setup: ScanSetup, fftBackend: FftBackendName, flags: ScanFlags) {
  const { fMinHz, templates, psd, analysisIntervals, excludedIntervals } = setup;
  const { snrThreshold, chi2Bands, chi2Allowance, loudestWithinSeconds, segmentSeconds, gating } = setup.search;
  return {
    templates, fMinHz, snrThreshold, chi2Bands, chi2Allowance, loudestWithinSeconds, psd, segmentSeconds, fftBackend,
    badData: flags.skipBadData ? ("exclude" as const) : ("reject" as const), analysisIntervals, excludedIntervals, gating,
  };
}

/**
 * Searches each stream in turn with a progress display, through the run's hook when sharded or
 * resumed. A single stream too short to search is the user's to fix (an error); a stream left with
 * nothing by the exclusions asked for, or one of several, is a warning.
 */
async function searchStreams(
  streams: SearchInput[],
  searchOptions: SearchOptions,
  threads: number | undefined,
  run: ScanRun | undefined,
  quiet: boolean | undefined,
): Promise<{ candidates: Candidate[]; summaries: SearchSummary[] }> {
  const progress = createProgress(!quiet, "scan", { lines: true });
  const candidates: Candidate[] = [];
  const summaries: SearchSummary[] = [];
  try {
    // One run over the streams: the next stream is screened and its first segment loaded while the
    // workers filter the last segment of the one before.
    await searchEach(
      streams.length,
      (i) => ({ input: streams[i], segmentHook: run?.hook(i), onProgress: (done, total) => progress.update(i, streams.length, done, total) }),
      { ...searchOptions, threads }, // threads are not part of the run id: results do not depend on them
      (i, r) => {
        const stream = streams[i];
        if (r.summary.unsearchable) {
          const remedy = r.summary.unsearchableLimitedBy === "filter" ? "use a shorter --welch-segment" : "raise --fmin, use heavier masses or longer data";
          // Too short by itself is the user's to fix; left with nothing by the exclusions they asked for is reported.
          if (streams.length === 1 && r.summary.skipped.length === 0) throw new UsageError(`${stream.file}: ${r.summary.unsearchable}; ${remedy}`);
          process.stderr.write(`chirpsieve: warning: ${stream.file}: not searched: ${r.summary.unsearchable}\n`);
        }
        for (const c of r.candidates) candidates.push(c);
        summaries.push(r.summary);
      },
    );
  } finally {
    progress.stop();
  }
  return { candidates, summaries };
}

/** Writes a shard's records and manifest for `merge`, and says so. */
function finishShard(run: ScanRun, setup: ScanSetup, summaries: SearchSummary[], flags: ScanFlags): void {
  const shard = setup.shard!;
  run.writeShard(flags.out!, Math.max(1, ...summaries.map((sm) => sm.threads)));
  run.finish();
  if (!flags.quiet) warnInspiralEdge(setup.inspiralEdge);
  if (!flags.quiet) process.stderr.write(`chirpsieve: shard ${shard.index}/${shard.count} written to ${flags.out}; merge the ${shard.count} shards with \`chirpsieve merge\`\n`);
}

/**
 * Completes the candidates and summaries in place: a resumed run's come from every segment's record,
 * journaled or new; effective distances of files not in strain units are not given (NaN).
 */
function completeResult(run: ScanRun | undefined, inputs: ScanInputs, candidates: Candidate[], summaries: SearchSummary[]): void {
  const merged = run?.result();
  if (merged) {
    candidates.splice(0, candidates.length, ...merged.candidates);
    merged.perInput.forEach((p, i) => Object.assign(summaries[i], { analysedSeconds: p.analysedSeconds, skippedSeconds: p.skippedSeconds, skipped: p.skipped, gates: p.gates }));
  }
  // Effective distances assume dimensionless strain: for other units they are not given.
  const noDistance = new Set(inputs.nonStrain.map((n) => n.file));
  if (noDistance.size > 0) {
    for (const c of candidates) if (noDistance.has(c.file)) c.effectiveDistanceMpc = Number.NaN;
  }
}

/** The summary record of the whole scan (the last line of its output). */
function scanSummaryRecord(
  setup: ScanSetup,
  inputs: ScanInputs,
  candidates: Candidate[],
  summaries: SearchSummary[],
  fftBackend: FftBackendName,
  wallSeconds: number,
): Record<string, unknown> {
  const { nonStrain } = inputs;
  return runSummaryRecord(
    {
      inputs: summaries,
      templates: setup.templates.length,
      bank: setup.bankDescription,
      candidates: candidates.length,
      minSnr: setup.search.snrThreshold,
      chi2Allowance: setup.search.chi2Allowance,
      fMinHz: setup.fMinHz,
      psd: psdLabel(setup.psd),
      fftBackend,
      wallSeconds,
      caution: CANDIDATE_CAUTION,
    },
    {
      ...(nonStrain.length > 0 ? { distancesUnavailable: nonStrain.map((n) => ({ file: n.file, units: n.units, why: "units are not dimensionless strain" })) } : {}),
      inspiralEdge: setup.inspiralEdge,
    },
  );
}

/** The scan's output text: candidates and summary, or for several sites coincidences, singles with false-alarm rates and summary. */
function renderScanResult(
  setup: ScanSetup,
  sources: StrainReader[],
  candidates: Candidate[],
  summaries: SearchSummary[],
  summary: Record<string, unknown>,
): string {
  const { network, format } = setup;
  if (network.length === 0) return renderCandidates(format, candidates, summary);
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
    { ...setup.coincidenceOptions, loudestWithinSeconds: setup.search.loudestWithinSeconds },
  );
  summary.sites = network.map((s) => ({ name: s.name, file: s.file }));
  summary.coincidences = result.coincidences.length;
  summary.background = result.summary;
  return renderNetwork(format, result.coincidences, result.singles, summary);
}

/** The advisory lines on stderr after the output is written (none with --quiet). */
function printScanNotes(candidateCount: number, setup: ScanSetup, flags: ScanFlags): void {
  if (!flags.quiet) warnInspiralEdge(setup.inspiralEdge);
  if (flags.out && !flags.quiet) {
    process.stderr.write(`chirpsieve: ${candidateCount} candidate(s) written to ${flags.out}\n`);
  }
}

/** --plot: SVG plots of the SNR around the loudest candidates and of the PSD, into `dir`. */
async function writePlots(dir: string, setup: ScanSetup, sources: StrainReader[], candidates: Candidate[], fftBackend: FftBackendName, flags: ScanFlags): Promise<void> {
  const { templates, fMinHz, psd, rate, start } = setup;
  const { snrThreshold, chi2Bands, chi2Allowance, loudestWithinSeconds, segmentSeconds } = setup.search;
  mkdirSync(dir, { recursive: true });
  const { writeScanPlots } = await import("../scanPlots.js");
  await writeScanPlots(dir, sources.map((x) => x.file), candidates, {
    templates, fMinHz, snrThreshold, chi2Bands, chi2Allowance, loudestWithinSeconds, psd, segmentSeconds, fftBackend,
    open: (f) => openStrain(f, { rate, start, dataset: flags.dataset, nonFinite: "allow" }),
  });
}

/**
 * Everything a scan reads and writes: the strain files (and sidecars), bank, noise-curve tables and
 * sites file; --out, and for a shard its manifest, for --resume its journal, and --plot. A shard
 * may create its output directory (every task of a job array may race to do so).
 */
function scanFilePlan(files: string[], network: NetworkSite[], flags: ScanFlags): FilePlan {
  const strainFlag = network.length > 0 ? "--site" : "strain file";
  const strain = strainInputs(strainFlag, files);
  const inputs = [
    ...strain,
    ...(flags.bank ? [{ flag: "--bank", path: flags.bank }] : []),
    ...noiseCurveInput("--noise-curve", flags.noiseCurve),
    ...noiseCurveInput("--bank-noise-curve", flags.bankNoiseCurve),
    ...(flags.sites ? [{ flag: "--sites", path: flags.sites }] : []),
  ];
  const distinct = network.length > 0
    ? [network.map((s) => ({ flag: "--site", path: s.file, shown: `${s.name}=${s.file}` }))]
    : [files.map((f) => ({ flag: strainFlag, path: f }))];
  const outputs: FilePlan["outputs"] = [];
  if (flags.out) {
    const createDirectory = !!flags.shard;
    outputs.push({ flag: "--out", path: flags.out, createDirectory });
    if (flags.shard) outputs.push({ flag: "--shard", path: manifestPathFor(flags.out), createDirectory });
    if (flags.resume) outputs.push({ flag: "--resume", path: journalPathFor(flags.out), createDirectory });
  }
  if (flags.plot) outputs.push({ flag: "--plot", path: flags.plot, kind: "directory" });
  return { inputs, outputs, distinct };
}

/**
 * Refuses sites whose files were written by different runs of a multi-site `simulate` (their
 * sidecars record the run): such files are not one simulated network, and their coincidences
 * would mean nothing. Files that record no run (or a single-site one) are not judged.
 */
function checkSitesFromOneRun(network: NetworkSite[], sources: StrainReader[]): void {
  let first: { site: NetworkSite; id: string } | undefined;
  network.forEach((site, i) => {
    const run = sources[i].run;
    if (!run || run.sites.length < 2) return;
    if (!first) first = { site, id: run.id };
    else if (run.id !== first.id) {
      throw new UsageError(
        `--site: ${first.site.name}=${first.site.file} and ${site.name}=${site.file} come from different simulate runs ` +
          `(run ids ${first.id.slice(0, 12)}… and ${run.id.slice(0, 12)}…); rerun simulate to write the sites together`,
      );
    }
  });
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
  if (format === "csv") return formatCoincidencesCsv(coincidences, summary);
  return formatCoincidencesTable(coincidences, singles.length, summary);
}



import type { Command } from "commander";
import { mkdirSync } from "node:fs";
import { join } from "node:path";
import {
  InputError,
  acquireRunLock,
  appendCampaignBatch,
  writeFileSet,
  writeFileSynced,
  type RunLock,
  campaignFingerprint,
  campaignIdentity,
  detectorByName,
  evaluateRequirements,
  loadFftBackends,
  parseRequirement,
  planCampaign,
  psdModelFromSpec,
  readCampaignState,
  resolveFftBackend,
  runCampaign,
  startCampaignState,
  summariseCampaign,
  type BatchResult,
  type CampaignOptions,
  type PsdModel,
  type PsdMethod,
  type Requirement,
  type StrainReader,
} from "@chirpsieve/core";
import { UsageError, onFlag } from "../errors.js";
import { checkFilePlan, noiseCurveInput, strainInputs } from "../outputPath.js";
import { parseChoiceFlag, parseNumberFlag, parseRateFlag, parseRangeFlag } from "../options.js";
import { SPIN_RANGE_HELP, parseSpinRangeFlag } from "../spinRange.js";
import { createProgress } from "../progress.js";
import { openStrainInput } from "../strainInputs.js";
import { addSearchOptions, parseSearchFlags, resolveTemplates, type SearchFlags } from "../searchFlags.js";
import { campaignDocument, formatCampaignText, type CampaignDocument } from "../reportData.js";
import { checkInspiralEdge, warnInspiralEdge } from "../inspiralEdge.js";
import { VERSION } from "../version.js";

interface RecoverFlags extends SearchFlags {
  strain?: string[];
  count: string;
  massRange: string;
  spinRange?: string;
  snrRange?: string;
  distanceRange?: string;
  distanceDistribution: string;
  seed: string;
  rate: string;
  modelPsd?: boolean;
  matchWindow: string;
  perBatch?: string;
  detector: string;
  start?: string;
  dataset?: string;
  report?: string;
  json?: boolean;
  out?: string;
  require: string[];
  resume?: boolean;
  state?: string;
  quiet?: boolean;
}

function collect(value: string, previous: string[]): string[] {
  return [...previous, value];
}

/** Registers `chirpsieve recover`: an injection-recovery campaign. */
export function registerRecover(program: Command): void {
  const cmd = program
    .command("recover")
    .description(
      "Run an injection-recovery campaign: inject a seeded population of TaylorT4 inspirals into simulated noise " +
        "(or your strain files), search it exactly as `scan` does, and measure which are found, how well, and how far " +
        "the search sees. Recovered injections are simulated signals, not detections of real sources.",
    );
  addSearchOptions(cmd, { fmin: "30" })
    .option("--noise-curve <name|file>", "noise to simulate (dis2001, ajith2011, flat, flat:LEVEL or a two-column table); with --strain, filter with this curve instead of estimating the PSD")
    .option("--strain <file...>", "inject into these strain files instead of simulated noise")
    .option("--count <N>", "number of injections", "100")
    .option("--mass-range <min:max>", "component masses of the injections (and of a bank built on the fly), M_sun", "1:3")
    .option("--spin-range <min:max>", `${SPIN_RANGE_HELP}; injected with spinning TaylorT4, searched with the bank as it is (an aligned-spin bank: build one with chirpsieve bank --spin-range and pass --bank)`)
    .option("--snr-range <min:max>", "optimal SNR range of the injections (distance scaled to hit it)")
    .option("--distance-range <min:max>", "distance range of the injections, Mpc")
    .option("--distance-distribution <kind>", "with --distance-range: volume (p ∝ D²) or uniform (in distance)", "volume")
    .option("--seed <text>", "seed of every random draw (injections and simulated noise)", "0")
    .option("--rate <Hz>", "sample rate of simulated data (with --strain: for one-column text files)", "2048")
    .option("--model-psd", "filter simulated data with the noise curve itself instead of a Welch estimate")
    .option("--segment <s>", "length of each batch's stretch of data (s, rounded up to a power of two samples); default: room for about 8 injections")
    .option("--match-window <s>", "a candidate within ± this many seconds of an injection's arrival finds it", "0.1")
    .option("--per-batch <N>", "injections per batch (default: as many as fit in one stretch)")
    .option("--detector <name>", "invented detector the injections are projected onto: site-a or site-b", "site-a")
    .option("--start <s>", "with --strain: start time for one-column text files or HDF5 files without one")
    .option("--dataset <path>", "with --strain: HDF5 dataset holding the strain")
    .option("--report <file>", "write a self-contained HTML report with plots")
    .option("--json", "print the results as JSON on stdout")
    .option("--out <file>", "write the results as JSON to this file")
    .option("--require <rule>", "fail (exit 1) unless the rule holds; repeatable: efficiency>=X@snr>=Y, efficiency>=X@distance<=D, chirp-mass-error<=E, time-error<=T, false-candidates<=N", collect, [])
    .option("--resume", "continue an interrupted campaign from its state file (same arguments)")
    .option("--state <dir>", "directory of the state file (default <out>.state or <report>.state)")
    .option("--quiet", "no progress on stderr")
    .action(async (flags: RecoverFlags, cmd: Command) => {
      await runRecover(flags, cmd);
    });
}


async function runRecover(flags: RecoverFlags, cmd: Command): Promise<void> {
  const wallStart = performance.now();
  // Parse and check everything before any work.
  const requirements: Requirement[] = flags.require.map((r) => onFlag("--require", () => parseRequirement(r)));
  const count = parseNumberFlag("--count", flags.count, { min: 1, max: 1_000_000, integer: true });
  const massRangeSolar = parseRangeFlag("--mass-range", flags.massRange);
  const spinRange = flags.spinRange === undefined ? undefined : parseSpinRangeFlag("--spin-range", flags.spinRange);
  if (flags.snrRange !== undefined && flags.distanceRange !== undefined) throw new UsageError("--snr-range and --distance-range: give one, not both");
  if (flags.snrRange === undefined && flags.distanceRange === undefined) throw new UsageError("--snr-range or --distance-range: one is needed to place the injections");
  const snrRange = flags.snrRange === undefined ? undefined : parseRangeFlag("--snr-range", flags.snrRange);
  const distanceMpc = flags.distanceRange === undefined ? undefined : parseRangeFlag("--distance-range", flags.distanceRange);
  const distanceDistribution = parseChoiceFlag("--distance-distribution", flags.distanceDistribution, ["volume", "uniform"] as const);
  if (flags.seed.trim() === "") throw new UsageError("--seed: must not be empty");
  const { fMinHz: fMinFlag, snrThreshold, chi2Bands, chi2Allowance, loudestWithinSeconds, welchSegmentSeconds, welchAverage, segmentSeconds, fftChoice, threads, gating } = parseSearchFlags(flags);
  const rate = parseRateFlag("--rate", flags.rate);
  const matchWindowSeconds = parseNumberFlag("--match-window", flags.matchWindow, { min: 0, minExclusive: true });
  const perBatch = flags.perBatch === undefined ? undefined : parseNumberFlag("--per-batch", flags.perBatch, { min: 1, integer: true });
  const detector = onFlag("--detector", () => detectorByName(flags.detector));
  const start = flags.start === undefined ? undefined : parseNumberFlag("--start", flags.start);
  const strainFiles = flags.strain ?? [];
  if (strainFiles.length === 0 && flags.noiseCurve === undefined) throw new UsageError("--noise-curve: needed to simulate noise (or give --strain FILE...)");
  if (strainFiles.length > 0 && flags.modelPsd) throw new UsageError("--model-psd: only applies to simulated noise (with --strain, --noise-curve sets the filter's PSD)");
  if (flags.bank && cmd.getOptionValueSource("matchFloor") === "cli") throw new UsageError("--match-floor: only applies to a bank built on the fly, not with --bank");
  const noiseModel: PsdModel | undefined = flags.noiseCurve === undefined ? undefined : onFlag("--noise-curve", () => psdModelFromSpec(flags.noiseCurve!));
  if (strainFiles.length === 0 && fMinFlag >= rate / 2) throw new UsageError(`--fmin: must be below the Nyquist frequency ${rate / 2} Hz (got ${flags.fmin})`);
  const stateDir = flags.state ?? (flags.out ? `${flags.out}.state` : flags.report ? `${flags.report}.state` : undefined);
  if (flags.resume && stateDir === undefined) throw new UsageError("--resume: needs --state DIR, --out or --report to know where the state file is");
  const stateFlag = flags.state ? "--state" : flags.out ? "--out" : "--report";
  checkFilePlan({
    inputs: [
      ...strainInputs("--strain", strainFiles),
      ...(flags.bank ? [{ flag: "--bank", path: flags.bank }] : []),
      ...noiseCurveInput("--noise-curve", flags.noiseCurve),
      ...noiseCurveInput("--bank-noise-curve", flags.bankNoiseCurve),
    ],
    distinct: [strainFiles.map((f) => ({ flag: "--strain", path: f }))],
    outputs: [
      ...(flags.out ? [{ flag: "--out", path: flags.out }] : []),
      ...(flags.report ? [{ flag: "--report", path: flags.report }] : []),
      ...(stateDir !== undefined
        ? [{ flag: stateFlag, path: stateDir, kind: "directory" as const }, { flag: stateFlag, path: join(stateDir, "campaign.jsonl"), createDirectory: true }]
        : []),
    ],
  });

  // The PSD the search filters with: scan's rule (a named curve, else a Welch estimate).
  const useModel = strainFiles.length > 0 ? noiseModel !== undefined : !!flags.modelPsd;
  const psd: PsdMethod = useModel ? { kind: "model", model: noiseModel! } : { kind: "estimate", segmentSeconds: welchSegmentSeconds, average: welchAverage };

  const { templates, description: bankDescription, fMinHz } = resolveTemplates(flags, massRangeSolar, fMinFlag, cmd.getOptionValueSource("fmin") === "cli");
  // Where the bank's inspiral templates stop carrying their signals (merger and ringdown not modelled).
  const inspiralEdge = checkInspiralEdge(templates, psd.kind === "model" ? psd.model : undefined, fMinHz);

  await loadFftBackends();
  const fftBackend = resolveFftBackend(fftChoice);
  const sources: StrainReader[] = [];
  let lock: RunLock | undefined;
  try {
    for (const f of strainFiles) sources.push(await openStrainInput(f, { rate: cmd.getOptionValueSource("rate") === "cli" ? rate : undefined, start, dataset: flags.dataset }));

    const options: CampaignOptions = {
      population: { count, massRangeSolar, ...(spinRange ? { spinRange } : {}), snrRange, distanceMpc, distanceDistribution, seed: flags.seed },
      data: strainFiles.length ? { kind: "strain", sources } : { kind: "simulated", psd: noiseModel!, sampleRate: rate },
      search: { templates, fMinHz, snrThreshold, chi2Bands, chi2Allowance, loudestWithinSeconds, psd, segmentSeconds, fftBackend, threads, gating },
      detector,
      matchWindowSeconds,
      injectionsPerBatch: perBatch,
    };
    // What determines the results: hashed into the state file so a resume with other arguments is refused.
    const args = campaignIdentity(options, bankDescription);
    const fingerprint = campaignFingerprint(args);

    // Lay the campaign out now, so a stretch too long to hold is refused before any file is made.
    planCampaign(options);

    let completed: BatchResult[] = [];
    let statePath: string | undefined;
    if (stateDir !== undefined) {
      mkdirSync(stateDir, { recursive: true });
      // One live campaign per state: a second run waits for nothing and is refused; a killed
      // run's lock is stale (its process is gone) and taken over.
      lock = onFlag(stateFlag, () => acquireRunLock(join(stateDir, "campaign.lock"), `the campaign state in ${stateDir}`));
      statePath = join(stateDir, "campaign.jsonl");
      const previous = flags.resume ? readCampaignState(statePath, fingerprint) : null;
      if (previous === null) startCampaignState(statePath, fingerprint, args);
      else completed = previous;
    }

    const progress = createProgress(!flags.quiet, "recover");
    const lines = !flags.quiet && !process.stderr.isTTY;
    if (lines && completed.length) process.stderr.write(`chirpsieve: resuming: ${completed.length} batch(es) already finished in ${statePath}\n`);
    let result;
    try {
      result = await runCampaign(options, {
        completed,
        onBatch: (r) => {
          if (statePath) appendCampaignBatch(statePath, fingerprint, r);
        },
        onProgress: (done, total) => {
          progress.update(0, 1, done, total);
          if (lines && done > completed.length) process.stderr.write(`chirpsieve: batch ${done}/${total} finished\n`);
        },
      });
    } finally {
      progress.stop();
    }

    const outcomes = result.batches.flatMap((b) => b.injections);
    const falseCandidates = result.batches.flatMap((b) => b.falseCandidates);
    const analysed = result.batches.reduce((a, b) => a + b.analysedSeconds, 0);
    const summary = summariseCampaign(outcomes, falseCandidates, options.population, analysed);
    const checks = evaluateRequirements(requirements, outcomes, summary);
    const doc: CampaignDocument = campaignDocument({
      version: VERSION,
      args,
      population: {
        count,
        massRangeSolar,
        ...(spinRange ? { spinRange } : {}),
        snrRange: snrRange ?? null,
        distanceRangeMpc: distanceMpc ?? null,
        distanceDistribution: distanceMpc ? distanceDistribution : null,
        seed: flags.seed,
        detector: detector.name,
        fMinHz,
        noise: strainFiles.length ? `strain files: ${strainFiles.join(", ")}` : `simulated Gaussian noise, ${noiseModel!.name} (synthetic)`,
        synthetic: strainFiles.length === 0,
      },
      layout: result.layout,
      summary,
      outcomes,
      falseCandidates,
      requirements: checks,
      run: { wallSeconds: (performance.now() - wallStart) / 1000, resumedBatches: completed.length, stateFile: statePath ?? null },
      inspiralEdge,
    });
    if (!flags.quiet) warnInspiralEdge(inspiralEdge);

    const json = `${JSON.stringify(doc, null, 2)}\n`;
    // --out and --report are one set: a kill leaves both old or both new.
    if (flags.out || flags.report) {
      const html = flags.report ? (await import("../report.js")).renderCampaignReport(doc) : "";
      await writeFileSet((flags.out ?? flags.report)!, (staged) => {
        if (flags.out) writeFileSynced(staged(flags.out), json);
        if (flags.report) writeFileSynced(staged(flags.report), html);
      });
    }
    if (flags.json) process.stdout.write(json);
    else process.stdout.write(formatCampaignText(doc));
    for (const c of checks.filter((c) => !c.met)) process.stderr.write(`chirpsieve: requirement not met: ${c.rule}: ${c.detail}\n`);
    if (checks.some((c) => !c.met)) process.exitCode = 1;
  } finally {
    lock?.release();
    for (const s of sources) await s.close();
  }
}

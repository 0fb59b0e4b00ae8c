import type { Command } from "commander";
import {
  buildBankWithReport,
  buildSpinBankWithReport,
  verifyBankWithSpins,
  type SpinBankReport,
  DEFAULT_TEMPLATE_CAP,
  checkBankOptions,
  parseMatchFloorRange,
  psdModelFromSpec,
  readBankFile,
  sweepMatchFloors,
  loadFftBackends,
  verifyBank,
  writeBankFile,
  writeFileAtomic,
  type BankPlacementReport,
  type CoverageReport,
  type PsdModel,
  type SweepResult,
  type TemplateBank,
} from "@chirpsieve/core";
import { UsageError, onFlag, withBankFlagErrors } from "../errors.js";
import { createProgress } from "../progress.js";
import { checkFilePlan, noiseCurveInput } from "../outputPath.js";
import { parseChoiceFlag, parseNumberFlag, parseRangeFlag } from "../options.js";
import { VERSION } from "../version.js";
import { checkInspiralEdge, warnInspiralEdge } from "../inspiralEdge.js";
import { BANK_SPIN_RANGE_HELP, parseSpinRangeFlag } from "../spinRange.js";



/** What a user of `bank` can change when the bank would exceed --template-cap. */
const LIMIT_REMEDY = "narrow it, raise --fmin, lower --match-floor or raise --template-cap";

interface RegionFlags {
  massRange?: string;
  fmin?: string;
  noiseCurve: string;
  totalMassCap?: string;
  massRatioCap?: string;
  fmax?: string;
  templateCap: string;
  spinRange?: string;
  placement: string;
}

interface BuildFlags extends RegionFlags {
  matchFloor: string;
  out?: string;
  plot?: string;
  json?: boolean;
}

interface VerifyFlags {
  spinRange?: string;
  draws: string;
  signal: string;
  drawSpace: string;
  seed: string;
  json?: boolean;
  require?: string;
}

interface SweepFlags extends RegionFlags {
  matchFloor: string;
  draws: string;
  signal: string;
  drawSpace: string;
  seed: string;
  json?: boolean;
  plot?: string;
}

/** Registers `chirpsieve bank` with the subcommands build (the default), verify and sweep. */
export function registerBank(program: Command): void {
  const bank = program
    .command("bank")
    .description(
      "Build a template bank (hexagonal lattice under the match metric), verify its coverage with fitting factors, " +
        "or sweep the minimal match to trade templates against lost detections. `chirpsieve bank --mass-range ...` " +
        "is `chirpsieve bank build --mass-range ...`.",
    );

  // The random signals of `verify` and `sweep`.
  const withDraws = (cmd: Command): Command =>
    cmd
      .option("--signal <model>", "taylorf2 (the bank's own model: coverage) or pn-time (TaylorT4: cost of the approximant)", "taylorf2")
      .option("--draw-space <space>", "draw uniformly in component masses (masses) or in chirp times (chirp-times)", "masses")
      .option("--seed <seed>", "seed of the draws", "1");

  const withRegion = (cmd: Command): Command =>
    cmd
      .option("--mass-range <min:max>", "component masses, solar masses, e.g. 1:3")
      .option("--fmin <Hz>", "low-frequency cutoff of the match (Hz), also the reference of the chirp times")
      .option("--noise-curve <name|file>", "ajith2011, dis2001, flat, flat:LEVEL, or a two-column PSD table file", "ajith2011")
      .option("--total-mass-cap <M>", "largest total mass, solar masses")
      .option("--mass-ratio-cap <q>", "largest mass ratio m1/m2 (> 1)")
      .option("--fmax <Hz>", "fixed upper cutoff of the match (Hz); default: each template's ISCO frequency")
      .option(
        "--template-cap <n>",
        "refuse, before placing anything, a bank estimated to need more templates than this",
        String(DEFAULT_TEMPLATE_CAP),
      )
      .option("--spin-range <min:max>", BANK_SPIN_RANGE_HELP)
      .option("--placement <kind>", "with --spin-range: lattice (A3* lattices per slab of τ0, the boundary filled stochastically; measured to need 1–2% fewer templates) or stochastic", "lattice");

  withRegion(
    bank
      .command("build", { isDefault: true })
      .description("Place templates on a hexagonal lattice so every binary in the region has a template within the minimal match."),
  )
    .option("--match-floor <MM>", "minimal match, strictly between 0 and 1", "0.97")
    .option("--out <file>", "bank file to write (JSON)")
    .option("--plot <file>", "SVG of the templates in the (τ0, τ3) and component-mass planes")
    .option("--json", "print the placement summary as JSON")
    .action((flags: BuildFlags) => runBuild(flags, process.argv.slice(2)));

  const verify = bank
    .command("verify")
    .description("Fitting factors of random signals against a bank: the fraction reaching its minimal match, percentiles, rate loss, worst points.")
    .argument("<bank-file>", "bank file written by `chirpsieve bank build`")
    .option("--draws <n>", "number of random signals", "1000")
    .option(
      "--spin-range <min:max>",
      "draw signals with aligned spins, each body's spin uniform and independent in [MIN, MAX] (default: the bank's spin range, or none); " +
        "shows what a non-spinning bank loses for spinning signals",
    );
  withDraws(verify)
    .option("--json", "print the report as JSON")
    .option("--require <fraction>", "exit with code 1 when fewer than this fraction of draws reach the minimal match")
    .action((file: string, flags: VerifyFlags) => runVerify(file, flags));

  const sweep = withRegion(
    bank
      .command("sweep")
      .description(
        "For each minimal match: template count, verified coverage, mean fitting factor, expected rate loss 1 − ⟨FF³⟩ " +
          "and an estimated scan cost per hour of data measured on this machine.",
      ),
  )
    .option("--match-floor <range>", "minimal matches MIN:MAX:STEP (or one value)", "0.90:0.99:0.01")
    .option("--draws <n>", "random signals per bank", "200");
  withDraws(sweep)
    .option("--json", "print the table as JSON")
    .option("--plot <file>", "SVG of the trade-off: scan cost (or template count) against rate loss")
    .action(async (flags: SweepFlags) => {
      // The cost estimate times the FFT backend a scan would use (the SIMD one when it loads).
      await loadFftBackends();
      await runSweep(flags);
    });
}

interface RegionSettings {
  massRangeSolar: [number, number];
  fMinHz: number;
  psd: PsdModel;
  noiseCurve: string;
  totalMassCapSolar?: number;
  massRatioCap?: number;
  fMaxHz?: number;
  templateCap: number;
  spinRange?: [number, number];
  placement: "stochastic" | "lattice";
}

/** Parses and checks the region flags; every error names its flag. */
function parseRegion(flags: RegionFlags): RegionSettings {
  if (flags.massRange === undefined) throw new UsageError(`--mass-range: required, e.g. --mass-range 1:3`);
  if (flags.fmin === undefined) throw new UsageError(`--fmin: required, e.g. --fmin 30`);
  const massRangeSolar = parseRangeFlag("--mass-range", flags.massRange, { strict: true });
  const fMinHz = parseNumberFlag("--fmin", flags.fmin, { min: 0, minExclusive: true });
  const totalMassCapSolar =
    flags.totalMassCap === undefined ? undefined : parseNumberFlag("--total-mass-cap", flags.totalMassCap, { min: 0, minExclusive: true });
  if (totalMassCapSolar !== undefined && !(totalMassCapSolar > 2 * massRangeSolar[0])) {
    throw new UsageError(`--total-mass-cap: must exceed twice the smallest component mass, ${2 * massRangeSolar[0]} (got ${flags.totalMassCap})`);
  }
  const massRatioCap =
    flags.massRatioCap === undefined ? undefined : parseNumberFlag("--mass-ratio-cap", flags.massRatioCap, { min: 1, minExclusive: true });
  const fMaxHz = flags.fmax === undefined ? undefined : parseNumberFlag("--fmax", flags.fmax, { min: fMinHz, minExclusive: true });
  const psd: PsdModel = onFlag("--noise-curve", () => psdModelFromSpec(flags.noiseCurve));
  if (fMinHz < psd.fMinHz) {
    throw new UsageError(`--fmin: ${fMinHz} Hz is below the lowest frequency ${psd.fMinHz} Hz of noise curve "${psd.name}"`);
  }
  const templateCap = parseNumberFlag("--template-cap", flags.templateCap, { min: 1, integer: true });
  const spinRange = flags.spinRange === undefined ? undefined : parseSpinRangeFlag("--spin-range", flags.spinRange);
  if (spinRange && !(spinRange[0] < spinRange[1])) {
    throw new UsageError(`--spin-range: a bank needs MIN below MAX (got "${flags.spinRange}")`);
  }
  const placement = parseChoiceFlag("--placement", flags.placement, ["stochastic", "lattice"] as const);
  const settings = { massRangeSolar, fMinHz, psd, noiseCurve: flags.noiseCurve, totalMassCapSolar, massRatioCap, fMaxHz, templateCap, spinRange, placement };
  // The band rules (core's MIN_ISCO_OVER_FMIN, MIN_FMAX_OVER_FMIN) checked here, before any work, with the flag named.
  withBankFlagErrors(() => checkBankOptions(settings), LIMIT_REMEDY);
  return settings;
}


function fmt(x: number, digits = 4): string {
  return Number.isFinite(x) ? x.toPrecision(digits) : String(x);
}

function pct(x: number, digits = 1): string {
  return `${(100 * x).toFixed(digits)}%`;
}

async function runBuild(flags: BuildFlags, argv: string[]): Promise<void> {
  const region = parseRegion(flags);
  const matchFloor = parseNumberFlag("--match-floor", flags.matchFloor, { min: 0, max: 1, minExclusive: true, maxExclusive: true });
  if (!flags.out) throw new UsageError(`--out: required (the bank file to write)`);
  checkFilePlan({
    inputs: noiseCurveInput("--noise-curve", flags.noiseCurve),
    outputs: [{ flag: "--out", path: flags.out }, ...(flags.plot ? [{ flag: "--plot", path: flags.plot }] : [])],
  });
  // A spinning or a plain bank; either is written, plotted and reported the same way.
  const built = region.spinRange
    ? (() => {
        const spinRange = region.spinRange;
        const { bank, report } = withBankFlagErrors(() => buildSpinBankWithReport({ ...region, spinRange, matchFloor }), LIMIT_REMEDY);
        return { bank, json: { spinRange, ...report }, text: () => spinBuildSummary(flags.out!, bank, report) };
      })()
    : (() => {
        const { bank, report } = withBankFlagErrors(() => buildBankWithReport({ ...region, matchFloor }), LIMIT_REMEDY);
        return { bank, json: { ...report, countOverVolumeEstimate: report.templateCount / report.volumeEstimate }, text: () => buildSummary(flags.out!, bank, report) };
      })();
  const bank = built.bank;
  bank.generator = { tool: "chirpsieve", version: VERSION, arguments: argv };
  writeBankFile(flags.out, bank);
  const inspiralEdge = checkInspiralEdge(bank.templates, region.psd, bank.fMinHz);
  warnInspiralEdge(inspiralEdge);
  if (flags.plot) writeFileAtomic(flags.plot, (await import("../bankPlots.js")).renderBankPlot(bank));
  if (flags.json) {
    process.stdout.write(JSON.stringify({ file: flags.out, ...built.json, inspiralEdge }) + "\n");
    return;
  }
  process.stdout.write(built.text() + "\n");
  if (flags.plot) process.stdout.write(`plot written to ${flags.plot}\n`);
}

function spinBuildSummary(file: string, bank: TemplateBank, r: SpinBankReport): string {
  const [a, b] = bank.massRangeSolar;
  const [s0, s1] = bank.spinRange ?? [0, 0];
  const how =
    r.placement === "lattice"
      ? `${r.latticeTemplates} on A3* lattices in ${r.slabs} slab${r.slabs === 1 ? "" : "s"}, ${r.stochasticTemplates} added stochastically`
      : `placed stochastically from ${r.proposals} draws`;
  return (
    `${file}: ${r.templateCount} template${r.templateCount === 1 ? "" : "s"} for ${a}–${b} M_sun with aligned spins ${s0} to ${s1} ` +
    `from ${bank.fMinHz} Hz (${bank.noiseCurve}) at minimal match ${bank.matchFloor}; ${how}; ` +
    `metric-volume estimate ${r.volumeEstimate.toFixed(0)} (the region is thin along its nearly degenerate mass–spin direction, so most templates cover its faces)`
  );
}

function buildSummary(file: string, bank: TemplateBank, r: BankPlacementReport): string {
  const [a, b] = bank.massRangeSolar;
  return (
    `${file}: ${r.templateCount} template${r.templateCount === 1 ? "" : "s"} for ${a}–${b} M_sun from ${bank.fMinHz} Hz (${bank.noiseCurve}) at minimal match ${bank.matchFloor}; ` +
    (r.volumeEstimate >= 1
      ? `metric-volume estimate ${r.volumeEstimate.toFixed(0)} (count/estimate ${(r.templateCount / r.volumeEstimate).toFixed(2)}); `
      : `metric-volume estimate ${r.volumeEstimate.toPrecision(2)} (the region is thinner than one template's cell, so its area says little); `) +
    `area under the minimal-match contours the placement follows plus a lattice's boundary layer ${r.boundaryAwareEstimate.toFixed(0)} ` +
    `(count/that ${(r.templateCount / r.boundaryAwareEstimate).toFixed(2)}), ${r.patchCount} patch${r.patchCount === 1 ? "" : "es"} (lattices or rows along the band)`
  );
}



function runVerify(file: string, flags: VerifyFlags): void {
  const draws = parseNumberFlag("--draws", flags.draws, { min: 1, integer: true });
  const signal = parseChoiceFlag("--signal", flags.signal, ["taylorf2", "pn-time"] as const);
  const drawSpace = parseChoiceFlag("--draw-space", flags.drawSpace, ["masses", "chirp-times"] as const);
  const required = flags.require === undefined ? undefined : parseNumberFlag("--require", flags.require, { min: 0, max: 1 });
  const bank = readBankFile(file);
  const spinRange = flags.spinRange === undefined ? bank.spinRange : parseSpinRangeFlag("--spin-range", flags.spinRange);
  if (spinRange && drawSpace !== "masses") throw new UsageError(`--draw-space: spinning draws are uniform in component masses; leave out --draw-space ${drawSpace}`);
  const psd: PsdModel = onFlag(`${file}: noiseCurve`, () => psdModelFromSpec(bank.noiseCurve));
  const bar = createProgress(true, "verify", { unit: "draws" });
  let report: CoverageReport;
  try {
    const onProgress = (d: number, t: number): void => bar.update(0, 1, d, t);
    report = spinRange
      ? verifyBankWithSpins(bank, { draws, signal, seed: flags.seed, psd, spinRange, onProgress })
      : verifyBank(bank, { draws, signal, drawSpace, seed: flags.seed, psd, onProgress });
  } finally {
    bar.stop();
  }
  if (flags.json) {
    process.stdout.write(JSON.stringify({ file, ...report, required: required ?? null }) + "\n");
  } else {
    process.stdout.write(verifyText(file, bank, report) + "\n");
  }
  if (required !== undefined && report.fractionAboveMinimalMatch < required) {
    const shortBy = required - report.fractionAboveMinimalMatch;
    process.stderr.write(
      `chirpsieve: coverage below --require: ${pct(report.fractionAboveMinimalMatch)} of draws reach the minimal match ` +
        `${bank.matchFloor}, required ${pct(required)} (short by ${(100 * shortBy).toFixed(1)} percentage points)\n`,
    );
    process.exitCode = 1;
  }
}

function verifyText(file: string, bank: TemplateBank, r: CoverageReport): string {
  const space =
    (r.drawSpace === "masses" ? "uniform in component masses" : "uniform in chirp times (τ0, τ3)") +
    (r.spinRange ? `, each body's aligned spin uniform in [${r.spinRange[0]}, ${r.spinRange[1]}]` : "");
  const bankKind = bank.spinRange ? `aligned-spin bank (spins ${bank.spinRange[0]} to ${bank.spinRange[1]})` : "non-spinning bank";
  const model = r.signal === "taylorf2" ? "TaylorF2 signals (the bank's own model: coverage)" : "TaylorT4 time-domain signals (the approximant's cost included)";
  const mm = bank.matchFloor;
  const lines = [
    `${file}: ${bankKind}, ${r.templates} templates, minimal match ${mm}; ${r.draws} ${model}, ${space}, seed ${r.seed}`,
    `fitting factor ≥ ${mm} for ${pct(r.fractionAboveMinimalMatch)} of draws; min ${r.min.toFixed(4)}, 1st percentile ${r.p01.toFixed(4)}, ` +
      `median ${r.median.toFixed(4)}, mean ${r.mean.toFixed(4)}`,
    `mean FF³ ${r.meanCube.toFixed(4)}: expected loss of detection rate ${pct(1 - r.meanCube)} ` +
      `(bound for a bank that meets its minimal match: 1 − MM³ = ${pct(1 - mm ** 3)}; Owen 1996)`,
    `worst draws:`,
    ...r.worst.map((w) => {
      const t = bank.templates[w.bestTemplate];
      const spins = w.primarySpin === undefined ? "" : ` χ ${w.primarySpin.toFixed(2)}, ${w.secondarySpin!.toFixed(2)}`;
      const tSpins = t && (t.primarySpin || t.secondarySpin) ? ` χ ${(t.primarySpin ?? 0).toFixed(2)}, ${(t.secondarySpin ?? 0).toFixed(2)}` : "";
      return `  ${fmt(w.primaryMassSolar)} + ${fmt(w.secondaryMassSolar)} M_sun${spins}: FF ${w.fittingFactor.toFixed(4)}${t ? ` (best template ${fmt(t.primaryMassSolar)} + ${fmt(t.secondaryMassSolar)}${tSpins})` : ""}`;
    }),
    `matches on a ${r.grid.dfHz} Hz grid (${r.grid.fftSize}-point inverse FFTs), ${r.matchesPerDraw.toFixed(1)} templates per draw ` +
      `(metric neighbours), ${(r.wallTimeMs / 1000).toFixed(1)} s`,
  ];
  return lines.join("\n");
}

async function runSweep(flags: SweepFlags): Promise<void> {
  const region = parseRegion(flags);
  const floors: number[] = onFlag("--match-floor", () => parseMatchFloorRange(flags.matchFloor));
  const draws = parseNumberFlag("--draws", flags.draws, { min: 1, integer: true });
  const signal = parseChoiceFlag("--signal", flags.signal, ["taylorf2", "pn-time"] as const);
  const drawSpace = parseChoiceFlag("--draw-space", flags.drawSpace, ["masses", "chirp-times"] as const);
  if (region.spinRange && drawSpace !== "masses") throw new UsageError(`--draw-space: spinning draws are uniform in component masses; leave out --draw-space ${drawSpace}`);
  if (flags.plot) checkFilePlan({ inputs: noiseCurveInput("--noise-curve", flags.noiseCurve), outputs: [{ flag: "--plot", path: flags.plot }] });
  const bar = createProgress(true, "sweep", { unit: "draws" });
  let result: SweepResult;
  try {
    result = withBankFlagErrors(
      () => sweepMatchFloors({ ...region, matchFloors: floors, draws, signal, drawSpace, seed: flags.seed, onProgress: (d, t) => bar.update(0, 1, d, t) }),
      LIMIT_REMEDY,
    );
  } finally {
    bar.stop();
  }
  if (flags.plot) writeFileAtomic(flags.plot, (await import("../bankPlots.js")).renderSweepPlot(result, region));
  if (flags.json) {
    process.stdout.write(JSON.stringify({ ...result, costIsEstimate: true }) + "\n");
    return;
  }
  const lines = [
    `minimal-match sweep, ${region.massRangeSolar[0]}–${region.massRangeSolar[1]} M_sun` +
      (region.spinRange ? ` with aligned spins ${region.spinRange[0]} to ${region.spinRange[1]} (draws: each body's spin uniform in the range)` : "") +
      ` from ${region.fMinHz} Hz (${region.noiseCurve}), ${result.draws} ${result.signal} draws per bank`,
    `  match floor  templates  volume est.  coverage  min FF   mean FF  rate loss  est. CPU h per h of data`,
  ];
  for (const row of result.rows) {
    lines.push(
      `  ${row.matchFloor.toFixed(3).padStart(11)}  ${String(row.templateCount).padStart(9)}  ${row.volumeEstimate.toFixed(0).padStart(11)}  ` +
        `${pct(row.coverage).padStart(8)}  ${row.minFittingFactor.toFixed(4)}  ${row.meanFittingFactor.toFixed(4)}  ${pct(row.rateLoss, 2).padStart(9)}  ` +
        `${row.cpuSecondsPerHour === undefined ? "-" : fmt(row.cpuSecondsPerHour / 3600, 3).padStart(10)}`,
    );
  }
  if (result.cost) {
    lines.push(
      `scan cost is an estimate: ${result.cost.method}; ${fmt(result.cost.perTemplateSegmentSeconds * 1000, 3)} ms per template per segment ` +
        `and ${fmt(result.cost.perSegmentSeconds * 1000, 3)} ms per segment, ${fmt(result.cost.segmentsPerHour, 3)} segments per hour`,
    );
  }
  if (flags.plot) lines.push(`plot written to ${flags.plot}`);
  process.stdout.write(lines.join("\n") + "\n");
}


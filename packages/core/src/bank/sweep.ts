// Spacing tuning: how the template count, coverage, rate loss and scan cost move with the minimal match.
import { InputError, parameterError } from "../errors.js";
import { MAX_MATCH_FLOOR, MIN_MATCH_FLOOR, buildBankWithReport, checkBankOptions, checkTemplateLimit, type BuildBankOptions } from "./templateBank.js";
import { MAX_VERIFY_DRAWS, verifyBank, type VerifyDrawSpace, type VerifySignal } from "./verify.js";
import { estimateSearchCost, type SearchCostEstimate } from "../search/searchCost.js";
import { iscoFrequencyHz } from "./chirpTimeCoordinates.js";
import { buildSpinBankWithReport, checkSpinRange, estimateSpinTemplateCount } from "./spinBank.js";
import type { SpinPlacementKind } from "./spinPlacement.js";
import { verifyBankWithSpins } from "./verifySpins.js";

export interface SweepOptions extends Omit<BuildBankOptions, "matchFloor"> {
  /** Minimal matches to try, each in (0, 1). */
  matchFloors: number[];
  /** Fitting-factor draws per bank (default 200). */
  draws?: number;
  seed?: string | number;
  signal?: VerifySignal;
  drawSpace?: VerifyDrawSpace;
  /**
   * Aligned-spin range of a spinning bank (spinBank.ts): each bank is then placed over masses and
   * spins and verified with draws whose two spins are uniform and independent in the range.
   */
  spinRange?: [number, number];
  /** Placement of a spinning bank (default that of spinBank.ts). */
  placement?: SpinPlacementKind;
  /** Measure the scan cost on this machine (default true). */
  measureCost?: boolean;
  /** Called after each match floor with (done, total). */
  onProgress?: (done: number, total: number) => void;
}

/** One match floor's figures. */
export interface SweepRow {
  matchFloor: number;
  templateCount: number;
  /** Metric-volume estimate of the count (phase metric; Owen 1996). */
  volumeEstimate: number;
  /** Fraction of draws whose fitting factor reaches the match floor. */
  coverage: number;
  minFittingFactor: number;
  meanFittingFactor: number;
  /** ⟨FF³⟩ and the expected loss of detection rate 1 − ⟨FF³⟩ (Owen 1996). */
  meanCube: number;
  rateLoss: number;
  /** Estimated CPU seconds to scan one hour of data (see `cost`), or undefined if not measured. */
  cpuSecondsPerHour?: number;
}

export interface SweepResult {
  rows: SweepRow[];
  cost?: SearchCostEstimate;
  draws: number;
  signal: VerifySignal;
  /** The spin range of spinning banks (absent for non-spinning ones). */
  spinRange?: [number, number];
}

/** Parses "a:b:step" (inclusive, rounded to the step's decimals) or a single value into match floors. */
export function parseMatchFloorRange(spec: string): number[] {
  const parts = spec.split(":").map((s) => s.trim());
  const nums = parts.map(Number);
  if (parts.some((p) => p === "") || nums.some((x) => !Number.isFinite(x))) {
    throw new InputError(`match floor range must be "MIN:MAX:STEP" or one value (got "${spec}")`);
  }
  let values: number[];
  if (nums.length === 1) values = [nums[0]];
  else if (nums.length === 3) {
    const [lo, hi, step] = nums;
    if (!(step > 0)) throw new InputError(`match floor range "${spec}": the step must be positive`);
    if (!(lo <= hi)) throw new InputError(`match floor range "${spec}": the minimum must not exceed the maximum`);
    const decimals = Math.min(12, Math.max(0, ...parts.map((p) => (p.includes(".") ? p.split(".")[1].length : 0))));
    const n = Math.floor((hi - lo) / step + 1e-9);
    if (n > 200) throw new InputError(`match floor range "${spec}" has more than 200 values`);
    values = [];
    for (let i = 0; i <= n; i++) values.push(Number((lo + i * step).toFixed(decimals)));
  } else throw new InputError(`match floor range must be "MIN:MAX:STEP" or one value (got "${spec}")`);
  for (const v of values) {
    if (!(v > 0 && v < 1)) throw new InputError(`match floor ${v} in "${spec}" must be strictly between 0 and 1`);
  }
  return values;
}

/**
 * For each minimal match: builds the bank (templateBank.ts), verifies it with seeded fitting-factor
 * draws (verify.ts) and estimates the CPU seconds to search an hour of data with it: the search's own
 * per-segment and per-template work timed once on this machine (search/searchCost.ts), scaled by the
 * bank's template count and the search's segments per hour. The rate loss 1 − ⟨FF³⟩ is the expected fraction of detectable sources lost to the
 * bank's discreteness, for sources uniform in volume (Owen, Phys. Rev. D 53, 6749 (1996)).
 */
export function sweepMatchFloors(options: SweepOptions): SweepResult {
  checkBankOptions(options);
  if (!Array.isArray(options.matchFloors) || options.matchFloors.length === 0) throw new InputError(`matchFloors must list at least one value`);
  for (const mm of options.matchFloors) {
    if (!(mm >= MIN_MATCH_FLOOR && mm <= MAX_MATCH_FLOOR)) throw parameterError("matchFloor", `${mm} must be from ${MIN_MATCH_FLOOR} to ${MAX_MATCH_FLOOR}`);
  }
  // The densest bank first: refuse the whole sweep before any work if it would exceed the limit.
  const densest = { ...options, matchFloor: Math.max(...options.matchFloors) };
  if (options.spinRange !== undefined) {
    checkSpinRange(options.spinRange);
    const estimate = estimateSpinTemplateCount({ ...densest, spinRange: options.spinRange });
    checkTemplateLimit(densest, estimate);
  } else checkTemplateLimit(densest);
  const draws = options.draws ?? 200;
  if (!(Number.isInteger(draws) && draws >= 1 && draws <= MAX_VERIFY_DRAWS)) {
    throw parameterError("draws", `must be a whole number from 1 to ${MAX_VERIFY_DRAWS} (got ${draws}); for more, run several sweeps with different seeds`);
  }
  const signal = options.signal ?? "taylorf2";
  const rows: SweepRow[] = [];
  let cost: SearchCostEstimate | undefined;
  options.matchFloors.forEach((mm, k) => {
    const spinRange = options.spinRange;
    const { bank, report } = spinRange
      ? buildSpinBankWithReport({ ...options, spinRange, placement: options.placement, matchFloor: mm })
      : buildBankWithReport({ ...options, matchFloor: mm });
    const v = spinRange
      ? verifyBankWithSpins(bank, { draws, seed: options.seed, signal, psd: options.psd, spinRange })
      : verifyBank(bank, { draws, seed: options.seed, signal, drawSpace: options.drawSpace, psd: options.psd });
    if (options.measureCost !== false && !cost) {
      // The rate a scan of such data needs: a power of two at least twice the highest template frequency.
      const top = Math.min(options.fMaxHz ?? Infinity, iscoFrequencyHz(2 * options.massRangeSolar[0]));
      const sampleRate = Math.min(16384, 2 ** Math.ceil(Math.log2(2 * top)));
      cost = estimateSearchCost({ templates: bank.templates, fMinHz: options.fMinHz, sampleRate, psd: options.psd });
    }
    rows.push({
      matchFloor: mm,
      templateCount: report.templateCount,
      volumeEstimate: report.volumeEstimate,
      coverage: v.fractionAboveMinimalMatch,
      minFittingFactor: v.min,
      meanFittingFactor: v.mean,
      meanCube: v.meanCube,
      rateLoss: 1 - v.meanCube,
      cpuSecondsPerHour: cost ? cost.segmentsPerHour * (cost.perSegmentSeconds + report.templateCount * cost.perTemplateSegmentSeconds) : undefined,
    });
    options.onProgress?.(k + 1, options.matchFloors.length);
  });
  return { rows, cost, draws, signal, ...(options.spinRange ? { spinRange: options.spinRange } : {}) };
}

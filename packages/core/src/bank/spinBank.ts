// Aligned-spin banks: templates over component masses and a range of aligned spins.
import { InputError } from "../errors.js";
import { createMassRegion } from "./massRegion.js";
import { chirpMassFromMassEta, chirpTimesFromComponents } from "./chirpTimeCoordinates.js";
import {
  bankRecord,
  DEFAULT_TEMPLATE_CAP,
  TemplateLimitError,
  checkBankOptions,
  estimateTemplateCount,
  type BuildBankOptions,
  type Template,
  type TemplateBank,
} from "./templateBank.js";
import { createSpinMetric } from "./spinMetric.js";
import { placeSpinTemplates, spinPointComponents, spinRegionProperVolume, spinVolumeEstimate, type SpinPlacementKind, type SpinRegion } from "./spinPlacement.js";

/**
 * The placement a spinning bank uses unless told otherwise: the one that needed fewer templates for
 * the same covering rule and coverage. Measured here (ajith2011, MM 0.97, spins 0–0.5; 300 spinning
 * draws each, all at or above 0.97): lattice + fill 1 218 against stochastic 1 237 (5–15 M_sun from
 * 30 Hz), 1 887 against 1 893 (5–30 M_sun from 30 Hz), 2 082 against 2 119 (3–10 M_sun from 40 Hz).
 */
export const DEFAULT_SPIN_PLACEMENT: SpinPlacementKind = "lattice";

export interface BuildSpinBankOptions extends BuildBankOptions {
  /** Aligned spins of both bodies, [min, max] with −1 < min < max < 1. */
  spinRange: [number, number];
  /** "lattice" (A3* with a stochastic fill of the boundary) or "stochastic" (default {@link DEFAULT_SPIN_PLACEMENT}). */
  placement?: SpinPlacementKind;
  /** Seed of the stochastic pass (default "chirpsieve-spin-bank"). */
  seed?: string | number;
  /** Covered draws in a row that end the stochastic pass (default 4000). */
  stopAfter?: number;
}

/** Figures about a spinning placement, for summaries. */
export interface SpinBankReport {
  templateCount: number;
  placement: SpinPlacementKind;
  latticeTemplates: number;
  stochasticTemplates: number;
  proposals: number;
  slabs: number;
  /** ∫ sqrt(det g) over the region (spinMetric.ts). */
  properVolume: number;
  /** properVolume over the A3* cell of covering radius sqrt(1 − MM). */
  volumeEstimate: number;
}

/** Throws InputError unless the spin range is [min, max] with −1 < min < max < 1. */
export function checkSpinRange(range: unknown): asserts range is [number, number] {
  if (!Array.isArray(range) || range.length !== 2 || !range.every((x) => typeof x === "number" && Number.isFinite(x))) {
    throw new InputError(`spinRange must be two numbers [min, max] (got ${JSON.stringify(range)})`);
  }
  const [lo, hi] = range as number[];
  if (!(lo > -1 && hi < 1)) throw new InputError(`spinRange: aligned spins must lie strictly between −1 and 1 (got ${lo}, ${hi})`);
  if (!(lo < hi)) throw new InputError(`spinRange: the minimum ${lo} must be below the maximum ${hi}`);
}

function spinRegionOf(options: BuildSpinBankOptions): SpinRegion {
  const [mMin, mMax] = options.massRangeSolar;
  return {
    masses: createMassRegion(
      { minMassSolar: mMin, maxMassSolar: mMax, totalMassCapSolar: options.totalMassCapSolar, massRatioCap: options.massRatioCap },
      options.fMinHz,
    ),
    spinRange: options.spinRange,
  };
}

/**
 * The template count a spinning bank needs, roughly: the proper volume over the A3* cell plus the
 * non-spinning estimate of the same masses (estimateTemplateCount), which stands for the boundary
 * layer of the two spin faces. An upper-side guide (measured: see DEVELOPERS.md), quick enough to
 * refuse absurd requests before placing anything.
 */
export function estimateSpinTemplateCount(options: BuildSpinBankOptions): number {
  checkBankOptions(options);
  checkSpinRange(options.spinRange);
  const metric = createSpinMetric({ psd: options.psd, fMinHz: options.fMinHz, fMaxHz: options.fMaxHz, minimalMatch: options.matchFloor });
  const volume = spinRegionProperVolume(spinRegionOf(options), metric);
  return spinVolumeEstimate(volume, options.matchFloor) + estimateTemplateCount(options);
}

/**
 * Builds an aligned-spin bank: templates with equal spins χ1 = χ2 = χ placed over the masses and
 * χ ∈ spinRange in the coordinates (τ0, τ3, τs) of spinMetric.ts (spinPlacement.ts). The phase
 * depends on the two spins chiefly through the 1.5PN combination β, which equal spins in the range
 * span for every pair of spins in it, so the bank is meant for signals whose two aligned spins each
 * lie in the range (bank verification with spinning draws measures how well it does). The band rule
 * and the template-count guard of the non-spinning bank apply (checkBankOptions, templateCap).
 * Templates are sorted by chirp mass, then primary mass, then spin. Same options → same bank.
 */
export function buildSpinBankWithReport(options: BuildSpinBankOptions): { bank: TemplateBank; report: SpinBankReport } {
  checkBankOptions(options);
  checkSpinRange(options.spinRange);
  const placementKind = options.placement ?? DEFAULT_SPIN_PLACEMENT;
  if (placementKind !== "lattice" && placementKind !== "stochastic") {
    throw new InputError(`placement must be "lattice" or "stochastic" (got ${JSON.stringify(placementKind)})`);
  }
  const region = spinRegionOf(options);
  const metric = createSpinMetric({ psd: options.psd, fMinHz: options.fMinHz, fMaxHz: options.fMaxHz, minimalMatch: options.matchFloor });
  const properVolume = spinRegionProperVolume(region, metric);
  const volumeEstimate = spinVolumeEstimate(properVolume, options.matchFloor);
  const estimate = volumeEstimate + estimateTemplateCount(options);
  const limit = options.templateCap ?? DEFAULT_TEMPLATE_CAP;
  if (!(estimate <= limit)) {
    const [mMin, mMax] = options.massRangeSolar;
    const [sLo, sHi] = options.spinRange;
    throw new TemplateLimitError(
      `${mMin}–${mMax} M_sun with aligned spins ${sLo} to ${sHi} from ${options.fMinHz} Hz at minimal match ${options.matchFloor} needs about ` +
        `${estimate.toPrecision(2)} templates, more than the limit of ${limit}`,
      estimate,
      limit,
    );
  }
  const placed = placeSpinTemplates({
    region,
    metric,
    minimalMatch: options.matchFloor,
    kind: placementKind,
    seed: options.seed,
    stopAfter: options.stopAfter,
  });
  const templates: Template[] = placed.points.map((p) => {
    const { m1, m2 } = spinPointComponents(p);
    const ct = chirpTimesFromComponents(m1, m2, options.fMinHz);
    return {
      primaryMassSolar: m1,
      secondaryMassSolar: m2,
      chirpMassSolar: chirpMassFromMassEta(m1 + m2, p.eta),
      tau0: ct.tau0,
      tau3: ct.tau3,
      primarySpin: p.spin,
      secondarySpin: p.spin,
    };
  });
  templates.sort((a, b) => a.chirpMassSolar - b.chirpMassSolar || a.primaryMassSolar - b.primaryMassSolar || a.primarySpin! - b.primarySpin!);
  if (templates.length === 0) {
    throw new InputError(`the placement found no template for ${options.massRangeSolar.join("–")} M_sun from ${options.fMinHz} Hz; widen the band or the ranges`);
  }
  const bank = bankRecord(options, templates, options.spinRange);
  return {
    bank,
    report: {
      templateCount: templates.length,
      placement: placementKind,
      latticeTemplates: placed.latticeCount,
      stochasticTemplates: placed.stochasticCount,
      proposals: placed.proposals,
      slabs: placed.slabs,
      properVolume,
      volumeEstimate,
    },
  };
}

/** Builds an aligned-spin bank (see {@link buildSpinBankWithReport}). */
export function buildSpinBank(options: BuildSpinBankOptions): TemplateBank {
  return buildSpinBankWithReport(options).bank;
}

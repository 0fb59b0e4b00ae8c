// The template bank as the rest of chirpsieve sees it, and how one is built.
import { InputError, parameterError } from "../errors.js";
import { checkComponentMassRange } from "../physics/massDomain.js";
import type { PsdModel } from "../noise/psdModel.js";
import { createChirpTimeMetric, type ChirpTimeMetric } from "./metric.js";
import { createMassRegion, type MassRegion } from "./massRegion.js";
import { PlacementStopped, placeA2Lattice, type LatticeOptions, type LatticePlacement } from "./lattice.js";
import { boundaryLayerEstimate, hexagonCellArea, regionProperArea, regionProperPerimeter } from "./metricVolume.js";
import { placementMetric } from "./placementMetric.js";
import { createPhaseChart } from "./phaseChart.js";
import { chirpMassFromMassEta, componentsFromMassEta, iscoFrequencyHz, massEtaFromChirpTimes } from "./chirpTimeCoordinates.js";

/**
 * One inspiral template. Masses in solar masses, chirp times (from the bank's fmin) in s. Spins are
 * the dimensionless components χ ∈ (−1, 1) along the orbital angular momentum; absent means 0
 * (non-spinning). The chirp times are those of the non-spinning series.
 */
export interface Template {
  primaryMassSolar: number;
  secondaryMassSolar: number;
  chirpMassSolar: number;
  tau0: number;
  tau3: number;
  /** Aligned spin χ1 of the primary (default 0). */
  primarySpin?: number;
  /** Aligned spin χ2 of the secondary (default 0). */
  secondarySpin?: number;
}

/** Who made a bank file and how (provenance). */
export interface BankGenerator {
  tool: "chirpsieve";
  version: string;
  arguments: string[];
}

/** A template bank: the templates and the settings they were placed for. */
export interface TemplateBank {
  /** Low-frequency cutoff (Hz) of the match, and reference frequency of the chirp times. */
  fMinHz: number;
  /** Minimal match MM the bank was placed for. */
  matchFloor: number;
  /** Name or table path of the noise curve (as given to psdModelFromSpec / psdModelByName). */
  noiseCurve: string;
  /** Component-mass range [min, max], solar masses. */
  massRangeSolar: [number, number];
  /** Aligned-spin range [min, max] of a spinning bank (spinBank.ts); absent for a non-spinning bank. */
  spinRange?: [number, number];
  totalMassCapSolar?: number;
  massRatioCap?: number;
  /** Fixed upper cutoff (Hz) of the metric integrals, when one was given (otherwise each template's ISCO). */
  fMaxHz?: number;
  templates: Template[];
  generator?: BankGenerator;
}

export interface BuildBankOptions {
  massRangeSolar: [number, number];
  matchFloor: number;
  fMinHz: number;
  psd: PsdModel;
  /** Label stored in the bank for the noise curve (default psd.name). */
  noiseCurve?: string;
  totalMassCapSolar?: number;
  massRatioCap?: number;
  fMaxHz?: number;
  /** Metric variation (λmax/λmin − 1) below which a lattice patch is never split (default 0.05; lattice.ts). */
  tolerance?: number;
  /** Cover thin patches with rows along the band when that needs fewer templates (default true; stripPlacement.ts). */
  bandRows?: boolean;
  /** Refuse (TemplateLimitError) before placing when the estimated count exceeds this (default 1 000 000). */
  templateCap?: number;
}

/**
 * The minimal matches a bank may be placed for: the range over which the template-count estimate was
 * checked against placed banks (within 0.5–2× of the count; test/bank/templateEstimate.test.ts).
 * Ours: below 0.5 a "bank" misses half of the SNR of some signals and the match model is far outside
 * where it was checked; 0.99999 already needs ~10^6 templates for 8–12 M_sun from 40 Hz.
 */
export const MIN_MATCH_FLOOR = 0.5;
export const MAX_MATCH_FLOOR = 0.99999;

/** Default of BuildBankOptions.templateCap: beyond it a CPU scan would take days per hour of data. */
export const DEFAULT_TEMPLATE_CAP = 1_000_000;

/** The estimated template count exceeds the caller's limit (raised before any placement work). */
export class TemplateLimitError extends InputError {
  constructor(
    message: string,
    readonly estimate: number,
    readonly limit: number,
  ) {
    super(message);
  }
}

/**
 * How wide a bank's band must be, as ratios to fMinHz. Over a narrow band the phase barely curves once
 * time and phase are fitted out, so the match hardly tells templates apart: the metric becomes nearly
 * singular and placements fail. Measured (1–3 M_sun, MM 0.97, 400 draws): with a fixed fmax, 30–33 Hz
 * and 40–44 Hz covered only 98.5% and 95.8% of draws and 40–48 Hz 98.8%, while every band of ratio
 * 1.3 tried (20–26, 40–52, 60–78 Hz) covered ≥ 99.8%; with the ISCO as the cutoff only the heaviest
 * corner is narrow, and fmin 666 Hz (ISCO of 6 M_sun / 1.1) covered 100%, while fmin 732 Hz placed no
 * template at all. Ours; common practice, no source.
 */
export const MIN_ISCO_OVER_FMIN = 1.1;
export const MIN_FMAX_OVER_FMIN = 1.3;

/** fMinHz or fMaxHz leaves too narrow a band (see {@link MIN_ISCO_OVER_FMIN}); `detail` omits the option's name. */
export class BandError extends InputError {
  constructor(
    readonly option: "fMinHz" | "fMaxHz",
    detail: string,
  ) {
    super(`${option} ${detail}`, { parameter: option, detail });
  }
}

/** Figures about a placement, for summaries. */
export interface BankPlacementReport {
  templateCount: number;
  patchCount: number;
  /** Lattice points that fell outside the region and were moved onto its boundary. */
  projectedCount: number;
  /** ∫ sqrt(det g) dτ0 dτ3 over the region with the phase metric g (Owen 1996). */
  properArea: number;
  /** The same with the placement metric the lattice was laid with (placementMetric.ts; below properArea where the
   * minimal-match contour reaches beyond the quadratic metric's ellipse, above it where the ISCO cutoff moves). */
  effectiveProperArea: number;
  /** properArea / hexagonal cell area (3√3/2)(1 − MM): the metric-volume estimate of the count. */
  volumeEstimate: number;
  /** effectiveProperArea / hexagonal cell area. */
  effectiveVolumeEstimate: number;
  /** Proper length of the region's boundary under the phase metric. */
  properPerimeter: number;
  /**
   * effectiveVolumeEstimate + the boundary layer ≈ 0.368 × perimeter / sqrt(1 − MM) (metricVolume.ts;
   * perimeter under the effective metric):
   * what a lattice that covers a bounded region must hold; for the long, narrow regions of
   * non-spinning banks the boundary layer is often as large as the area term.
   */
  boundaryAwareEstimate: number;
}

/** Validates the options common to building and sweeping; returns the checked values. */
export function checkBankOptions(options: Omit<BuildBankOptions, "matchFloor"> & { matchFloor?: number }): void {
  checkComponentMassRange(options.massRangeSolar);
  const [mMin, mMax] = options.massRangeSolar;
  if (!(mMin < mMax)) throw parameterError("massRangeSolar", `the minimum ${mMin} M_sun must be below the maximum ${mMax} M_sun`);
  if (options.matchFloor !== undefined && !(options.matchFloor >= MIN_MATCH_FLOOR && options.matchFloor <= MAX_MATCH_FLOOR)) {
    throw parameterError("matchFloor", `must be from ${MIN_MATCH_FLOOR} to ${MAX_MATCH_FLOOR} (got ${options.matchFloor})`);
  }
  const fmin = options.fMinHz;
  if (!(fmin > 0) || !Number.isFinite(fmin)) throw parameterError("fMinHz", `must be a positive number of Hz (got ${fmin})`);
  if (fmin < options.psd.fMinHz) {
    throw parameterError("fMinHz", `${fmin} Hz is below the lowest frequency ${options.psd.fMinHz} Hz of noise curve "${options.psd.name}"`);
  }
  const mTot = options.totalMassCapSolar;
  if (mTot !== undefined && !(mTot > 2 * mMin)) {
    throw new InputError(`totalMassCapSolar must exceed twice the minimum component mass, ${2 * mMin} (got ${mTot})`);
  }
  const q = options.massRatioCap;
  if (q !== undefined && !(q > 1)) throw new InputError(`massRatioCap must be a number above 1 (got ${q})`);
  const heaviest = Math.min(2 * mMax, mTot ?? Infinity);
  const fIsco = iscoFrequencyHz(heaviest);
  const slack = 1 - 1e-9; // so that a typed 1.1 × fmin passes despite rounding
  if (!(fmin * MIN_ISCO_OVER_FMIN * slack <= fIsco)) {
    throw new BandError(
      "fMinHz",
      `${fmin} Hz must be at most ${(fIsco / MIN_ISCO_OVER_FMIN).toFixed(1)} Hz: the heaviest binary in range (total mass ${heaviest} M_sun) ` +
        `ends at its ISCO frequency ${fIsco.toFixed(1)} Hz, and its chirp needs a band up to at least ${MIN_ISCO_OVER_FMIN} × fmin to be told apart`,
    );
  }
  const fmax = options.fMaxHz;
  if (fmax !== undefined && !(fmax >= fmin * MIN_FMAX_OVER_FMIN * slack)) {
    throw new BandError(
      "fMaxHz",
      `${fmax} Hz must be at least ${+(fmin * MIN_FMAX_OVER_FMIN).toFixed(3)} Hz (${MIN_FMAX_OVER_FMIN} × fmin ${fmin} Hz): a narrower band cannot tell the templates apart`,
    );
  }
  if (options.templateCap !== undefined && !(options.templateCap >= 1)) {
    throw new InputError(`templateCap must be a number of at least 1 (got ${options.templateCap})`);
  }
}

/**
 * Builds a bank: hexagonal lattice placement (lattice.ts) over the region in chirp-time coordinates,
 * with the metric of metric.ts for the noise curve and fmin. Templates are sorted by chirp mass, then
 * by primary mass. Same options → same bank.
 */
export function buildBankWithReport(options: BuildBankOptions): { bank: TemplateBank; report: BankPlacementReport } {
  checkBankOptions(options);
  const { fMinHz, psd, matchFloor } = options;
  const [mMin, mMax] = options.massRangeSolar;
  const region = regionOf(options);
  const metric = createChirpTimeMetric({ psd, fMinHz: fMinHz, fMaxHz: options.fMaxHz, pointsPerEFold: 60 });
  const properArea = regionProperArea(region, (t0, t3) => metric.at(t0, t3));
  const cell = hexagonCellArea(matchFloor);
  const properPerimeter = regionProperPerimeter(region, (t0, t3) => metric.at(t0, t3));
  // Refuse before the placement, the only slow part, from the estimate the report gives.
  const effective = effectiveEstimate(region, metric, matchFloor);
  const limit = checkTemplateLimit(options, effective.estimate);
  const chart = createPhaseChart({ psd, fMinHz: fMinHz, fMaxHz: options.fMaxHz, region });
  const placement = placeWithin(limit, options, {
    region,
    metric,
    chart,
    minimalMatch: matchFloor,
    tolerance: options.tolerance,
    bandRows: options.bandRows,
  });
  const templates: Template[] = placement.points.map((p) => {
    const { totalMassSolar, eta } = massEtaFromChirpTimes(p.tau0, p.tau3, fMinHz);
    const e = Math.min(eta, 0.25);
    const c = componentsFromMassEta(totalMassSolar, e);
    return { primaryMassSolar: c.m1, secondaryMassSolar: c.m2, chirpMassSolar: chirpMassFromMassEta(totalMassSolar, e), tau0: p.tau0, tau3: p.tau3 };
  });
  templates.sort((a, b) => a.chirpMassSolar - b.chirpMassSolar || a.primaryMassSolar - b.primaryMassSolar);
  // Never hand back an empty bank as if it covered the region (the band rule above keeps this from
  // happening in every case we know of).
  if (templates.length === 0) {
    throw new InputError(`the placement found no template for ${mMin}–${mMax} M_sun from ${fMinHz} Hz; widen the band or the mass range`);
  }
  const bank = bankRecord(options, templates);
  return {
    bank,
    report: {
      templateCount: templates.length,
      patchCount: placement.patches.length,
      projectedCount: placement.points.filter((p) => p.projected).length,
      properArea,
      effectiveProperArea: effective.area,
      volumeEstimate: properArea / cell,
      effectiveVolumeEstimate: effective.area / cell,
      properPerimeter,
      boundaryAwareEstimate: effective.estimate,
    },
  };
}

/**
 * The area and perimeter of the region under the placement metric (placementMetric.ts: the largest
 * ellipse inside the minimal-match contour, the ISCO cutoff's loss included) and the count a lattice
 * laid with it needs: area over the hexagonal cell (Owen 1996) plus the boundary layer (metricVolume.ts).
 */
function effectiveEstimate(region: MassRegion, metric: ChirpTimeMetric, matchFloor: number): { area: number; perimeter: number; estimate: number } {
  const at = (t0: number, t3: number) => placementMetric(metric.tangent(t0, t3), t0, t3, matchFloor);
  const area = regionProperArea(region, at, 8);
  const perimeter = regionProperPerimeter(region, at, 60);
  return { area, perimeter, estimate: area / hexagonCellArea(matchFloor) + boundaryLayerEstimate(perimeter, matchFloor) };
}

/**
 * The template count a bank over this region needs: the area under the placement metric (the
 * minimal-match contours the lattice follows, including the loss from the templates' different ISCO
 * cutoffs) over the hexagonal cell, plus a lattice's boundary layer. The quadratic metric alone
 * (Owen 1996) misses the cutoff's loss, which is linear in the displacement and so dominates at match
 * floors near 1: there its estimate fell 500× short (8–12 M_sun from 40 Hz at 0.99999: 4.2e3 against
 * 2.1e6 placed). Measured against placed banks from match floor 0.5 to 0.99999 it is within
 * 0.5–2× of the count (test/bank/templateEstimate.test.ts). It takes well under a second for
 * ordinary requests (4 s for 0.1–0.2 M_sun from 30 Hz at 0.5), so absurd requests are refused at once.
 */
export function estimateTemplateCount(options: BuildBankOptions): number {
  checkBankOptions(options);
  const region = regionOf(options);
  const metric = createChirpTimeMetric({ psd: options.psd, fMinHz: options.fMinHz, fMaxHz: options.fMaxHz, pointsPerEFold: 60 });
  return effectiveEstimate(region, metric, options.matchFloor).estimate;
}

/**
 * Throws TemplateLimitError, before any placement work, when the estimated count (by default
 * estimateTemplateCount) exceeds options.templateCap (default DEFAULT_TEMPLATE_CAP); returns the limit.
 */
export function checkTemplateLimit(options: BuildBankOptions, estimate = estimateTemplateCount(options)): number {
  const limit = options.templateCap ?? DEFAULT_TEMPLATE_CAP;
  if (!(estimate <= limit)) throw templateLimitError(options, estimate, limit, "estimated");
  return limit;
}

/** The error for a bank past the limit: by the estimate (before placing) or by the count placed so far. */
function templateLimitError(options: BuildBankOptions, count: number, limit: number, how: "estimated" | "placed"): TemplateLimitError {
  const [mMin, mMax] = options.massRangeSolar;
  const region = `${mMin}–${mMax} M_sun from ${options.fMinHz} Hz at minimal match ${options.matchFloor}`;
  const what = how === "estimated" ? `needs about ${Number.isFinite(count) ? count.toPrecision(2) : String(count)} templates` : `needed more than ${count} templates (placement stopped there)`;
  return new TemplateLimitError(`${region} ${what}, more than the limit of ${limit}`, count, limit);
}

/** Places the lattice, stopping past `limit` templates (TemplateLimitError) whatever the estimate said. */
function placeWithin(limit: number, options: BuildBankOptions, lattice: Omit<LatticeOptions, "maxPoints">): LatticePlacement {
  try {
    return placeA2Lattice({ ...lattice, maxPoints: limit });
  } catch (err) {
    if (err instanceof PlacementStopped) throw templateLimitError(options, err.placed, limit, "placed");
    throw err;
  }
}

/** The mass region the options describe. */
function regionOf(options: BuildBankOptions): MassRegion {
  const [mMin, mMax] = options.massRangeSolar;
  return createMassRegion(
    { minMassSolar: mMin, maxMassSolar: mMax, totalMassCapSolar: options.totalMassCapSolar, massRatioCap: options.massRatioCap },
    options.fMinHz,
  );
}

/** Builds a bank (see {@link buildBankWithReport}). */
export function buildBank(options: BuildBankOptions): TemplateBank {
  return buildBankWithReport(options).bank;
}

/** The bank a placement returns: its settings as built (region, caps, band, noise curve) and its templates. */
export function bankRecord(options: BuildBankOptions, templates: Template[], spinRange?: [number, number]): TemplateBank {
  const [mMin, mMax] = options.massRangeSolar;
  return {
    fMinHz: options.fMinHz,
    matchFloor: options.matchFloor,
    noiseCurve: options.noiseCurve ?? options.psd.name,
    massRangeSolar: [mMin, mMax],
    ...(spinRange ? { spinRange: [spinRange[0], spinRange[1]] as [number, number] } : {}),
    ...(options.totalMassCapSolar !== undefined ? { totalMassCapSolar: options.totalMassCapSolar } : {}),
    ...(options.massRatioCap !== undefined ? { massRatioCap: options.massRatioCap } : {}),
    ...(options.fMaxHz !== undefined ? { fMaxHz: options.fMaxHz } : {}),
    templates,
  };
}

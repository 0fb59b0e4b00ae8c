// The JSON document of a `recover` campaign (fixed key order; documented in the README) and its
// plain-text rendering. Formatting only: every figure comes from @chirpsieve/core.
import type {
  CampaignLayout,
  CampaignSummary,
  ErrorSpread,
  FalseCandidate,
  InjectionOutcome,
  RequirementResult,
} from "@chirpsieve/core";

/** Said wherever campaign results are shown. */
export const CAMPAIGN_CAUTION =
  "Recovered injections are simulated signals added to the data by this program, not detections of real sources.";

/** Version of the JSON layout below; bumped when a field changes meaning or place. */
export const CAMPAIGN_FORMAT = 1;

export interface CampaignPopulationDescription {
  count: number;
  massRangeSolar: [number, number];
  snrRange: [number, number] | null;
  distanceRangeMpc: [number, number] | null;
  distanceDistribution: "volume" | "uniform" | null;
  /** Aligned spins: each body's χ uniform and independent in this range (absent: non-spinning injections). */
  spinRange?: [number, number];
  seed: string;
  detector: string;
  fMinHz: number;
  noise: string;
  synthetic: boolean;
}

export interface CampaignDocument {
  format: number;
  version: string;
  arguments: Record<string, unknown>;
  population: CampaignPopulationDescription;
  layout: { batches: number; injectionsPerBatch: number; batchSeconds: number; marginSeconds: number; gapSeconds: number; matchWindowSeconds: number; sampleRate: number };
  summary: CampaignSummary;
  injections: InjectionOutcome[];
  falseCandidates: FalseCandidate[];
  requirements: RequirementResult[];
  caution: string;
  /** Not diffable: wall time and how the run went. */
  run: { wallSeconds: number; resumedBatches: number; stateFile: string | null };
  /** The bank's templates whose inspiral carries less than the floor of their signal's SNR (inspiralEdge.ts). */
  inspiralEdge?: unknown;
}

function r(x: number | null, digits: number): number | null {
  if (x === null || !Number.isFinite(x)) return x;
  const p = 10 ** digits;
  return Math.round(x * p) / p;
}

/** Rounds to `sig` significant digits (for quantities of any scale). */
function sig(x: number | null, digits: number): number | null {
  if (x === null || !Number.isFinite(x) || x === 0) return x;
  return Number(x.toPrecision(digits));
}

function spread(s: ErrorSpread | null, round: (x: number) => number | null): ErrorSpread | null {
  if (!s) return null;
  return { median: round(s.median)!, p05: round(s.p05)!, p95: round(s.p95)!, medianAbsolute: round(s.medianAbsolute)! };
}

/**
 * Assembles the campaign's JSON document with a fixed key order, numbers rounded to what they
 * mean (times to 1 µs or 0.1 µs for errors, SNRs to 1e-4, efficiencies to 1e-6), so that two runs
 * with the same arguments give the same bytes outside "run".
 */
export function campaignDocument(input: {
  version: string;
  args: Record<string, unknown>;
  population: CampaignPopulationDescription;
  layout: CampaignLayout;
  summary: CampaignSummary;
  outcomes: readonly InjectionOutcome[];
  falseCandidates: readonly FalseCandidate[];
  requirements: readonly RequirementResult[];
  run: CampaignDocument["run"];
  inspiralEdge?: unknown;
}): CampaignDocument {
  const s = input.summary;
  const e6 = (x: number | null) => r(x, 6);
  const summary: CampaignSummary = {
    injections: s.injections,
    found: s.found,
    missed: s.missed,
    efficiency: e6(s.efficiency),
    efficiencyLower: e6(s.efficiencyLower),
    efficiencyUpper: e6(s.efficiencyUpper),
    interval: s.interval,
    efficiencyBySnr: s.efficiencyBySnr.map((b) => ({ ...b, efficiency: e6(b.efficiency), lower: e6(b.lower), upper: e6(b.upper) })),
    snr50: r(s.snr50, 4),
    efficiencyByDistance: s.efficiencyByDistance.map((b) => ({
      distanceLowMpc: r(b.distanceLowMpc, 4)!,
      distanceHighMpc: r(b.distanceHighMpc, 4)!,
      found: b.found,
      total: b.total,
      efficiency: e6(b.efficiency),
      lower: e6(b.lower),
      upper: e6(b.upper),
    })),
    distance50Mpc: r(s.distance50Mpc, 4),
    sensitiveVolumeMpc3: sig(s.sensitiveVolumeMpc3, 6),
    sensitiveVolumeErrorMpc3: sig(s.sensitiveVolumeErrorMpc3, 6),
    volumeMethod: s.volumeMethod,
    chirpMassError: spread(s.chirpMassError, (x) => r(x, 8)),
    timeErrorSeconds: spread(s.timeErrorSeconds, (x) => r(x, 7)),
    snrRatio: spread(s.snrRatio, (x) => r(x, 5)),
    falseCandidates: s.falseCandidates,
    analysedSeconds: r(s.analysedSeconds, 3)!,
  };
  const injections: InjectionOutcome[] = input.outcomes.map((o) => ({
    index: o.index,
    batch: o.batch,
    primaryMassSolar: r(o.primaryMassSolar, 6)!,
    secondaryMassSolar: r(o.secondaryMassSolar, 6)!,
    chirpMassSolar: r(o.chirpMassSolar, 6)!,
    coalescenceTime: r(o.coalescenceTime, 6)!,
    arrivalTime: r(o.arrivalTime, 6)!,
    distanceMpc: sig(o.distanceMpc, 6)!,
    inclination: r(o.inclination, 5)!,
    rightAscension: r(o.rightAscension, 5)!,
    declination: r(o.declination, 5)!,
    polarisation: r(o.polarisation, 5)!,
    phase: r(o.phase, 5)!,
    optimalSnr: r(o.optimalSnr, 4)!,
    found: o.found,
    recoveredSnr: r(o.recoveredSnr, 4),
    reweightedSnr: r(o.reweightedSnr, 4),
    recoveredChirpMassSolar: r(o.recoveredChirpMassSolar, 6),
    chirpMassError: r(o.chirpMassError, 8),
    timeError: r(o.timeError, 7),
    ...(o.primarySpin !== undefined ? { primarySpin: r(o.primarySpin, 5)!, secondarySpin: r(o.secondarySpin ?? 0, 5)! } : {}),
  }));
  const falseCandidates: FalseCandidate[] = input.falseCandidates.map((c) => ({
    batch: c.batch,
    coalescenceTime: r(c.coalescenceTime, 6)!,
    snr: r(c.snr, 4)!,
    reweightedSnr: r(c.reweightedSnr, 4)!,
    chirpMassSolar: r(c.chirpMassSolar, 6)!,
  }));
  const l = input.layout;
  return {
    format: CAMPAIGN_FORMAT,
    version: input.version,
    arguments: input.args,
    population: input.population,
    layout: {
      batches: l.batches,
      injectionsPerBatch: l.injectionsPerBatch,
      batchSeconds: l.batchSeconds,
      marginSeconds: r(l.marginSeconds, 3)!,
      gapSeconds: l.gapSeconds,
      matchWindowSeconds: l.matchWindowSeconds,
      sampleRate: l.sampleRate,
    },
    summary,
    injections,
    falseCandidates,
    requirements: input.requirements.map((q) => ({ rule: q.rule, met: q.met, value: sig(q.value, 6), threshold: q.threshold, detail: q.detail })),
    caution: CAMPAIGN_CAUTION,
    run: { wallSeconds: r(input.run.wallSeconds, 2)!, resumedBatches: input.run.resumedBatches, stateFile: input.run.stateFile },
    ...(input.inspiralEdge !== undefined ? { inspiralEdge: input.inspiralEdge } : {}),
  };
}

function pct(x: number | null): string {
  // Three significant digits: chirp-mass errors are often well below 0.1%.
  return x === null ? "-" : `${Number((100 * x).toPrecision(3))}%`;
}

function eff(found: number, total: number, e: number | null, lo: number | null, hi: number | null): string {
  return total === 0 ? "   -" : `${found}/${total} ${e!.toFixed(2)} [${lo!.toFixed(2)}, ${hi!.toFixed(2)}]`;
}

/** A few lines for a person at a terminal. */
export function formatCampaignText(doc: CampaignDocument): string {
  const s = doc.summary;
  const p = doc.population;
  const out: string[] = [];
  out.push(
    `recover: ${s.injections} injections of ${p.massRangeSolar.join("–")} M_sun` +
      (p.spinRange ? ` (aligned spins uniform in ${p.spinRange.join(" to ")})` : "") +
      ` into ${p.noise}, ${doc.layout.batches} batch(es) on ${p.detector}`,
  );
  out.push(`found ${s.found}, missed ${s.missed}: efficiency ${s.efficiency === null ? "-" : s.efficiency.toFixed(3)} [${s.efficiencyLower?.toFixed(3)}, ${s.efficiencyUpper?.toFixed(3)}] (${s.interval})`);
  out.push("efficiency by optimal SNR:");
  for (const b of s.efficiencyBySnr) out.push(`  SNR ${String(b.snrLow).padStart(3)}–${String(b.snrHigh).padEnd(3)}  ${eff(b.found, b.total, b.efficiency, b.lower, b.upper)}`);
  out.push(`50% efficiency at optimal SNR ${s.snr50 === null ? "- (no crossing in range)" : s.snr50.toFixed(2)}`);
  out.push("efficiency by distance:");
  for (const b of s.efficiencyByDistance) {
    out.push(`  ${b.distanceLowMpc.toFixed(1).padStart(7)}–${b.distanceHighMpc.toFixed(1).padEnd(7)} Mpc  ${eff(b.found, b.total, b.efficiency, b.lower, b.upper)}`);
  }
  if (p.distanceRangeMpc) {
    out.push(`50% efficiency at ${s.distance50Mpc === null ? "- (no crossing in range)" : `${s.distance50Mpc.toFixed(1)} Mpc`}`);
    out.push(`sensitive volume ${s.sensitiveVolumeMpc3?.toPrecision(4)} ± ${s.sensitiveVolumeErrorMpc3?.toPrecision(2)} Mpc³ (Monte Carlo)`);
  }
  if (s.chirpMassError) {
    const c = s.chirpMassError;
    out.push(`chirp-mass error: median ${pct(c.median)}, 5–95% [${pct(c.p05)}, ${pct(c.p95)}], median |error| ${pct(c.medianAbsolute)}`);
  }
  if (s.timeErrorSeconds) {
    const t = s.timeErrorSeconds;
    const ms = (x: number) => `${(1000 * x).toFixed(2)} ms`;
    out.push(`time error: median ${ms(t.median)}, 5–95% [${ms(t.p05)}, ${ms(t.p95)}], median |error| ${ms(t.medianAbsolute)}`);
  }
  if (s.snrRatio) out.push(`recovered/optimal SNR: median ${s.snrRatio.median.toFixed(3)}, 5–95% [${s.snrRatio.p05.toFixed(3)}, ${s.snrRatio.p95.toFixed(3)}]`);
  out.push(`false candidates (matched to no injection): ${s.falseCandidates}`);
  for (const q of doc.requirements) out.push(`requirement ${q.rule}: ${q.met ? "met" : "NOT MET"} (${q.detail})`);
  out.push(doc.caution);
  if (p.synthetic) out.push("The data are synthetic: simulated Gaussian noise with simulated signals.");
  return `${out.join("\n")}\n`;
}

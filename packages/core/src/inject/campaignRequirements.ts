import { InputError } from "../errors.js";
import type { InjectionOutcome } from "./campaign.js";
import type { CampaignSummary } from "./campaignSummary.js";

/** One pass/fail rule on a campaign's results. */
export type Requirement =
  | { kind: "efficiency-snr"; rule: string; threshold: number; snrMin: number }
  | { kind: "efficiency-distance"; rule: string; threshold: number; distanceMaxMpc: number }
  | { kind: "chirp-mass-error"; rule: string; threshold: number }
  | { kind: "time-error"; rule: string; threshold: number }
  | { kind: "false-candidates"; rule: string; threshold: number };

/** A rule checked against a campaign. */
export interface RequirementResult {
  rule: string;
  met: boolean;
  /** The measured value (null when there was nothing to measure, which fails the rule). */
  value: number | null;
  threshold: number;
  /** One line: what was measured and by how much it missed or met the threshold. */
  detail: string;
}

/** The rule grammar, for messages. */
export const REQUIREMENT_GRAMMAR =
  "efficiency>=X@snr>=Y, efficiency>=X@distance<=D, chirp-mass-error<=E, time-error<=T or false-candidates<=N";

const NUM = "([+]?(?:\\d+\\.?\\d*|\\.\\d+)(?:[eE][+-]?\\d+)?)";

/**
 * Parses one rule of our own small grammar (spaces allowed around the symbols):
 * `efficiency>=X@snr>=Y` (found fraction of injections with optimal SNR ≥ Y is at least X),
 * `efficiency>=X@distance<=D` (of injections within D Mpc), `chirp-mass-error<=E` (median
 * absolute relative chirp-mass error), `time-error<=T` (median absolute coalescence-time error,
 * s), `false-candidates<=N` (candidates matched to no injection).
 */
export function parseRequirement(text: string): Requirement {
  const rule = String(text).replace(/\s+/g, "");
  let m = new RegExp(`^efficiency>=${NUM}@snr>=${NUM}$`).exec(rule);
  if (m) {
    const threshold = Number(m[1]);
    if (threshold > 1) throw new InputError(`requirement "${text}": efficiency must be at most 1 (got ${m[1]})`);
    return { kind: "efficiency-snr", rule, threshold, snrMin: Number(m[2]) };
  }
  m = new RegExp(`^efficiency>=${NUM}@distance<=${NUM}$`).exec(rule);
  if (m) {
    const threshold = Number(m[1]);
    if (threshold > 1) throw new InputError(`requirement "${text}": efficiency must be at most 1 (got ${m[1]})`);
    if (!(Number(m[2]) > 0)) throw new InputError(`requirement "${text}": distance must be positive`);
    return { kind: "efficiency-distance", rule, threshold, distanceMaxMpc: Number(m[2]) };
  }
  m = new RegExp(`^(chirp-mass-error|time-error|false-candidates)<=${NUM}$`).exec(rule);
  if (m) {
    const threshold = Number(m[2]);
    if (m[1] === "false-candidates" && !Number.isInteger(threshold)) {
      throw new InputError(`requirement "${text}": false-candidates needs a whole number`);
    }
    return { kind: m[1] as "chirp-mass-error" | "time-error" | "false-candidates", rule, threshold };
  }
  throw new InputError(`requirement "${text}" is not understood; expected ${REQUIREMENT_GRAMMAR}`);
}

function fmt(x: number): string {
  return Number.isInteger(x) ? String(x) : x.toPrecision(4).replace(/\.?0+$/, "");
}

function atLeast(r: Requirement, value: number | null, what: string): RequirementResult {
  if (value === null) return { rule: r.rule, met: false, value, threshold: r.threshold, detail: `${what}: nothing to measure` };
  const met = value >= r.threshold;
  const diff = Math.abs(value - r.threshold);
  return { rule: r.rule, met, value, threshold: r.threshold, detail: `${what} is ${fmt(diff)} ${met ? "above" : "below"} ${fmt(r.threshold)}` };
}

function atMost(r: Requirement, value: number | null, what: string): RequirementResult {
  if (value === null) return { rule: r.rule, met: false, value, threshold: r.threshold, detail: `${what}: nothing to measure` };
  const met = value <= r.threshold;
  const diff = Math.abs(value - r.threshold);
  return { rule: r.rule, met, value, threshold: r.threshold, detail: `${what} is ${fmt(diff)} ${met ? "below" : "above"} ${fmt(r.threshold)}` };
}

function efficiencyOf(outcomes: readonly InjectionOutcome[], keep: (o: InjectionOutcome) => boolean): { found: number; total: number } {
  const sel = outcomes.filter(keep);
  return { found: sel.filter((o) => o.found).length, total: sel.length };
}

/** Checks each rule against the campaign's outcomes and summary. */
export function evaluateRequirements(
  requirements: readonly Requirement[],
  outcomes: readonly InjectionOutcome[],
  summary: CampaignSummary,
): RequirementResult[] {
  return requirements.map((r) => {
    switch (r.kind) {
      case "efficiency-snr": {
        const { found, total } = efficiencyOf(outcomes, (o) => o.optimalSnr >= r.snrMin);
        const v = total ? found / total : null;
        return atLeast(r, v, `efficiency ${v === null ? "-" : fmt(v)} (${found} of ${total} injections with optimal SNR ≥ ${fmt(r.snrMin)})`);
      }
      case "efficiency-distance": {
        const { found, total } = efficiencyOf(outcomes, (o) => o.distanceMpc <= r.distanceMaxMpc);
        const v = total ? found / total : null;
        return atLeast(r, v, `efficiency ${v === null ? "-" : fmt(v)} (${found} of ${total} injections within ${fmt(r.distanceMaxMpc)} Mpc)`);
      }
      case "chirp-mass-error": {
        const v = summary.chirpMassError?.medianAbsolute ?? null;
        return atMost(r, v, `median |chirp-mass error| ${v === null ? "-" : fmt(v)}`);
      }
      case "time-error": {
        const v = summary.timeErrorSeconds?.medianAbsolute ?? null;
        return atMost(r, v, `median |time error| ${v === null ? "-" : `${fmt(v)} s`}`);
      }
      case "false-candidates":
        return atMost(r, summary.falseCandidates, `${summary.falseCandidates} false candidate(s)`);
    }
  });
}

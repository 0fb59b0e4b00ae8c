import { InputError, parameterError } from "../errors.js";
import type { Candidate } from "../search/types.js";
import type { Detector } from "../waveform/antenna.js";
import { type CoincidenceRule, type RawCoincidence, type SiteTriggerArrays, formCoincidences } from "./coincidence.js";
import { type FalseAlarm, countAbove, countAtLeast, falseAlarmFromCount } from "./falseAlarm.js";
import { type SitePairDelay, interSiteDelay } from "./interSiteDelay.js";
import { maxSlidesPerSide, slideOnRing, slideShiftSeconds } from "./timeSlides.js";

/** The candidate fields coincidence needs (a search Candidate has them all). */
export type CoincidenceCandidate = Pick<
  Candidate,
  "coalescenceTime" | "snr" | "reweightedSnr" | "chi2" | "chi2Dof" | "effectiveDistanceMpc" | "templateIndex" | "chirpMassSolar"
>;

/** One site's scan: its detector, its candidates and what its scan covered. */
export interface SiteTriggers<T extends CoincidenceCandidate = Candidate> {
  /** The site's detector (its name names the site in the output). */
  detector: Detector;
  candidates: readonly T[];
  /** Seconds of data the scan searched (SearchSummary.analysedSeconds). */
  analysedSeconds: number;
  /** Time of the site's first sample and the end of its data (s, the shared time base). */
  startTime: number;
  endTime: number;
}

/** Settings of {@link analyseCoincidences}; every field has a default. */
export interface CoincidenceOptions {
  /** Added to each pair's light-travel time to make the coincidence window (s, default 0.005). */
  timingToleranceSeconds?: number;
  /**
   * Relative chirp-mass tolerance for triggers of different templates (default 0.05: the same
   * template always matches; other templates when |ΔM| ≤ 5 % of the mean chirp mass; 0 = same
   * template only).
   */
  chirpMassTolerance?: number;
  /** Keep the loudest coincidence within ± this many seconds (default 1). */
  loudestWithinSeconds?: number;
  /** Time-slide step (s, default 7); must exceed twice the largest coincidence window. */
  slideStepSeconds?: number;
  /** Slides on each side of zero (default 100), capped by what the span allows ({@link maxSlidesPerSide}). */
  slidesPerSide?: number;
  /** Coincident analysed time (s); default the smallest analysedSeconds of the sites. */
  foregroundSeconds?: number;
}

/** One site's part in a coincidence. */
export interface CoincidenceMember {
  snr: number;
  reweightedSnr: number;
  coalescenceTime: number;
  chi2: number;
  chi2Dof: number;
  effectiveDistanceMpc: number;
  templateIndex: number;
  chirpMassSolar: number;
}

/** A coincidence of two or more sites, ranked by network reweighted SNR, with its false-alarm rate. */
export interface Coincidence extends FalseAlarm {
  /** Coalescence time at the reference site (the first site of the network list taking part). */
  coalescenceTime: number;
  referenceSite: string;
  /** Network reweighted SNR √(Σ ρ̂²) over the sites taking part. */
  rankingStatistic: number;
  /** The members, keyed by site name, in network order. */
  sites: Record<string, CoincidenceMember>;
  /** Template index and chirp mass (M_sun) of the reference site's member. */
  templateIndex: number;
  chirpMassSolar: number;
  falseAlarmRateSource: "time-slides";
  /** Background coincidences (all slides) at least as loud. */
  backgroundLouder: number;
  /** Number of time slides the background came from. */
  slides: number;
}

/** A candidate that took part in no coincidence, with a rate from its own site's triggers. */
export type SingleSiteCandidate<T extends CoincidenceCandidate = Candidate> = T &
  FalseAlarm & {
    site: string;
    falseAlarmRateSource: "single-site-trigger-rate";
    /** The site's candidates louder (in reweighted SNR) than this one. */
    louderAtSite: number;
  };

/** What a coincidence analysis covered. */
export interface CoincidenceSummary {
  sites: string[];
  referenceSite: string;
  /** The ring the slides turn on: the span all sites' data share (s). */
  startTime: number;
  endTime: number;
  rankingStatistic: string;
  timingToleranceSeconds: number;
  chirpMassTolerance: number;
  loudestWithinSeconds: number;
  interSiteDelays: SitePairDelay[];
  slideStepSeconds: number;
  slidesPerSide: number;
  /** Number of background slides, 2 × slidesPerSide. */
  slides: number;
  foregroundSeconds: number;
  /** Background livetime: slides × foregroundSeconds. */
  backgroundSeconds: number;
  coincidences: number;
  backgroundCoincidences: number;
  /** The smallest rate the background can resolve, 1 / backgroundSeconds, per year. */
  falseAlarmRateLimitPerYear: number;
}

export interface CoincidenceResult<T extends CoincidenceCandidate = Candidate> {
  /** Foreground coincidences, in time order. */
  coincidences: Coincidence[];
  /** Candidates in no foreground coincidence, per site in network order, each in time order. */
  singles: SingleSiteCandidate<T>[];
  summary: CoincidenceSummary;
  /** Ranking statistics of all background coincidences, ascending. */
  background: Float64Array;
}

/** Description of the ranking statistic, as reported in summaries. */
export const RANKING_STATISTIC = "network reweighted SNR: sqrt of the sum over sites of the squared reweighted SNR";

/**
 * Multi-site coincidence with a time-slide background.
 *
 * 1. Coincidence (slide 0): triggers of two or more sites, at most one per site, pairwise within
 *    the light-travel time of their sites plus `timingToleranceSeconds`, and pairwise from the same
 *    template or within `chirpMassTolerance`; ranked by network reweighted SNR and clustered
 *    (loudest within ± loudestWithinSeconds) — see {@link formCoincidences}.
 * 2. Background: the same on time-slid triggers. The ring is the span every site's data covers;
 *    in slide k the site at network position j is moved by k · j · step (see
 *    {@link slideShiftSeconds}), k = ±1…±K, K = min(slidesPerSide, {@link maxSlidesPerSide}).
 *    Background livetime T_bg = 2K · T_fg, with T_fg the coincident analysed time (by default the
 *    smallest analysedSeconds of the sites: exact when all sites searched the same span with the
 *    same segment plan, an approximation otherwise). Coincidences straddling the ring's seam are
 *    not formed (a loss of about one window per slide).
 * 3. False alarms: each foreground coincidence's FAR = N / T_bg with N the background coincidences
 *    at least as loud; N = 0 gives the flagged upper limit 1 / T_bg; FAP = 1 − exp(−FAR · T_fg)
 *    ({@link falseAlarmFromCount}). Candidates in no foreground coincidence get a single-site rate:
 *    the number of their own site's candidates with larger reweighted SNR over that site's
 *    analysedSeconds (upper limit 1 / T_site when none is louder), FAP over T_site.
 *
 * Candidates outside the shared span take no part in coincidences but are listed as singles.
 */
export function analyseCoincidences<T extends CoincidenceCandidate>(
  network: readonly SiteTriggers<T>[],
  options: CoincidenceOptions = {},
): CoincidenceResult<T> {
  const o = checkOptions(options);
  checkNetwork(network);
  const n = network.length;
  const names = network.map((s) => s.detector.name);
  const ringStart = Math.max(...network.map((s) => s.startTime));
  const ringEnd = Math.min(...network.map((s) => s.endTime));
  if (!(ringEnd > ringStart)) {
    throw new InputError(`the sites' data share no time (latest start ${ringStart} s, earliest end ${ringEnd} s)`);
  }
  const ring = ringEnd - ringStart;
  const pairs: SitePairDelay[] = [];
  const windows = new Float64Array(n * n);
  let widest = 0;
  for (let a = 0; a < n; a++) {
    for (let b = a + 1; b < n; b++) {
      const ltt = interSiteDelay(network[a].detector, network[b].detector);
      pairs.push({ sites: [names[a], names[b]], seconds: ltt });
      windows[a * n + b] = windows[b * n + a] = ltt + o.timingTolerance;
      widest = Math.max(widest, ltt + o.timingTolerance);
    }
  }
  if (!(o.slideStep > 2 * widest)) {
    throw new InputError(
      `slide step ${o.slideStep} s must exceed twice the widest coincidence window (${(2 * widest).toFixed(4)} s)`,
    );
  }
  const perSide = Math.min(o.slidesPerSide, maxSlidesPerSide(ring, o.slideStep, n));
  if (perSide < 1) {
    throw new InputError(
      `the shared span of ${ring.toFixed(1)} s is too short for time slides of ${o.slideStep} s between ${n} sites (use a shorter slide step or longer data)`,
    );
  }
  const foreground = Math.min(o.foregroundSeconds ?? Math.min(...network.map((s) => s.analysedSeconds)), ring);
  const rule: CoincidenceRule = { windows, chirpMassTolerance: o.chirpMassTolerance };

  // Base arrays per site: triggers inside the ring, ascending ring time.
  const base = network.map((s) => toArrays(s.candidates, ringStart, ringEnd));

  const fg = formCoincidences(base.map((b) => b.arrays), rule, o.loudestWithin);

  // The reference site never moves; the others get rotated copies (base index = identity, so the
  // rotation's positions are the base arrays' trigger indices).
  const slid = base.map((b, j) =>
    j === 0
      ? b.arrays
      : {
          times: new Float64Array(b.arrays.times.length),
          index: new Int32Array(b.arrays.times.length),
          rank: b.arrays.rank,
          template: b.arrays.template,
          chirpMassSolar: b.arrays.chirpMassSolar,
        },
  );
  const stats: number[] = [];
  for (let k = -perSide; k <= perSide; k++) {
    if (k === 0) continue;
    for (let j = 1; j < n; j++) {
      slideOnRing(base[j].arrays.times, slideShiftSeconds(k, j, o.slideStep), ring, slid[j].times, slid[j].index);
    }
    for (const c of formCoincidences(slid, rule, o.loudestWithin)) stats.push(c.snr);
  }
  const background = Float64Array.from(stats).sort();
  const slides = 2 * perSide;
  const backgroundSeconds = slides * foreground;

  const used = network.map((s) => new Uint8Array(s.candidates.length));
  const coincidences = fg.map((c) => toRecord(c, network, base, used, names, background, backgroundSeconds, foreground, slides));

  const singles: SingleSiteCandidate<T>[] = [];
  network.forEach((s, j) => {
    const ranks = Float64Array.from(s.candidates, (c) => c.reweightedSnr).sort();
    const order = s.candidates.map((_, i) => i).sort((a, b) => s.candidates[a].coalescenceTime - s.candidates[b].coalescenceTime || a - b);
    for (const i of order) {
      if (used[j][i]) continue;
      const c = s.candidates[i];
      const louder = countAbove(ranks, c.reweightedSnr);
      const fa = falseAlarmFromCount(louder, s.analysedSeconds, s.analysedSeconds);
      const single = Object.assign({}, c) as SingleSiteCandidate<T>;
      single.site = names[j];
      single.falseAlarmRatePerYear = fa.falseAlarmRatePerYear;
      single.falseAlarmRateIsUpperLimit = fa.falseAlarmRateIsUpperLimit;
      single.falseAlarmProbability = fa.falseAlarmProbability;
      single.falseAlarmRateSource = "single-site-trigger-rate";
      single.louderAtSite = louder;
      singles.push(single);
    }
  });

  return {
    coincidences,
    singles,
    background,
    summary: {
      sites: names,
      referenceSite: names[0],
      startTime: ringStart,
      endTime: ringEnd,
      rankingStatistic: RANKING_STATISTIC,
      timingToleranceSeconds: o.timingTolerance,
      chirpMassTolerance: o.chirpMassTolerance,
      loudestWithinSeconds: o.loudestWithin,
      interSiteDelays: pairs,
      slideStepSeconds: o.slideStep,
      slidesPerSide: perSide,
      slides,
      foregroundSeconds: foreground,
      backgroundSeconds,
      coincidences: coincidences.length,
      backgroundCoincidences: background.length,
      falseAlarmRateLimitPerYear: falseAlarmFromCount(0, backgroundSeconds, foreground).falseAlarmRatePerYear,
    },
  };
}

interface BaseArrays {
  arrays: SiteTriggerArrays;
  /** Position in `arrays` → index in the site's candidate list. */
  candidateIndex: Int32Array;
}

/** The site's candidates inside [ringStart, ringEnd) as engine arrays, ascending ring time. */
function toArrays(candidates: readonly CoincidenceCandidate[], ringStart: number, ringEnd: number): BaseArrays {
  const inside: number[] = [];
  candidates.forEach((c, i) => {
    if (c.coalescenceTime >= ringStart && c.coalescenceTime < ringEnd) inside.push(i);
  });
  inside.sort((a, b) => candidates[a].coalescenceTime - candidates[b].coalescenceTime || a - b);
  const m = inside.length;
  const arrays: SiteTriggerArrays = {
    times: new Float64Array(m),
    index: new Int32Array(m),
    rank: new Float64Array(m),
    template: new Int32Array(m),
    chirpMassSolar: new Float64Array(m),
  };
  for (let p = 0; p < m; p++) {
    const c = candidates[inside[p]];
    arrays.times[p] = c.coalescenceTime - ringStart;
    arrays.index[p] = p;
    arrays.rank[p] = c.reweightedSnr;
    arrays.template[p] = c.templateIndex;
    arrays.chirpMassSolar[p] = c.chirpMassSolar;
  }
  return { arrays, candidateIndex: Int32Array.from(inside) };
}

function toRecord<T extends CoincidenceCandidate>(
  c: RawCoincidence,
  network: readonly SiteTriggers<T>[],
  base: readonly BaseArrays[],
  used: Uint8Array[],
  names: string[],
  background: Float64Array,
  backgroundSeconds: number,
  foreground: number,
  slides: number,
): Coincidence {
  const sites: Record<string, CoincidenceMember> = {};
  let ref: CoincidenceCandidate | undefined;
  let refName = "";
  for (let j = 0; j < network.length; j++) {
    const p = c.members[j];
    if (p < 0) continue;
    const ci = base[j].candidateIndex[p];
    used[j][ci] = 1;
    const m = network[j].candidates[ci];
    if (ref === undefined) {
      ref = m;
      refName = names[j];
    }
    sites[names[j]] = {
      snr: m.snr,
      reweightedSnr: m.reweightedSnr,
      coalescenceTime: m.coalescenceTime,
      chi2: m.chi2,
      chi2Dof: m.chi2Dof,
      effectiveDistanceMpc: m.effectiveDistanceMpc,
      templateIndex: m.templateIndex,
      chirpMassSolar: m.chirpMassSolar,
    };
  }
  const r = ref as CoincidenceCandidate;
  const louder = countAtLeast(background, c.snr);
  return {
    coalescenceTime: r.coalescenceTime,
    referenceSite: refName,
    rankingStatistic: c.snr,
    sites,
    templateIndex: r.templateIndex,
    chirpMassSolar: r.chirpMassSolar,
    ...falseAlarmFromCount(louder, backgroundSeconds, foreground),
    falseAlarmRateSource: "time-slides",
    backgroundLouder: louder,
    slides,
  };
}

interface CheckedOptions {
  timingTolerance: number;
  chirpMassTolerance: number;
  loudestWithin: number;
  slideStep: number;
  slidesPerSide: number;
  foregroundSeconds?: number;
}

function checkOptions(o: CoincidenceOptions): CheckedOptions {
  const pick = (key: keyof CoincidenceOptions, fallback: number, ok: (x: number) => boolean, what: string): number => {
    const x = o[key] ?? fallback;
    if (typeof x !== "number" || !Number.isFinite(x) || !ok(x)) throw parameterError(key, `must be ${what} (got ${x})`);
    return x;
  };
  const foreground = o.foregroundSeconds;
  if (foreground !== undefined && !(foreground > 0 && Number.isFinite(foreground))) {
    throw new InputError(`foregroundSeconds must be a positive number of seconds (got ${foreground})`);
  }
  return {
    timingTolerance: pick("timingToleranceSeconds", 0.005, (x) => x >= 0, "a non-negative number of seconds"),
    chirpMassTolerance: pick("chirpMassTolerance", 0.05, (x) => x >= 0 && x < 1, "a fraction in [0, 1)"),
    loudestWithin: pick("loudestWithinSeconds", 1, (x) => x > 0, "a positive number of seconds"),
    slideStep: pick("slideStepSeconds", 7, (x) => x > 0, "a positive number of seconds"),
    slidesPerSide: pick("slidesPerSide", 100, (x) => Number.isInteger(x) && x >= 1, "a whole number ≥ 1"),
    foregroundSeconds: foreground,
  };
}

function checkNetwork(network: readonly SiteTriggers<CoincidenceCandidate>[]): void {
  if (network.length < 2) throw new InputError(`coincidence needs at least two sites (got ${network.length})`);
  const seen = new Set<string>();
  for (const s of network) {
    const name = s.detector.name;
    if (seen.has(name)) throw new InputError(`site "${name}" is listed twice`);
    seen.add(name);
    if (!(s.analysedSeconds > 0) || !Number.isFinite(s.analysedSeconds)) {
      throw new InputError(`site "${name}": analysedSeconds must be a positive number (got ${s.analysedSeconds})`);
    }
    if (!Number.isFinite(s.startTime) || !Number.isFinite(s.endTime) || !(s.endTime > s.startTime)) {
      throw new InputError(`site "${name}": the data span must have finite startTime < endTime (got ${s.startTime}, ${s.endTime})`);
    }
    s.candidates.forEach((c, i) => {
      if (!Number.isFinite(c.coalescenceTime) || !Number.isFinite(c.reweightedSnr)) {
        throw new InputError(`site "${name}": candidate ${i} needs a finite coalescenceTime and reweightedSnr`);
      }
      if (!Number.isInteger(c.templateIndex) || c.templateIndex < 0) {
        throw new InputError(`site "${name}": candidate ${i}: templateIndex must be a whole number ≥ 0 (got ${c.templateIndex})`);
      }
      if (!(c.chirpMassSolar > 0)) throw new InputError(`site "${name}": candidate ${i}: chirpMassSolar must be positive (got ${c.chirpMassSolar})`);
    });
  }
}

import seedrandom from "seedrandom";
import { InputError } from "../errors.js";
import { checkComponentMassRange } from "../physics/massDomain.js";
import { type Detector, SITE_A } from "../waveform/antenna.js";
import { taylorT4Duration, taylorT4Evolution } from "../waveform/taylorT4Evolution.js";
import { type Injection } from "./injection.js";
import { type PsdLike, optimalSnr } from "./optimalSnr.js";

/** Options for {@link drawInjections}. Give exactly one of distanceMpc and snrRange. */
export interface InjectionPopulationOptions {
  /** Number of injections. */
  count: number;
  /** Both component masses are drawn uniformly in [min, max], M_sun. */
  massRangeSolar: [number, number];
  /**
   * Aligned-spin range [min, max] ⊂ (−1, 1): each body's spin χ along the orbital angular momentum
   * is drawn uniformly and independently in it. Absent: non-spinning injections (no spin fields).
   */
  spinRange?: [number, number];
  /** Distance range [min, max], Mpc, drawn uniformly in volume (p(D) ∝ D²). */
  distanceMpc?: [number, number];
  /** Target optimal SNR range [min, max], drawn uniformly; the distance is scaled to hit it. */
  snrRange?: [number, number];
  /** Seed of the draws (seedrandom); the same seed and options give the same injections. */
  seed: string | number;
  /** Start (s, file time base) and duration (s) of the series the injections go into. */
  startTime?: number;
  duration: number;
  /** GW frequency (Hz) where the injected chirps start: sets each chirp's duration. */
  fMinHz: number;
  /** Needed to compute optimal SNRs (required with snrRange; optional otherwise). */
  psd?: PsdLike;
  sampleRate?: number;
  /** Detector for the SNRs (default the invented "site-a"). */
  detector?: Detector;
  /**
   * Several detectors: SNRs are network SNRs, the quadrature sum of the optimal SNRs at these
   * sites (each site scaled by the same distance); `detector` is then unused.
   */
  detectors?: Detector[];
  /** Minimum gap (s) between one coalescence and the start of the next chirp (default 2). */
  gapSeconds?: number;
  /** No coalescence within this many seconds of either end of the series (default 2). */
  marginSeconds?: number;
  /** No coalescence within this many seconds of the start (default marginSeconds). */
  leadInSeconds?: number;
  /** No coalescence within this many seconds of the end (default marginSeconds). */
  tailSeconds?: number;
}

/** Largest plane-wave delay between the Earth's centre and a detector on its surface, s (R_earth / c, rounded up). */
const MAX_EARTH_DELAY = 0.0214;

function checkSpinRange(r: unknown): [number, number] {
  if (!Array.isArray(r) || r.length !== 2 || !r.every((x) => typeof x === "number" && Number.isFinite(x))) {
    throw new InputError("spinRange must be two finite numbers [min, max]");
  }
  const [lo, hi] = r as [number, number];
  if (!(lo > -1) || !(hi < 1) || !(hi >= lo)) throw new InputError(`spinRange must satisfy −1 < min ≤ max < 1 (got ${lo}, ${hi})`);
  return [lo, hi];
}

function checkRange(name: string, r: unknown, lowest: number): [number, number] {
  if (!Array.isArray(r) || r.length !== 2 || !r.every((x) => typeof x === "number" && Number.isFinite(x))) {
    throw new InputError(`${name} must be two finite numbers [min, max]`);
  }
  const [lo, hi] = r as [number, number];
  if (!(lo > lowest) || !(hi >= lo)) throw new InputError(`${name} must satisfy ${lowest} < min ≤ max (got ${lo}, ${hi})`);
  return [lo, hi];
}

/**
 * Draws a seeded random population of inspirals for a series [startTime, startTime + duration):
 * - component masses uniform in massRangeSolar (primaryMassSolar is the larger);
 * - distance uniform in volume in distanceMpc, D = (D₁³ + u (D₂³ − D₁³))^{1/3}; or, with snrRange,
 *   a target SNR ρ uniform in the range and D = D_ref ρ_ref / ρ (optimal SNR ∝ 1/D), where ρ_ref is
 *   the optimal SNR at D_ref = 1 Mpc; with `detectors`, ρ is the network SNR, ρ_ref = (Σ_i ρ_i²)^{1/2}
 *   over the sites at 1 Mpc, so every site is scaled by the same distance;
 * - isotropic orientation and sky: cos ι, sin δ uniform in [−1, 1], α uniform in [0, 2π),
 *   ψ uniform in [0, π), phase uniform in [0, 2π);
 * - coalescence times in order, none within leadInSeconds of the start or tailSeconds of the end
 *   (both default to marginSeconds), and spaced so chirps do
 *   not overlap: t_{k+1} − t_k ≥ d_{k+1} + gapSeconds + 2·21.4 ms, with d the TaylorT4 duration
 *   of chirp k+1 from fMinHz to the ISCO (the 21.4 ms covers the Earth-centre-to-detector delay).
 *   The slack left after those minimum spacings is shared out by sorted uniform draws. The first
 *   chirp may begin before the series (only its overlapping part is injected).
 * - with spinRange, aligned spins χ1, χ2 uniform and independent in it, from a second stream seeded
 *   with `${seed}:aligned-spins` (so the other draws are those of the same population without spins).
 * Draw order (so the stream is reproducible): all masses, then per injection the distance (or
 * SNR), cos ι, α, sin δ, ψ and phase, then the placement offsets.
 * optimalSnr is filled in when `psd` and `sampleRate` are given.
 */
export function drawInjections(options: InjectionPopulationOptions): Injection[] {
  const o = options;
  if (!Number.isInteger(o.count) || o.count < 0) throw new InputError(`count must be a non-negative integer (got ${o.count})`);
  const [mLo, mHi] = checkRange("massRangeSolar", o.massRangeSolar, 0);
  const spinRange = o.spinRange === undefined ? undefined : checkSpinRange(o.spinRange);
  checkComponentMassRange(o.massRangeSolar);
  if ((o.distanceMpc === undefined) === (o.snrRange === undefined)) {
    throw new InputError("give exactly one of distanceMpc and snrRange");
  }
  const dRange = o.distanceMpc === undefined ? undefined : checkRange("distanceMpc", o.distanceMpc, 0);
  const sRange = o.snrRange === undefined ? undefined : checkRange("snrRange", o.snrRange, 0);
  const startTime = o.startTime ?? 0;
  if (!Number.isFinite(startTime)) throw new InputError(`startTime must be a finite number (got ${startTime})`);
  if (!(o.duration > 0) || !Number.isFinite(o.duration)) throw new InputError(`duration must be a positive number of seconds (got ${o.duration})`);
  if (!(o.fMinHz > 0) || !Number.isFinite(o.fMinHz)) throw new InputError(`fMinHz must be a positive number (got ${o.fMinHz})`);
  const gap = o.gapSeconds ?? 2;
  const margin = o.marginSeconds ?? 2;
  if (!(gap >= 0) || !(margin >= 0)) throw new InputError(`gapSeconds and marginSeconds must be non-negative (got ${gap}, ${margin})`);
  const lead = o.leadInSeconds ?? margin;
  const tail = o.tailSeconds ?? margin;
  if (!(lead >= 0 && Number.isFinite(lead)) || !(tail >= 0 && Number.isFinite(tail))) {
    throw new InputError(`leadInSeconds and tailSeconds must be non-negative (got ${lead}, ${tail})`);
  }
  if (o.detectors !== undefined && (!Array.isArray(o.detectors) || o.detectors.length === 0)) {
    throw new InputError("detectors must be a non-empty list");
  }
  const wantSnr = o.psd !== undefined && o.sampleRate !== undefined;
  if (sRange && !wantSnr) throw new InputError("snrRange needs psd and sampleRate to compute optimal SNRs");
  if (wantSnr && (!(o.sampleRate! > 0) || !Number.isFinite(o.sampleRate!))) {
    throw new InputError(`sampleRate must be a positive number (got ${o.sampleRate})`);
  }
  const sites = o.detectors ?? [o.detector ?? SITE_A];
  /** Optimal SNR of `inj`: at the one site, or the network's quadrature sum. */
  const snrOf = (inj: Injection): number => {
    if (sites.length === 1) return optimalSnr(inj, o.psd!, o.sampleRate!, o.fMinHz, sites[0]);
    let sum = 0;
    for (const d of sites) sum += optimalSnr(inj, o.psd!, o.sampleRate!, o.fMinHz, d) ** 2;
    return Math.sqrt(sum);
  };
  const rng = seedrandom(String(o.seed));
  const n = o.count;

  const masses: [number, number][] = [];
  for (let k = 0; k < n; k++) {
    const a = mLo + (mHi - mLo) * rng();
    const b = mLo + (mHi - mLo) * rng();
    masses.push(a >= b ? [a, b] : [b, a]);
  }
  // Spins come from their own stream, so that a population without spins is drawn exactly as before.
  const spins: [number, number][] = [];
  if (spinRange) {
    const spinRng = seedrandom(`${String(o.seed)}:aligned-spins`);
    const [sLo, sHi] = spinRange;
    for (let k = 0; k < n; k++) spins.push([sLo + (sHi - sLo) * spinRng(), sLo + (sHi - sLo) * spinRng()]);
  }
  const durations = masses.map(([a, b], k) => {
    const fIsco = taylorT4Evolution(a, b).fIscoHz;
    if (o.fMinHz >= fIsco) {
      throw new InputError(`fMinHz ${o.fMinHz} Hz is not below the ISCO frequency (${fIsco.toFixed(1)} Hz) of a ${a.toFixed(2)}+${b.toFixed(2)} M_sun binary`);
    }
    return spinRange ? taylorT4Duration(a, b, o.fMinHz, undefined, spins[k][0], spins[k][1]) : taylorT4Duration(a, b, o.fMinHz);
  });

  const drawn = masses.map(([m1, m2]) => {
    const level = dRange
      ? Math.cbrt(dRange[0] ** 3 + rng() * (dRange[1] ** 3 - dRange[0] ** 3))
      : sRange![0] + (sRange![1] - sRange![0]) * rng();
    const cosIota = 2 * rng() - 1;
    const rightAscension = 2 * Math.PI * rng();
    const sinDec = 2 * rng() - 1;
    const polarisation = Math.PI * rng();
    const phase = 2 * Math.PI * rng();
    return { m1, m2, level, inclination: Math.acos(cosIota), rightAscension, declination: Math.asin(sinDec), polarisation, phase };
  });

  // Placement: minimum spacings, then the slack shared out by sorted uniforms.
  const spacing = durations.map((d) => d + gap + 2 * MAX_EARTH_DELAY);
  let need = 0;
  for (let k = 1; k < n; k++) need += spacing[k];
  const available = o.duration - lead - tail;
  if (n > 0 && need > available) {
    throw new InputError(
      `duration ${o.duration} s is too short for ${n} non-overlapping chirps from ${o.fMinHz} Hz with ${+lead.toFixed(3)} s kept clear at the start ` +
        `and ${+tail.toFixed(3)} s at the end (needs ${Math.ceil(need + lead + tail)} s); ` +
        "use a longer duration, a higher fMin, heavier masses or fewer injections",
    );
  }
  const slack = available - need;
  const offsets = Array.from({ length: n }, () => slack * rng()).sort((x, y) => x - y);
  const injections: Injection[] = [];
  let base = startTime + lead;
  for (let k = 0; k < n; k++) {
    if (k > 0) base += spacing[k];
    const d = drawn[k];
    const inj: Injection = {
      primaryMassSolar: d.m1,
      secondaryMassSolar: d.m2,
      coalescenceTime: base + offsets[k],
      distanceMpc: dRange ? d.level : 1,
      inclination: d.inclination,
      rightAscension: d.rightAscension,
      declination: d.declination,
      polarisation: d.polarisation,
      phase: d.phase,
    };
    if (spinRange) {
      inj.primarySpin = spins[k][0];
      inj.secondarySpin = spins[k][1];
    }
    if (wantSnr) {
      const snr = snrOf(inj);
      if (sRange) {
        if (!(snr > 0)) throw new InputError(`injection ${k}: its signal has no power above ${o.fMinHz} Hz, so no distance gives the target SNR`);
        inj.distanceMpc = snr / d.level; // reference distance 1 Mpc: D = 1 Mpc × ρ_ref / ρ
        inj.optimalSnr = d.level;
      } else {
        inj.optimalSnr = snr;
      }
    }
    injections.push(inj);
  }
  return injections;
}

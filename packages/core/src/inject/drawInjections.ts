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
  /** Minimum gap (s) between one coalescence and the start of the next chirp (default 2). */
  gapSeconds?: number;
  /** No coalescence within this many seconds of either end of the series (default 2). */
  marginSeconds?: number;
}

/** Largest plane-wave delay between the Earth's centre and a detector on its surface, s (R_earth / c, rounded up). */
const MAX_EARTH_DELAY = 0.0214;

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
 * - component masses uniform in massRangeSolar (primaryMass is the larger);
 * - distance uniform in volume in distanceMpc, D = (D₁³ + u (D₂³ − D₁³))^{1/3}; or, with snrRange,
 *   a target SNR ρ uniform in the range and D = D_ref ρ_ref / ρ (optimal SNR ∝ 1/D), where ρ_ref is
 *   the optimal SNR at D_ref = 1 Mpc;
 * - isotropic orientation and sky: cos ι, sin δ uniform in [−1, 1], α uniform in [0, 2π),
 *   ψ uniform in [0, π), phase uniform in [0, 2π);
 * - coalescence times in order, none within marginSeconds of either end, and spaced so chirps do
 *   not overlap: t_{k+1} − t_k ≥ d_{k+1} + gapSeconds + 2·21.4 ms, with d the TaylorT4 duration
 *   of chirp k+1 from fMinHz to the ISCO (the 21.4 ms covers the Earth-centre-to-detector delay).
 *   The slack left after those minimum spacings is shared out by sorted uniform draws. The first
 *   chirp may begin before the series (only its overlapping part is injected).
 * Draw order (so the stream is reproducible): all masses, then per injection the distance (or
 * SNR), cos ι, α, sin δ, ψ and phase, then the placement offsets.
 * optimalSnr is filled in when `psd` and `sampleRate` are given.
 */
export function drawInjections(options: InjectionPopulationOptions): Injection[] {
  const o = options;
  if (!Number.isInteger(o.count) || o.count < 0) throw new InputError(`count must be a non-negative integer (got ${o.count})`);
  const [mLo, mHi] = checkRange("massRangeSolar", o.massRangeSolar, 0);
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
  const wantSnr = o.psd !== undefined && o.sampleRate !== undefined;
  if (sRange && !wantSnr) throw new InputError("snrRange needs psd and sampleRate to compute optimal SNRs");
  if (wantSnr && (!(o.sampleRate! > 0) || !Number.isFinite(o.sampleRate!))) {
    throw new InputError(`sampleRate must be a positive number (got ${o.sampleRate})`);
  }
  const detector = o.detector ?? SITE_A;
  const rng = seedrandom(String(o.seed));
  const n = o.count;

  const masses: [number, number][] = [];
  for (let k = 0; k < n; k++) {
    const a = mLo + (mHi - mLo) * rng();
    const b = mLo + (mHi - mLo) * rng();
    masses.push(a >= b ? [a, b] : [b, a]);
  }
  const durations = masses.map(([a, b]) => {
    const fIsco = taylorT4Evolution(a, b).fIscoHz;
    if (o.fMinHz >= fIsco) {
      throw new InputError(`fMinHz ${o.fMinHz} Hz is not below the ISCO frequency (${fIsco.toFixed(1)} Hz) of a ${a.toFixed(2)}+${b.toFixed(2)} M_sun binary`);
    }
    return taylorT4Duration(a, b, o.fMinHz);
  });

  const drawn = masses.map(([m1, m2]) => {
    const level = dRange
      ? Math.cbrt(dRange[0] ** 3 + rng() * (dRange[1] ** 3 - dRange[0] ** 3))
      : sRange![0] + (sRange![1] - sRange![0]) * rng();
    const cosIota = 2 * rng() - 1;
    const rightAscension = 2 * Math.PI * rng();
    const sinDec = 2 * rng() - 1;
    const polarization = Math.PI * rng();
    const phase = 2 * Math.PI * rng();
    return { m1, m2, level, inclination: Math.acos(cosIota), rightAscension, declination: Math.asin(sinDec), polarization, phase };
  });

  // Placement: minimum spacings, then the slack shared out by sorted uniforms.
  const spacing = durations.map((d) => d + gap + 2 * MAX_EARTH_DELAY);
  let need = 0;
  for (let k = 1; k < n; k++) need += spacing[k];
  const available = o.duration - 2 * margin;
  if (n > 0 && need > available) {
    throw new InputError(
      `duration ${o.duration} s is too short for ${n} non-overlapping chirps from ${o.fMinHz} Hz (needs ${Math.ceil(need + 2 * margin)} s); ` +
        "use a longer duration, a higher fMin, heavier masses or fewer injections",
    );
  }
  const slack = available - need;
  const offsets = Array.from({ length: n }, () => slack * rng()).sort((x, y) => x - y);
  const injections: Injection[] = [];
  let base = startTime + margin;
  for (let k = 0; k < n; k++) {
    if (k > 0) base += spacing[k];
    const d = drawn[k];
    const inj: Injection = {
      primaryMass: d.m1,
      secondaryMass: d.m2,
      coalescenceTime: base + offsets[k],
      distance: dRange ? d.level : 1,
      inclination: d.inclination,
      rightAscension: d.rightAscension,
      declination: d.declination,
      polarization: d.polarization,
      phase: d.phase,
    };
    if (wantSnr) {
      const snr = optimalSnr(inj, o.psd!, o.sampleRate!, o.fMinHz, detector);
      if (sRange) {
        if (!(snr > 0)) throw new InputError(`injection ${k}: its signal has no power above ${o.fMinHz} Hz, so no distance gives the target SNR`);
        inj.distance = snr / d.level; // reference distance 1 Mpc: D = 1 Mpc × ρ_ref / ρ
        inj.optimalSnr = d.level;
      } else {
        inj.optimalSnr = snr;
      }
    }
    injections.push(inj);
  }
  return injections;
}

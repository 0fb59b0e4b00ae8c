import { InputError } from "../errors.js";
import { INJECTION_KEY_RENAMES, withCurrentKeys } from "../io/renamedKeys.js";
import { type Detector, geocentreDelay, plusCrossResponse, siderealAngle } from "../waveform/antenna.js";
import { taylorT4 } from "../waveform/taylorT4.js";
import { chirpMass } from "../physics/masses.js";

/**
 * One simulated inspiral to add to strain. Masses in solar masses (detector frame), times in
 * seconds of the strain file's time base, distance in Mpc, angles in radians.
 */
export interface Injection {
  /** Heavier component mass, M_sun. */
  primaryMassSolar: number;
  /** Lighter component mass, M_sun. */
  secondaryMassSolar: number;
  /** Time the signal reaches the ISCO at the Earth's centre, s (file time base, sub-sample). */
  coalescenceTime: number;
  /** Luminosity distance, Mpc. */
  distanceMpc: number;
  /** Inclination ι in [0, π], rad. */
  inclination: number;
  /** Right ascension α, rad. */
  rightAscension: number;
  /** Declination δ in [−π/2, π/2], rad. */
  declination: number;
  /** Polarisation angle ψ, rad. */
  polarisation: number;
  /** Orbital phase at coalescence, rad (the GW phase there is twice this). */
  phase: number;
  /** Optimal (noise-weighted) SNR in the detector, when known (drawInjections and `simulate` fill it in). */
  optimalSnr?: number;
  /** Dimensionless spin χ1 ∈ (−1, 1) of the heavier body along the orbital angular momentum (absent: 0). */
  primarySpin?: number;
  /** Dimensionless spin χ2 ∈ (−1, 1) of the lighter body along the orbital angular momentum (absent: 0). */
  secondarySpin?: number;
}

/** A strain segment on a uniform grid: `data[0]` sits at grid index `startIndex`. */
export interface StrainSegment {
  startIndex: number;
  data: Float64Array;
}

/** Options for {@link projectInjection}. */
export interface ProjectionOptions {
  sampleRate: number;
  /** Time (s) of grid sample 0 in the file time base (default 0). */
  gridStartTime?: number;
  /** GW frequency (Hz) at which the injected chirp starts. */
  fMinHz: number;
  /** GW frequency (Hz) at which it ends (default: ISCO or 0.9 × Nyquist, whichever is lower). */
  fMaxHz?: number;
}

/**
 * The detector response h(t) = F+ h+(t) + F× h×(t) to an injection, sampled on a grid
 * (TaylorT4 polarisations from {@link taylorT4}, with the injection's aligned spins; antenna factors from {@link plusCrossResponse}).
 * The coalescence time refers to the Earth's centre; at the detector the signal is shifted by the
 * plane-wave delay {@link geocentreDelay}. F+, F× and the delay are evaluated once, at the
 * coalescence time (the Earth's rotation during the chirp is neglected), with the sidereal angle of
 * {@link siderealAngle}.
 */
export function projectInjection(injection: Injection, detector: Detector, options: ProjectionOptions): StrainSegment {
  const inj = checkInjection(injection, "injection");
  const gmst = siderealAngle(inj.coalescenceTime);
  const { plus, cross } = plusCrossResponse(detector, inj, inj.polarisation, gmst);
  const delay = geocentreDelay(detector, inj, gmst);
  const gridStart = options.gridStartTime ?? 0;
  const wf = taylorT4({
    massSolar1: inj.primaryMassSolar,
    massSolar2: inj.secondaryMassSolar,
    distanceMpc: inj.distanceMpc,
    inclination: inj.inclination,
    coalescencePhase: inj.phase,
    // Subtract the grid start first so sub-sample precision survives a ~1e9 s time base.
    coalescenceTime: inj.coalescenceTime - gridStart + delay,
    sampleRate: options.sampleRate,
    gridStartTime: 0,
    fStartHz: options.fMinHz,
    fEndHz: options.fMaxHz,
    chi1: inj.primarySpin ?? 0,
    chi2: inj.secondarySpin ?? 0,
  });
  const data = wf.hPlus;
  const hc = wf.hCross;
  for (let i = 0; i < data.length; i++) data[i] = plus * data[i] + cross * hc[i];
  return { startIndex: wf.startIndex, data };
}

/**
 * Adds `segment` into `series`, whose first sample is at grid index `seriesStartIndex` of the same
 * grid; only the overlapping samples are touched. Returns how many samples were added.
 */
export function addSegment(series: Float64Array | Float32Array, seriesStartIndex: number, segment: StrainSegment): number {
  const from = Math.max(seriesStartIndex, segment.startIndex);
  const to = Math.min(seriesStartIndex + series.length, segment.startIndex + segment.data.length);
  const d = segment.data;
  for (let k = from; k < to; k++) series[k - seriesStartIndex] += d[k - segment.startIndex];
  return Math.max(0, to - from);
}

/**
 * Adds the projected TaylorT4 signal of `injection` in place to `series` (sample i at
 * startTime + i / sampleRate), starting at GW frequency fMinHz. Only the overlapping samples are
 * changed, so an injection partly (or wholly) outside the series is fine. Returns the number of
 * samples changed.
 */
export function injectInto(
  series: Float64Array | Float32Array,
  sampleRate: number,
  startTime: number,
  injection: Injection,
  detector: Detector,
  fMinHz: number,
): number {
  if (!Number.isFinite(startTime)) throw new InputError(`startTime must be a finite number (got ${startTime})`);
  const segment = projectInjection(injection, detector, { sampleRate, gridStartTime: startTime, fMinHz });
  return addSegment(series, 0, segment);
}

/** Fields of an {@link Injection} that must be finite numbers. */
export const INJECTION_FIELDS = [
  "primaryMassSolar",
  "secondaryMassSolar",
  "coalescenceTime",
  "distanceMpc",
  "inclination",
  "rightAscension",
  "declination",
  "polarisation",
  "phase",
] as const;

/**
 * Validates an injection record (e.g. read from a file); `where` prefixes each message (such as
 * `injections.json: injection 3`). Returns a clean copy (extra fields dropped, optimalSnr kept if
 * it is a finite number; primarySpin and secondarySpin kept when present, each in (−1, 1)).
 * Records written before the masses and distance carried their unit (primaryMass, secondaryMass, distance) are read too.
 */
export function checkInjection(value: unknown, where: string): Injection {
  if (value === null || typeof value !== "object" || Array.isArray(value)) {
    throw new InputError(`${where}: must be an object with fields ${INJECTION_FIELDS.join(", ")}`);
  }
  const rec = withCurrentKeys(value, INJECTION_KEY_RENAMES) as Record<string, unknown>;
  const out: Record<string, number> = {};
  for (const key of INJECTION_FIELDS) {
    const x = rec[key];
    if (typeof x !== "number" || !Number.isFinite(x)) {
      throw new InputError(`${where}: ${key} must be a finite number (got ${x === undefined ? "nothing" : JSON.stringify(x)})`);
    }
    out[key] = x;
  }
  const inj = out as unknown as Injection;
  if (!(inj.primaryMassSolar > 0)) throw new InputError(`${where}: primaryMassSolar must be positive (got ${inj.primaryMassSolar})`);
  if (!(inj.secondaryMassSolar > 0)) throw new InputError(`${where}: secondaryMassSolar must be positive (got ${inj.secondaryMassSolar})`);
  if (inj.secondaryMassSolar > inj.primaryMassSolar) {
    throw new InputError(`${where}: primaryMassSolar must be at least secondaryMassSolar (got ${inj.primaryMassSolar} < ${inj.secondaryMassSolar})`);
  }
  if (!(inj.distanceMpc > 0)) throw new InputError(`${where}: distanceMpc must be a positive number of Mpc (got ${inj.distanceMpc})`);
  if (inj.inclination < 0 || inj.inclination > Math.PI) {
    throw new InputError(`${where}: inclination must be in [0, π] rad (got ${inj.inclination})`);
  }
  if (Math.abs(inj.declination) > Math.PI / 2) {
    throw new InputError(`${where}: declination must be in [−π/2, π/2] rad (got ${inj.declination})`);
  }
  for (const key of ["primarySpin", "secondarySpin"] as const) {
    const x = rec[key];
    if (x === undefined) continue;
    if (typeof x !== "number" || !Number.isFinite(x) || !(Math.abs(x) < 1)) {
      throw new InputError(`${where}: ${key} must be a dimensionless aligned spin in (−1, 1) (got ${JSON.stringify(x)})`);
    }
    inj[key] = x;
  }
  const snr = rec.optimalSnr;
  if (typeof snr === "number" && Number.isFinite(snr)) inj.optimalSnr = snr;
  return inj;
}

/** An injection as the tool's outputs record it (manifests, campaign outcomes): its parameters and chirp mass. */
export interface InjectionRecord extends Omit<Injection, "optimalSnr"> {
  chirpMassSolar: number;
  /** NaN when unknown (written as null in JSON). */
  optimalSnr: number;
  /** With several sites: the network optimal SNR, (Σ over sites of optimalSnr²)^{1/2}. */
  networkOptimalSnr?: number;
}

/**
 * The record of one injection: its parameters in their units, the chirp mass
 * (m1 m2)^{3/5} / (m1 + m2)^{1/5} (Peters & Mathews, Phys. Rev. 131, 435 (1963)) in M_sun, and its
 * spins when it has any.
 */
export function injectionRecord(inj: Injection & { networkOptimalSnr?: number }): InjectionRecord {
  return {
    primaryMassSolar: inj.primaryMassSolar,
    secondaryMassSolar: inj.secondaryMassSolar,
    chirpMassSolar: chirpMass(inj.primaryMassSolar, inj.secondaryMassSolar),
    coalescenceTime: inj.coalescenceTime,
    distanceMpc: inj.distanceMpc,
    inclination: inj.inclination,
    rightAscension: inj.rightAscension,
    declination: inj.declination,
    polarisation: inj.polarisation,
    phase: inj.phase,
    optimalSnr: inj.optimalSnr ?? Number.NaN,
    ...(inj.networkOptimalSnr !== undefined ? { networkOptimalSnr: inj.networkOptimalSnr } : {}),
    ...(inj.primarySpin !== undefined || inj.secondarySpin !== undefined ? { primarySpin: inj.primarySpin ?? 0, secondarySpin: inj.secondarySpin ?? 0 } : {}),
  };
}
